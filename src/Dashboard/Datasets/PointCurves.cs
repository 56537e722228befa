using System.Collections.Immutable;
using System.Text.Json.Serialization;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>One named curve: x and y values of equal length.</summary>
public sealed record Curve(string Name, ImmutableArray<double> X, ImmutableArray<double?> Y);

/// <summary>Total and partial (per site) density of states.</summary>
public sealed record DosCurves(string FrequencyUnit, string DensityUnit, ImmutableArray<Curve> Curves);

/// <summary>
/// Thermal functions against temperature. <see cref="KappaWPerMK"/> (the mean over directions) and
/// the per-direction <see cref="KappaComponents"/> are there only when the table has the column
/// with at least one finite value (a point that asked for no conductivity leaves it empty).
/// </summary>
public sealed record ThermalCurves(
    ImmutableArray<double> TemperatureK,
    ImmutableArray<double?> HeatCapacityJPerMolK,
    ImmutableArray<double?> DebyeTemperatureK,
    [property: JsonPropertyName(PointCurves.ConductivityColumn)] ImmutableArray<double?>? KappaWPerMK,
    ImmutableArray<Curve> KappaComponents);

/// <summary>A labelled corner of the dispersion path.</summary>
public sealed record PathCorner(double Position, string Label);

/// <summary>Dispersion along the path: frequency per branch, and the group speed |v| per branch when the table has velocities.</summary>
public sealed record DispersionCurves(string PositionUnit, ImmutableArray<PathCorner> Corners, ImmutableArray<Curve> Frequencies, ImmutableArray<Curve>? GroupSpeeds);

/// <summary>Everything the point page plots; each part is null when its table has no rows for the point.</summary>
public sealed record PointCurves(DosCurves? Dos, ThermalCurves? Thermal, DispersionCurves? Dispersion)
{
    /// <summary>Column of the thermal table that, when present, gets its own plot against temperature.</summary>
    public const string ConductivityColumn = "kappa_w_per_m_k";

    /// <summary>Distance along the dispersion path in reciprocal space.</summary>
    public const string PositionColumn = "path_position_per_nm";

    internal static PointCurves Build(ResultTable dos, ResultTable thermal, ResultTable dispersion) =>
        new(BuildDos(dos), BuildThermal(thermal), BuildDispersion(dispersion));

    private static DosCurves? BuildDos(ResultTable t)
    {
        if (t.Rows.Length == 0 || !t.Has("freq_thz") || !t.Has("dos_per_thz_per_cell"))
        {
            return null;
        }

        int iCurve = t.IndexOf("curve"), iSite = t.IndexOf("site"), iF = t.IndexOf("freq_thz"), iD = t.IndexOf("dos_per_thz_per_cell");
        var curves = t.Rows
            .GroupBy(r => iCurve >= 0 && r[iCurve] is "site" && iSite >= 0 && r[iSite] is int site ? site : -1)
            .OrderBy(g => g.Key)
            .Select(g =>
            {
                var points = g.Where(r => Finite(r[iF]) is not null).OrderBy(r => ResultTable.ToDouble(r[iF])).ToList();
                return new Curve(g.Key < 0 ? "total" : $"site {g.Key}", [.. points.Select(r => ResultTable.ToDouble(r[iF])!.Value)], [.. points.Select(r => Finite(r[iD]))]);
            })
            .ToImmutableArray();
        return new DosCurves(t.Column("freq_thz")!.Unit.Length > 0 ? t.Column("freq_thz")!.Unit : "THz", Unit(t, "dos_per_thz_per_cell", "1/(THz cell)"), curves);
    }

    private static ThermalCurves? BuildThermal(ResultTable t)
    {
        if (t.Rows.Length == 0 || !t.Has("temperature_k"))
        {
            return null;
        }

        var iT = t.IndexOf("temperature_k");
        var rows = t.Rows.Where(r => Finite(r[iT]) is not null).OrderBy(r => ResultTable.ToDouble(r[iT])).ToList();
        ImmutableArray<double?> Column(string name) => t.IndexOf(name) is var i and >= 0 ? [.. rows.Select(r => Finite(r[i]))] : [.. rows.Select(_ => (double?)null)];
        ImmutableArray<double?>? Plotted(string name) => Column(name) is var c && c.Any(v => v is not null) ? c : null;
        var temperatures = rows.Select(r => ResultTable.ToDouble(r[iT])!.Value).ToImmutableArray();
        var components = new[] { ("xx", "along x"), ("yy", "along y"), ("zz", "along z") }
            .Select(d => (Name: d.Item2, Values: Plotted($"kappa_{d.Item1}_w_per_m_k")))
            .Where(d => d.Values is not null)
            .Select(d => new Curve(d.Name, temperatures, d.Values!.Value))
            .ToImmutableArray();
        return new ThermalCurves(temperatures, Column("cv_j_per_mol_k"), Column("debye_temperature_k"), Plotted(ConductivityColumn), components);
    }

    private static DispersionCurves? BuildDispersion(ResultTable t)
    {
        // Files from before the position got its unit call the column path_position.
        var position = t.Has(PositionColumn) ? PositionColumn : "path_position";
        if (t.Rows.Length == 0 || !t.Has(position) || !t.Has("freq_thz") || !t.Has("branch"))
        {
            return null;
        }

        int iP = t.IndexOf(position), iF = t.IndexOf("freq_thz"), iB = t.IndexOf("branch"), iL = t.IndexOf("corner_label");
        int[] iV = [t.IndexOf("group_velocity_x_m_per_s"), t.IndexOf("group_velocity_y_m_per_s"), t.IndexOf("group_velocity_z_m_per_s")];
        var rows = t.Rows.Where(r => Finite(r[iP]) is not null).OrderBy(r => ResultTable.ToDouble(r[iP])).ToList();
        var corners = iL < 0
            ? []
            : rows.Where(r => r[iL] is string { Length: > 0 })
                .Select(r => new PathCorner(ResultTable.ToDouble(r[iP])!.Value, (string)r[iL]!))
                .DistinctBy(c => (c.Position, c.Label))
                .ToImmutableArray();
        var branches = rows.GroupBy(r => ResultTable.ToDouble(r[iB]) ?? -1).OrderBy(g => g.Key).ToList();
        var frequencies = branches
            .Select(g => new Curve($"branch {g.Key}", [.. g.Select(r => ResultTable.ToDouble(r[iP])!.Value)], [.. g.Select(r => Finite(r[iF]))]))
            .ToImmutableArray();
        var hasVelocity = iV.Any(i => i >= 0) && rows.Any(r => iV.Any(i => i >= 0 && r[i] is not null));
        ImmutableArray<Curve>? speeds = hasVelocity
            ? branches.Select(g => new Curve($"branch {g.Key}", [.. g.Select(r => ResultTable.ToDouble(r[iP])!.Value)], [.. g.Select(r => Speed(r, iV))])).ToImmutableArray()
            : null;
        return new DispersionCurves(Unit(t, position, position == PositionColumn ? "1/nm" : ""), corners, frequencies, speeds);
    }

    private static double? Speed(ImmutableArray<object?> row, int[] components)
    {
        var sum = 0.0;
        var any = false;
        foreach (var i in components)
        {
            if (i >= 0 && ResultTable.ToDouble(row[i]) is { } v)
            {
                sum += v * v;
                any = true;
            }
        }

        return any && double.IsFinite(sum) ? Math.Sqrt(sum) : null;
    }

    /// <summary>A plotted value; NaN and infinities become gaps (JSON has no number for them).</summary>
    private static double? Finite(object? value) => ResultTable.ToDouble(value) is { } v && double.IsFinite(v) ? v : null;

    private static string Unit(ResultTable t, string column, string fallback) =>
        t.Column(column) is { Unit.Length: > 0 } c ? c.Unit : fallback;
}
