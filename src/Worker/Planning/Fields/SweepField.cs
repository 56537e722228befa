using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.Planning.Fields;

/// <summary>
/// A field of the job file that an axis or a candidates column can set: its canonical path, the
/// Parquet column it becomes, its unit and type, a range check applied to every value at plan time,
/// and how a value is applied to a point's spec. <see cref="ApplyOrder"/> puts element symbols
/// before masses, so a swept mass of the same site wins over the element's standard weight.
/// </summary>
internal sealed record SweepField(
    string Path,
    string Unit,
    AxisValueType ValueType,
    Func<object, string?> Check,
    Func<BoundSpec, object, BoundSpec> Apply,
    int ApplyOrder = 1)
{
    public string ColumnName => ColumnNames.FromPath(Path);
}
