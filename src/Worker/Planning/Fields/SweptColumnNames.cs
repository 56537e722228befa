using LatticeSweep.Worker.Output;

namespace LatticeSweep.Worker.Planning.Fields;

/// <summary>
/// The one name a swept parameter has everywhere: in <c>check</c>, <c>status</c>, the catalog,
/// sweep.json and every table. A name that a result table already uses for a column of its own gets
/// the prefix <c>axis_</c> (a swept <c>sample.kind</c> is <c>axis_sample_kind</c>, because
/// <c>points/</c> has <c>sample_kind</c>), decided once when the sweep is planned.
/// </summary>
internal static class SweptColumnNames
{
    public const string Prefix = "axis_";

    /// <summary>The column name for a parameter whose name from its path (or candidates column) is <paramref name="baseName"/>.</summary>
    public static string Of(string baseName) =>
        ResultSchemas.FixedColumnNames.Contains(baseName) ? Prefix + baseName : baseName;

    /// <summary>
    /// The name a point id is computed with: the name before the prefix, so that the ids of sweeps
    /// planned before the prefix was decided at planning time (they said <c>sample_kind</c>) stay.
    /// </summary>
    public static string IdentityName(string column) =>
        column.StartsWith(Prefix, StringComparison.Ordinal) && ResultSchemas.FixedColumnNames.Contains(column[Prefix.Length..])
            ? column[Prefix.Length..]
            : column;
}
