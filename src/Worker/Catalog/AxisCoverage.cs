using System.Collections.Immutable;

namespace LatticeSweep.Worker.Catalog;

/// <summary>How far each value of one swept parameter has got.</summary>
public sealed record AxisCoverage(string ColumnName, string Path, string Unit, ImmutableArray<AxisValueCoverage> Values);

/// <summary>Point counts for one value of a swept parameter.</summary>
public sealed record AxisValueCoverage(object Value, long Total, long Done, long Failed, long Pending, long Cancelled)
{
    /// <summary>Points of this value whose model is unstable (not in <see cref="Done"/>).</summary>
    public long Unstable { get; init; }
}
