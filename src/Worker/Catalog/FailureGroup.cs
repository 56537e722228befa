using System.Collections.Immutable;
using System.Globalization;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Failed points of a sweep that share one error text (reason and origin), with a few of their ids and,
/// for a failure traced to swept keys, the values those keys took in the group's points.
/// </summary>
public sealed record FailureGroup(FailureKind Kind, string Reason, long Count, ImmutableArray<string> ExamplePointIds)
{
    /// <summary>The values of the swept keys the failure is traced to, over the group's points (empty when it is not traced to any).</summary>
    public ImmutableArray<FailingValues> Values { get; init; } = [];

    /// <summary>The reason without its origin.</summary>
    public string ReasonText => FailureText.Split(Reason).Reason;

    /// <summary>Where in the job file the reason comes from; null for texts without one (I/O and input failures, stores from before).</summary>
    public FailureOrigin? Origin => FailureText.Split(Reason).Origin;

    /// <summary>
    /// A short stable name of the group (its kind and whole error text hashed), for addresses such as the
    /// dashboard's page of the group's points: the same group has the same key in every process and store.
    /// </summary>
    public string Key => KeyOf(Kind, Reason);

    public static string KeyOf(FailureKind kind, string error) =>
        Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(kind.ToString() + "\n" + error)).AsSpan(0, 8));

    /// <summary>The failing values in one line: <c>springs_0_transverse_n_per_m = 0, -2 (2 of 3 values)</c>, joined by "; ".</summary>
    public string ValuesText => string.Join("; ", Values.Select(v => v.ToString()));
}

/// <summary>The values one swept column took over a failure group's points.</summary>
/// <param name="Column">The column in <c>points/</c>.</param>
/// <param name="Path">The job-file key it sets.</param>
/// <param name="Distinct">How many distinct values the group's points have in it.</param>
/// <param name="First">The first few distinct values, in plan order.</param>
/// <param name="Min">The smallest number (null for text).</param>
/// <param name="Max">The largest number (null for text).</param>
/// <param name="SweepValues">How many values the sweep gives it (0 when unknown).</param>
public sealed record FailingValues(string Column, string Path, long Distinct, ImmutableArray<object> First, double? Min, double? Max, int SweepValues)
{
    /// <summary>Values listed one by one up to this many.</summary>
    public const int Listed = 5;

    public override string ToString()
    {
        var of = SweepValues > 0 ? $" ({Distinct.ToString(CultureInfo.InvariantCulture)} of {SweepValues.ToString(CultureInfo.InvariantCulture)} values)" : "";
        if (Distinct <= Listed)
        {
            return $"{Column} = {string.Join(", ", First.Select(CatalogJson.Show))}{of}";
        }

        return Min is { } lo && Max is { } hi
            ? $"{Column} from {CatalogJson.Show(lo)} to {CatalogJson.Show(hi)}{(of.Length > 0 ? of : $" ({Distinct.ToString(CultureInfo.InvariantCulture)} values)")}"
            : $"{Column} = {string.Join(", ", First.Select(CatalogJson.Show))}, ...{(of.Length > 0 ? of : $" ({Distinct.ToString(CultureInfo.InvariantCulture)} values)")}";
    }
}
