using System.Globalization;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Commands;

/// <summary>
/// How <c>run</c> and <c>status</c> show a failure group: count, kind and reason on one line, then
/// where in the job file it comes from, the values that failed and a few point ids, so thousands of
/// failed points stay a few lines per reason.
/// </summary>
internal static class FailureGroupText
{
    /// <summary>Example ids shown per group.</summary>
    public const int ExamplesShown = 3;

    public static void Write(TextWriter o, FailureGroup group, string indent)
    {
        ArgumentNullException.ThrowIfNull(o);
        ArgumentNullException.ThrowIfNull(group);
        var count = group.Count.ToString("N0", CultureInfo.InvariantCulture);
        o.WriteLine($"{indent}{count} x {group.Kind.ToString().ToLowerInvariant()}: {group.ReasonText.ReplaceLineEndings(" ")}");
        var more = indent + "    ";
        if (group.Origin is { } origin)
        {
            o.WriteLine($"{more}from: {origin.Describe()}");
        }

        if (group.Values.Length > 0)
        {
            o.WriteLine($"{more}failing values: {group.ValuesText}");
        }

        if (group.ExamplePointIds.Length > 0)
        {
            o.WriteLine($"{more}e.g. {(group.ExamplePointIds.Length == 1 ? "point" : "points")} {string.Join(", ", group.ExamplePointIds.Take(ExamplesShown))}");
        }
    }
}
