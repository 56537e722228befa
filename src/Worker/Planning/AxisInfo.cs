using System.Collections.Immutable;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// One swept parameter: the job-file path it overrides (e.g. <c>model.sites.Ga.mass_amu</c>), the
/// Parquet column it becomes (its units in the name), the unit, the column type and the values it
/// takes across the plan (in first-seen order).
/// </summary>
public sealed record AxisInfo(string Path, string ColumnName, string Unit, AxisValueType ValueType, ImmutableArray<object> Values);

/// <summary>The column type of a swept parameter.</summary>
public enum AxisValueType
{
    Double,
    Integer,
    Text,
}
