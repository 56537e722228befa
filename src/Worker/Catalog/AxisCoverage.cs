using System.Collections.Immutable;

namespace LatticeSweep.Worker.Catalog;

/// <summary>How far each value of one swept parameter has got: <see cref="Values"/> from position <see cref="Offset"/> of <see cref="ValueCount"/>.</summary>
public sealed record AxisCoverage(string ColumnName, string Path, string Unit, ImmutableArray<AxisValueCoverage> Values)
{
    /// <summary>The position of the first of <see cref="Values"/> in the axis's list of values.</summary>
    public long Offset { get; init; }

    /// <summary>How many values the axis lists in all (those in <see cref="Values"/> and the rest); for a binned axis, how many bins.</summary>
    public long ValueCount { get; init; }

    /// <summary>
    /// For an axis of drawn values, what its bins are (<c>100 bins of equal width on a linear scale</c>):
    /// each of <see cref="Values"/> is then a bin of its interval, not a value. Null for an axis counted per value.
    /// </summary>
    public string? Bins { get; init; }
}

/// <summary>
/// Which values of which axes to read: from position <paramref name="Offset"/>, at most
/// <paramref name="Limit"/> per axis, of every axis or of <paramref name="Column"/> only.
/// </summary>
public sealed record AxisWindow(long Offset = 0, int Limit = int.MaxValue, string? Column = null)
{
    /// <summary>Every value of every axis.</summary>
    public static AxisWindow Whole { get; } = new();
}

/// <summary>Point counts for one value of a swept parameter.</summary>
public sealed record AxisValueCoverage(object Value, long Total, long Done, long Failed, long Pending, long Cancelled)
{
    /// <summary>Points of this value whose model is unstable (not in <see cref="Done"/>).</summary>
    public long Unstable { get; init; }

    /// <summary>For a bin of a drawn axis, its upper edge (<see cref="Value"/> is its lower edge); null for a value.</summary>
    public object? Upper { get; init; }

    /// <summary>For a bin of a drawn axis, the bin as people read it (<c>[10, 10.5)</c>); null for a value.</summary>
    public string? BinText { get; init; }
}
