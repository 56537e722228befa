using System.Collections.Immutable;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// One swept parameter: the job-file path it overrides (e.g. <c>model.sites.Ga.mass_amu</c>), the
/// Parquet column it becomes (its units in the name), the unit, the column type and the values it
/// takes across the plan (in first-seen order). An axis whose values are drawn from an interval
/// (<c>latin_hypercube</c> or <c>random</c> over a <c>range</c>) lists none: <see cref="Drawn"/> says
/// where they come from, so a sweep's record does not grow with its points.
/// </summary>
public sealed record AxisInfo(string Path, string ColumnName, string Unit, AxisValueType ValueType, ImmutableArray<object> Values)
{
    /// <summary>The interval the values are drawn from, for an axis of drawn values; null for listed values.</summary>
    public DrawnRange? Drawn { get; init; }

    /// <summary>How many values the axis gives: the values listed, or the draws of a drawn axis (one per sample).</summary>
    public long ValueCount => Drawn?.Draws ?? Values.Length;

    /// <summary>
    /// A few values the axis gives, for trying a point with another value of it: the values listed,
    /// or a drawn axis's interval ends and middle (each a value the sweep may draw).
    /// </summary>
    public IEnumerable<object> SomeValues() => Drawn is { } d ? AxisBins.Of(this)!.Representatives(d) : Values;
}

/// <summary>
/// The interval a drawn axis samples: its ends as written, its scale, the number of values drawn
/// (the sweep's <c>count</c>) and the number of equal bins its coverage is counted in
/// (<see cref="AxisBins"/>), fixed when the sweep is submitted.
/// </summary>
public sealed record DrawnRange(double From, double To, bool Log, long Draws, int Bins)
{
    /// <summary>The interval's lower end, whichever end the job file wrote first.</summary>
    public double Low => Math.Min(From, To);

    /// <summary>The interval's upper end.</summary>
    public double High => Math.Max(From, To);
}

/// <summary>The column type of a swept parameter.</summary>
public enum AxisValueType
{
    Double,
    Integer,
    Text,
}
