using System.Collections.Immutable;
using LatticeSweep.Dashboard.Formatting;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>A point on the comparison page: named by the swept values that tell it from the others.</summary>
public sealed record ComparedPoint(
    string PointId,
    string Label,
    string Url,
    string State,
    bool Unstable,
    bool Floppy,
    ImmutableSortedDictionary<string, object> Parameters,
    ImmutableArray<object?> Summary);

/// <summary>One point's curve on a comparison plot.</summary>
public sealed record ComparedCurve(string PointId, string Label, ImmutableArray<double> X, ImmutableArray<double?> Y);

/// <summary>
/// Up to <see cref="MaxPoints"/> points of one sweep side by side: their total density of states,
/// heat capacity, Debye temperature and conductivity against temperature on shared plots, and their
/// summary numbers in one table. Each point's label is made of the swept values that differ between
/// the compared points; the values they share are listed once (<see cref="Common"/>).
/// </summary>
public sealed record PointComparison(
    string SweepId,
    ImmutableArray<ComparedPoint> Points,
    ImmutableArray<string> Common,
    ImmutableArray<SummaryColumn> SummaryColumns,
    string FrequencyUnit,
    string DensityUnit,
    ImmutableArray<ComparedCurve> Dos,
    ImmutableArray<ComparedCurve> HeatCapacity,
    ImmutableArray<ComparedCurve> DebyeTemperature,
    ImmutableArray<ComparedCurve> Conductivity,
    ImmutableArray<string> Notes)
{
    /// <summary>Points compared at most: more curves on one plot cannot be told apart.</summary>
    public const int MaxPoints = 10;

    /// <summary>The address key naming a point to compare (repeated).</summary>
    public const string PointKey = "p";

    /// <summary>Summary columns shown side by side (each when the sweep has values in it).</summary>
    public static readonly ImmutableArray<string> SummaryNames =
    [
        "max_freq_thz", "largest_gap_width_thz", "sound_speed_mean_m_per_s", "cv_j_per_mol_k", "debye_temperature_from_cv_k",
        PointCurves.ConductivityColumn, "stable", "floppy",
    ];

    internal static PointComparison Build(SweepRecord sweep, ResultTable points, IReadOnlyList<(PointRecord Point, PointCurves Curves)> compared, IReadOnlyList<string> notes)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        ArgumentNullException.ThrowIfNull(points);
        ArgumentNullException.ThrowIfNull(compared);
        var names = new ColumnCatalog(sweep, TableNames.Points);
        var flags = new PointFlags(points);
        var filled = SummaryTable.FilledColumns(points);
        var summary = SummaryNames.Where(n => points.Has(n) && filled.Contains(n)).ToList();
        var axes = sweep.Axes.Where(a => compared.Any(c => c.Point.Parameters.ContainsKey(a.ColumnName))).ToList();
        var differing = axes.Where(a => compared.Select(c => Show.Raw(c.Point.Parameters.GetValueOrDefault(a.ColumnName))).Distinct(StringComparer.Ordinal).Count() > 1).ToList();
        var common = axes.Except(differing)
            .Select(a => $"{Short(a.Path)} = {Show.Value(compared[0].Point.Parameters.GetValueOrDefault(a.ColumnName), Show.Unit(a.Unit))}")
            .ToImmutableArray();

        var shown = new List<ComparedPoint>();
        foreach (var (point, _) in compared)
        {
            var row = points.Where("point_id", point.PointId).Rows.FirstOrDefault();
            var label = differing.Count == 0
                ? point.PointId
                : string.Join(", ", differing.Select(a => $"{Short(a.Path)} = {Show.Value(point.Parameters.GetValueOrDefault(a.ColumnName), Show.Unit(a.Unit))}"));
            shown.Add(new ComparedPoint(point.PointId, label, Endpoints.Links.Point(sweep.SweepId, point.PointId), point.State.ToString().ToLowerInvariant(),
                !row.IsDefault && flags.IsUnstable(row), !row.IsDefault && flags.IsFloppy(row), point.Parameters,
                [.. summary.Select(n => row.IsDefault ? null : row[points.IndexOf(n)])]));
        }

        ImmutableArray<ComparedCurve> Curves(Func<PointCurves, (ImmutableArray<double> X, ImmutableArray<double?> Y)?> pick) =>
            [.. compared.Select((c, i) => (Shown: shown[i], Curve: pick(c.Curves)))
                .Where(c => c.Curve is { } xy && xy.Y.Any(v => v is not null))
                .Select(c => new ComparedCurve(c.Shown.PointId, c.Shown.Label, c.Curve!.Value.X, c.Curve.Value.Y))];

        var dosUnits = compared.Select(c => c.Curves.Dos).FirstOrDefault(d => d is not null);
        return new PointComparison(
            sweep.SweepId,
            [.. shown],
            common,
            [.. summary.Select(n => new SummaryColumn(n, names.HeaderLabel(n), names.Label(n), names.Unit(points.Column(n)!), points.Column(n)!.IsNumeric, false))],
            dosUnits?.FrequencyUnit ?? "THz",
            Show.Unit(dosUnits?.DensityUnit ?? "1/(THz cell)"),
            Curves(c => c.Dos?.Curves.FirstOrDefault(k => k.Name == "total") is { } total ? (total.X, total.Y) : null),
            Curves(c => c.Thermal is { } t ? (t.TemperatureK, t.HeatCapacityJPerMolK) : null),
            Curves(c => c.Thermal is { } t ? (t.TemperatureK, t.DebyeTemperatureK) : null),
            Curves(c => c.Thermal is { KappaWPerMK: { } k } t ? (t.TemperatureK, k) : null),
            [.. notes]);
    }

    /// <summary>A job-file path without the <c>model.</c> or <c>output.</c> prefix, for labels.</summary>
    private static string Short(string path) =>
        path.StartsWith("model.", StringComparison.Ordinal) ? path["model.".Length..]
        : path.StartsWith("output.", StringComparison.Ordinal) ? path["output.".Length..]
        : path;
}
