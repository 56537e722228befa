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

    /// <summary>The groups as printed: those that differ only in the failing candidate's row put together (<see cref="CandidateFailures"/>).</summary>
    public static List<List<FailureGroup>> Entries(IEnumerable<FailureGroup> groups) =>
        CandidateFailures.Merge(groups, g => g.Kind + "\n" + g.ReasonText, g => g.Origin, g => g.Count);

    /// <summary>One printed entry: a group, or several failing candidates' groups with one reason (their total, their lines).</summary>
    public static void Write(TextWriter o, IReadOnlyList<FailureGroup> entry, string indent)
    {
        ArgumentNullException.ThrowIfNull(o);
        ArgumentNullException.ThrowIfNull(entry);
        if (entry.Count == 1)
        {
            Write(o, entry[0], indent);
            return;
        }

        var first = entry[0];
        var count = entry.Sum(g => g.Count).ToString("N0", CultureInfo.InvariantCulture);
        o.WriteLine($"{indent}{count} x {first.Kind.ToString().ToLowerInvariant()}: {first.ReasonText.ReplaceLineEndings(" ")}");
        var more = indent + "    ";
        o.WriteLine($"{more}from: {CandidateFailures.Describe([.. entry.Select(g => g.Origin!)])}");
        var values = entry.Select(g => g.ValuesText).Distinct(StringComparer.Ordinal).ToList();
        if (values is [{ Length: > 0 } same])
        {
            o.WriteLine($"{more}failing values: {same}");
        }

        var examples = entry.SelectMany(g => g.ExamplePointIds.Take(1)).Take(ExamplesShown).ToList();
        if (examples.Count > 0)
        {
            o.WriteLine($"{more}e.g. {(examples.Count == 1 ? "point" : "points")} {string.Join(", ", examples)}");
        }
    }

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
