using System.Collections.Immutable;
using LatticeSweep.Engine.QuasiHarmonic;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Output;

/// <summary>A point's outcome paired with one item of its result (one DOS bin, one thermal row, ...).</summary>
internal readonly record struct RowOf<T>(PointOutcome Outcome, T Item);

/// <summary>One DOS value: <see cref="Site"/> is null for the total curve; <see cref="StandardError"/> when the total is an average.</summary>
internal readonly record struct DosValue(int? Site, double FrequencyThz, double Density, double? StandardError = null);

/// <summary>One sound speed: direction, branch (slowest first) and speed.</summary>
internal readonly record struct SoundSpeedValue(string Direction, int Branch, double SpeedMPerS);

/// <summary>Thermal functions at one temperature and, when computed, the conductivity at the same temperature.</summary>
internal readonly record struct ThermalValue(ThermalRow Thermal, ConductivityRow? Conductivity)
{
    /// <summary>Cv of the periodic crystal of the same size at this temperature (samples built in real space).</summary>
    public double? PeriodicCvJPerMolK { get; init; }

    /// <summary>Standard errors of U, F, S, Cv when they are averages (null otherwise).</summary>
    public ThermalRow? StandardErrors { get; init; }

    /// <summary>Cv of the ordered virtual crystal at this temperature (disordered samples).</summary>
    public double? OrderedCvJPerMolK { get; init; }

    /// <summary>Conductivity from the confined modes of a film or wire at this temperature.</summary>
    public ConductivityRow? Confined { get; init; }

    /// <summary>Bulk points: U, F, S, Cv on this mesh minus on the half-density mesh (null without the mesh check).</summary>
    public ThermalRow? MeshChange { get; init; }

    /// <summary>Bulk points: the change of largest size of the mean-square displacement on the half-density mesh, nm^2.</summary>
    public double? MsdMeshChangeNm2 { get; init; }
}

/// <summary>One value of a layer's density of states.</summary>
internal readonly record struct LayerDosValue(int Layer, long Sites, double FrequencyThz, double Density, double? StandardError = null);

/// <summary>
/// Every result table's columns, names carrying their units. Each table starts with
/// <c>point_id</c> and the swept parameters (so each table can be filtered without a join).
/// To add a column: add it here; writers, the manifest and the units metadata follow.
/// </summary>
internal sealed class ResultSchemas
{
    public ResultSchemas(IReadOnlyList<AxisInfo> axes)
    {
        ArgumentNullException.ThrowIfNull(axes);
        Points = new TableSpec<PointOutcome>(TableNames.Points, [.. PointHead<PointOutcome>(axes, includeRunColumns: true, o => o), .. SummaryColumns()]);
        SoundSpeeds = Spec<SoundSpeedValue>(TableNames.SoundSpeeds, axes,
            C<RowOf<SoundSpeedValue>>("direction", ColumnType.Text, "", "direction of propagation", r => r.Item.Direction),
            C<RowOf<SoundSpeedValue>>("branch", ColumnType.Int32, "", "acoustic branch, slowest first (0-based)", r => r.Item.Branch),
            C<RowOf<SoundSpeedValue>>("speed_m_per_s", ColumnType.Double, "m/s", "sound speed from the acoustic slope at q = 0", r => r.Item.SpeedMPerS));
        Dos = Spec<DosValue>(TableNames.Dos, axes,
            C<RowOf<DosValue>>("curve", ColumnType.Text, "", "total, or site for a partial density of states", r => r.Item.Site is null ? "total" : "site"),
            C<RowOf<DosValue>>("site", ColumnType.Int32, "", "basis site (0-based); empty for the total", r => r.Item.Site),
            C<RowOf<DosValue>>("freq_thz", ColumnType.Double, "THz", "bin centre frequency", r => r.Item.FrequencyThz),
            C<RowOf<DosValue>>("dos_per_thz_per_cell", ColumnType.Double, "1/(THz cell)", "states per THz per cell; the total integrates to the branch count", r => r.Item.Density),
            C<RowOf<DosValue>>("dos_stderr_per_thz_per_cell", ColumnType.Double, "1/(THz cell)", "standard error of the total when it is an average over random vectors or configurations", r => r.Item.StandardError));
        Thermal = Spec<ThermalValue>(TableNames.Thermal, axes, ThermalColumns());
        Dispersion = Spec<DispersionRow>(TableNames.Dispersion, axes,
            C<RowOf<DispersionRow>>("path_index", ColumnType.Int32, "", "index of the q point along the path", r => r.Item.PathIndex),
            C<RowOf<DispersionRow>>("path_position_per_nm", ColumnType.Double, "1/nm", "distance travelled along the path in reciprocal space", r => r.Item.PathPositionPerNm),
            C<RowOf<DispersionRow>>("corner_label", ColumnType.Text, "", "label when the q point is a path corner", r => r.Item.CornerLabel),
            C<RowOf<DispersionRow>>("qx_per_nm", ColumnType.Double, "1/nm", "wave vector x", r => r.Item.QxPerNm),
            C<RowOf<DispersionRow>>("qy_per_nm", ColumnType.Double, "1/nm", "wave vector y", r => r.Item.QyPerNm),
            C<RowOf<DispersionRow>>("qz_per_nm", ColumnType.Double, "1/nm", "wave vector z", r => r.Item.QzPerNm),
            C<RowOf<DispersionRow>>("branch", ColumnType.Int32, "", "branch, lowest first (0-based)", r => r.Item.Branch),
            C<RowOf<DispersionRow>>("freq_thz", ColumnType.Double, "THz", "frequency", r => r.Item.FrequencyThz),
            C<RowOf<DispersionRow>>("group_velocity_x_m_per_s", ColumnType.Double, "m/s", "group velocity x (empty for an imaginary mode of an unstable model)", r => Velocity(r, r.Item.GroupVelocityXMPerS)),
            C<RowOf<DispersionRow>>("group_velocity_y_m_per_s", ColumnType.Double, "m/s", "group velocity y", r => Velocity(r, r.Item.GroupVelocityYMPerS)),
            C<RowOf<DispersionRow>>("group_velocity_z_m_per_s", ColumnType.Double, "m/s", "group velocity z", r => Velocity(r, r.Item.GroupVelocityZMPerS)),
            C<RowOf<DispersionRow>>("mode_grueneisen", ColumnType.Double, "1", "mode Grueneisen parameter -d ln omega / d ln V (with [output.expansion] mode_grueneisen = true; empty at omega = 0)", r => r.Item.ModeGrueneisen));
        Modes = Spec<ModeLevel>(TableNames.Modes, axes,
            C<RowOf<ModeLevel>>("freq_thz", ColumnType.Double, "THz", "a distinct mode frequency of the finite crystal", r => r.Item.FrequencyThz),
            C<RowOf<ModeLevel>>("multiplicity", ColumnType.Int64, "", "modes sharing this frequency", r => r.Item.Multiplicity),
            C<RowOf<ModeLevel>>("configuration", ColumnType.Int32, "", "random configuration (0-based) of a disordered sample whose mode this is; empty for an ordered crystal", r => r.Item.Configuration));
        Displacements = Spec<DisplacementRow>(TableNames.MeanSquareDisplacements, axes,
            C<RowOf<DisplacementRow>>("temperature_k", ColumnType.Double, "K", "temperature", r => r.Item.TemperatureK),
            C<RowOf<DisplacementRow>>("site", ColumnType.Int32, "", "basis site (0-based)", r => r.Item.Site),
            C<RowOf<DisplacementRow>>("site_label", ColumnType.Text, "", "basis site label", r => r.Item.SiteLabel),
            C<RowOf<DisplacementRow>>("msd_x_nm2", ColumnType.Double, "nm^2", "mean-square displacement along x; +Infinity in bulk 1D (any T) and 2D (T > 0), where it diverges, and at 0 K along the motion of a 2D branch with omega ~ q^2 (a sheet's flexural branch)", r => r.Item.MsdXNm2),
            C<RowOf<DisplacementRow>>("msd_y_nm2", ColumnType.Double, "nm^2", "mean-square displacement along y", r => r.Item.MsdYNm2),
            C<RowOf<DisplacementRow>>("msd_z_nm2", ColumnType.Double, "nm^2", "mean-square displacement along z", r => r.Item.MsdZNm2));
        Expansion = Spec<ExpansionRow>(TableNames.Expansion, axes, ExpansionColumns());
        CumulativeKappa = Spec<MeanFreePathRow>(TableNames.CumulativeKappa, axes,
            C<RowOf<MeanFreePathRow>>("temperature_k", ColumnType.Double, "K", "the reference temperature the accumulation is taken at", r => r.Outcome.Result?.Conductivity?.ReferenceTemperatureK),
            C<RowOf<MeanFreePathRow>>("mfp_nm", ColumnType.Double, "nm", "phonon mean free path |v| tau (upper edge of a log bin, 10 per decade)", r => r.Item.MeanFreePathNm),
            C<RowOf<MeanFreePathRow>>("kappa_cumulative_w_per_m_k", ColumnType.Double, "W/(m K)", "conductivity carried by modes with a mean free path up to mfp_nm (mean over the lattice's directions)", r => r.Item.CumulativeKappaWPerMK),
            C<RowOf<MeanFreePathRow>>("kappa_fraction", ColumnType.Double, "1", "that part as a fraction of the whole", r => r.Item.CumulativeFraction));
        Layers = Spec<LayerRow>(TableNames.Layers, axes,
            C<RowOf<LayerRow>>("layer", ColumnType.Int32, "", "depth below the surface in nearest-neighbour hops (0 = surface atoms)", r => r.Item.Layer),
            C<RowOf<LayerRow>>("sites", ColumnType.Int64, "", "atoms in the layer", r => r.Item.Sites),
            C<RowOf<LayerRow>>("temperature_k", ColumnType.Double, "K", "temperature", r => r.Item.TemperatureK),
            C<RowOf<LayerRow>>("msd_x_nm2", ColumnType.Double, "nm^2", "mean-square displacement along x, mean over the layer's atoms", r => r.Item.MsdXNm2),
            C<RowOf<LayerRow>>("msd_y_nm2", ColumnType.Double, "nm^2", "along y (empty for the scalar model)", r => r.Item.MsdYNm2),
            C<RowOf<LayerRow>>("msd_z_nm2", ColumnType.Double, "nm^2", "along z (empty for the scalar model)", r => r.Item.MsdZNm2),
            C<RowOf<LayerRow>>("msd_x_stderr_nm2", ColumnType.Double, "nm^2", "standard error of msd_x_nm2 over the point's random vectors or configurations (stderr_source in points/); empty for exact modes", r => r.Item.MsdXStderrNm2),
            C<RowOf<LayerRow>>("msd_y_stderr_nm2", ColumnType.Double, "nm^2", "standard error of msd_y_nm2", r => r.Item.MsdYStderrNm2),
            C<RowOf<LayerRow>>("msd_z_stderr_nm2", ColumnType.Double, "nm^2", "standard error of msd_z_nm2", r => r.Item.MsdZStderrNm2));
        LayerDos = Spec<LayerDosValue>(TableNames.LayerDos, axes,
            C<RowOf<LayerDosValue>>("layer", ColumnType.Int32, "", "depth below the surface in nearest-neighbour hops (0 = surface atoms)", r => r.Item.Layer),
            C<RowOf<LayerDosValue>>("sites", ColumnType.Int64, "", "atoms in the layer", r => r.Item.Sites),
            C<RowOf<LayerDosValue>>("freq_thz", ColumnType.Double, "THz", "bin centre frequency (the bins of dos/)", r => r.Item.FrequencyThz),
            C<RowOf<LayerDosValue>>("dos_per_thz_per_atom", ColumnType.Double, "1/(THz atom)", "states per THz per atom of the layer; integrates to 3 (1 for the scalar model)", r => r.Item.Density),
            C<RowOf<LayerDosValue>>("dos_stderr_per_thz_per_atom", ColumnType.Double, "1/(THz atom)", "standard error of dos_per_thz_per_atom over the point's random vectors or configurations (stderr_source in points/); empty for exact modes", r => r.Item.StandardError));
    }

    public TableSpec<PointOutcome> Points { get; }
    public TableSpec<RowOf<SoundSpeedValue>> SoundSpeeds { get; }
    public TableSpec<RowOf<DosValue>> Dos { get; }
    public TableSpec<RowOf<ThermalValue>> Thermal { get; }
    public TableSpec<RowOf<DispersionRow>> Dispersion { get; }
    public TableSpec<RowOf<ModeLevel>> Modes { get; }
    public TableSpec<RowOf<DisplacementRow>> Displacements { get; }
    public TableSpec<RowOf<MeanFreePathRow>> CumulativeKappa { get; }
    public TableSpec<RowOf<LayerRow>> Layers { get; }
    public TableSpec<RowOf<LayerDosValue>> LayerDos { get; }
    public TableSpec<RowOf<ExpansionRow>> Expansion { get; }

    /// <summary>Every column name a table has of its own (not a swept parameter's): a swept parameter may not take one.</summary>
    public static IReadOnlySet<string> FixedColumnNames { get; } = AllFixedNames();

    private static HashSet<string> AllFixedNames()
    {
        var none = new ResultSchemas([]);
        return new HashSet<string>(
            new[] { TableNames.Points, TableNames.SoundSpeeds, TableNames.Dos, TableNames.Thermal, TableNames.Dispersion, TableNames.Modes, TableNames.MeanSquareDisplacements, TableNames.CumulativeKappa, TableNames.Layers, TableNames.LayerDos, TableNames.Expansion }
                .SelectMany(none.ColumnsOf).Select(c => c.Name).Concat(RunColumns<PointOutcome>(o => o).Select(c => c.Def.Name)),
            StringComparer.Ordinal);
    }

    /// <summary>Columns of a table by name (for the manifest and the units metadata).</summary>
    public IReadOnlyList<ColumnDef> ColumnsOf(string table) => table switch
    {
        TableNames.Points => Points.Defs,
        TableNames.SoundSpeeds => SoundSpeeds.Defs,
        TableNames.Dos => Dos.Defs,
        TableNames.Thermal => Thermal.Defs,
        TableNames.Dispersion => Dispersion.Defs,
        TableNames.Modes => Modes.Defs,
        TableNames.MeanSquareDisplacements or TableNames.FormerDisplacements => Displacements.Defs,
        TableNames.CumulativeKappa => CumulativeKappa.Defs,
        TableNames.Layers => Layers.Defs,
        TableNames.LayerDos => LayerDos.Defs,
        TableNames.Expansion => Expansion.Defs,
        _ => throw new ArgumentException($"no table named {table}", nameof(table)),
    };

    /// <summary>A mode with omega^2 &lt; 0 has no group velocity: its frequency is printed negative, its velocity empty.</summary>
    private static double? Velocity(RowOf<DispersionRow> r, double v) =>
        r.Outcome.State == Catalog.PointState.Unstable && r.Item.FrequencyThz < 0 ? null : v;

    /// <summary>
    /// The column name a swept parameter gets in a table: its own, unless a fixed column already has
    /// it. Sweeps planned now have the prefix in their axis name already (SweptColumnNames), so this
    /// only renames the axes of sweeps planned by an earlier version.
    /// </summary>
    public static string AxisColumnName(AxisInfo axis, ISet<string> reserved) =>
        reserved.Contains(axis.ColumnName) ? "axis_" + axis.ColumnName : axis.ColumnName;

    // One overload per value type, so each column collects a typed array without boxing a cell
    // (see TableColumn); the object overload takes anything else (converted once per column).
    private static TableColumn<T> C<T>(string name, ColumnType type, string unit, string description, Func<T, object?> get) =>
        new TableColumn<T, object?>(new ColumnDef(name, type, unit, description), get);

    private static TableColumn<T> C<T>(string name, ColumnType type, string unit, string description, Func<T, double?> get) =>
        new TableColumn<T, double?>(new ColumnDef(name, type, unit, description), get);

    private static TableColumn<T> C<T>(string name, ColumnType type, string unit, string description, Func<T, int?> get) =>
        new TableColumn<T, int?>(new ColumnDef(name, type, unit, description), get);

    private static TableColumn<T> C<T>(string name, ColumnType type, string unit, string description, Func<T, long?> get) =>
        new TableColumn<T, long?>(new ColumnDef(name, type, unit, description), get);

    private static TableColumn<T> C<T>(string name, ColumnType type, string unit, string description, Func<T, bool?> get) =>
        new TableColumn<T, bool?>(new ColumnDef(name, type, unit, description), get);

    private static TableColumn<T> C<T>(string name, ColumnType type, string unit, string description, Func<T, string?> get) =>
        new TableColumn<T, string?>(new ColumnDef(name, type, unit, description), get);

    private static TableColumn<T> C<T>(string name, ColumnType type, string unit, string description, Func<T, DateTimeOffset> get) =>
        new TableColumn<T, DateTimeOffset>(new ColumnDef(name, type, unit, description), get);

    /// <summary>A column of the point (its id, a swept parameter): computed once per point, repeated on each of its rows.</summary>
    private static TableColumn<T> P<T, TValue>(string name, ColumnType type, string unit, string description, Func<T, PointOutcome> outcome, Func<PointOutcome, TValue> get) =>
        new PointColumn<T, TValue>(new ColumnDef(name, type, unit, description), outcome, get);

    private static TableSpec<RowOf<T>> Spec<T>(string name, IReadOnlyList<AxisInfo> axes, params TableColumn<RowOf<T>>[] own) =>
        new(name, [.. PointHead<RowOf<T>>(axes, includeRunColumns: false, r => r.Outcome, own.Select(c => c.Def.Name)), .. own]);

    private static IEnumerable<TableColumn<T>> PointHead<T>(IReadOnlyList<AxisInfo> axes, bool includeRunColumns, Func<T, PointOutcome> outcome, IEnumerable<string>? ownNames = null)
    {
        yield return P<T, string>("point_id", ColumnType.Text, "", "stable id of the point (a hash of its parameters)", outcome, o => o.Point.PointId);
        // A swept parameter keeps one column name in every table: names taken by the points
        // table's own columns are reserved everywhere (a swept `sample.kind` becomes `axis_sample_kind`).
        var reserved = new HashSet<string>(StringComparer.Ordinal) { "point_id" };
        foreach (var c in RunColumns<T>(outcome))
        {
            reserved.Add(c.Def.Name);
            if (includeRunColumns)
            {
                yield return c;
            }
        }

        foreach (var c in SummaryColumns())
        {
            reserved.Add(c.Def.Name);
        }

        foreach (var n in ownNames ?? [])
        {
            reserved.Add(n);
        }

        foreach (var axis in axes)
        {
            var name = AxisColumnName(axis, reserved);
            var type = axis.ValueType switch
            {
                AxisValueType.Double => ColumnType.Double,
                AxisValueType.Integer => ColumnType.Int64,
                _ => ColumnType.Text,
            };
            var key = axis.ColumnName;
            yield return P<T, object?>(name, type, axis.Unit, $"swept parameter {axis.Path}", outcome,
                o => o.Point.Parameters.TryGetValue(key, out var v) ? AxisValue(v, type) : null);
        }
    }

    private static object? AxisValue(object value, ColumnType type) => type switch
    {
        ColumnType.Double => Convert.ToDouble(value, System.Globalization.CultureInfo.InvariantCulture),
        ColumnType.Int64 => Convert.ToInt64(value, System.Globalization.CultureInfo.InvariantCulture),
        _ => Catalog.CatalogJson.Show(value),
    };

    private static IEnumerable<TableColumn<T>> RunColumns<T>(Func<T, PointOutcome> o) =>
    [
        C<T>("point_index", ColumnType.Int64, "", "position of the point in the plan", r => (long)o(r).Point.Index),
        C<T>("chunk_id", ColumnType.Text, "", "the queue chunk (and part file) that wrote this row", r => o(r).ChunkId),
        C<T>("state", ColumnType.Text, "", "done, unstable (solved; the model has a negative eigenvalue: stable = false, thermal numbers empty) or failed", r => o(r).State.ToString().ToLowerInvariant()),
        C<T>("failure_kind", ColumnType.Text, "", "model or engine, for a failed point", r => o(r).FailureKind?.ToString().ToLowerInvariant()),
        C<T>("error", ColumnType.Text, "", "why the point failed; in brackets, where in the job file it comes from (README: What a failure says)", r => o(r).State == Catalog.PointState.Failed ? o(r).Error : null),
        C<T>("attempt", ColumnType.Int32, "", "how many times this point was started (1 = first run)", r => o(r).Attempt),
        C<T>("started_at", ColumnType.Timestamp, "UTC", "when the point started", r => o(r).StartedAt),
        C<T>("finished_at", ColumnType.Timestamp, "UTC", "when the point ended", r => o(r).FinishedAt),
        C<T>("duration_s", ColumnType.Double, "s", "time the point took", r => o(r).DurationSeconds),
        C<T>("engine_version", ColumnType.Text, "", "version of the solver that computed the row", r => o(r).EngineVersion),
    ];

    private static IEnumerable<TableColumn<PointOutcome>> SummaryColumns()
    {
        static PointSummary? S(PointOutcome o) => o.Result?.Summary;
        static double[]? Christoffel(PointOutcome o) =>
            o.Result?.ElasticFit is { } f ? [.. f.SoundSpeeds.SelectMany(x => x.SpeedsMPerS)] : null;
        static BandGap? Largest(PointOutcome o) =>
            S(o) is { Gaps.Length: > 0 } s ? s.Gaps.MaxBy(g => g.WidthThz) : null;
        static BandGap? Lowest(PointOutcome o) =>
            S(o) is { Gaps.Length: > 0 } s ? s.Gaps.MinBy(g => g.LowerThz) : null;
        static double[] Speeds(PointOutcome o) =>
            S(o) is { } s ? [.. s.SoundSpeeds.SelectMany(x => x.SpeedsMPerS).Where(double.IsFinite)] : [];
        static double? PerKg(PointOutcome o, Func<PointSummary, double?> perMol) =>
            S(o) is { } s ? perMol(s) * ThermalScale.PerKgFactor(s.MolarMassKgPerMol) : null;
        static double? PerCell(PointOutcome o, Func<PointSummary, double?> perMol) =>
            S(o) is { } s ? perMol(s) * ThermalScale.PerCellFactor(s.SitesPerCell) : null;

        return
        [
            C<PointOutcome>("dimension", ColumnType.Int32, "", "lattice dimension", o => S(o)?.Dimension),
            C<PointOutcome>("sites_per_cell", ColumnType.Int32, "", "basis sites per primitive cell", o => S(o)?.SitesPerCell),
            C<PointOutcome>("branch_count", ColumnType.Int32, "", "phonon branches", o => S(o)?.BranchCount),
            C<PointOutcome>("sample_kind", ColumnType.Text, "", "finite or bulk", o => S(o)?.SampleKind),
            C<PointOutcome>("cells_or_mesh_points", ColumnType.Int64, "", "cells of a finite crystal, or wave vectors of a bulk mesh", o => S(o)?.CellsOrMeshPoints),
            C<PointOutcome>("q_points_solved", ColumnType.Int64, "", "wave vectors diagonalised", o => S(o)?.QPointsSolved),
            C<PointOutcome>("mode_count", ColumnType.Int64, "", "modes in the calculation", o => S(o)?.ModeCount),
            C<PointOutcome>("rigid_modes_excluded", ColumnType.Int32, "", "zero-frequency translations left out of thermal sums", o => S(o)?.RigidModesExcluded),
            C<PointOutcome>("zero_modes_excluded", ColumnType.Int64, "", "every zero-frequency mode left out of thermal sums: the rigid translations and any other, but the floors of zero valleys away from q = 0 on the mesh points or wave vectors (a bulk sheet's or, since Round 30, a bulk chain's mesh integrates them as q = 0 is; a periodic finite sheet, and since Round 29 a finite chain or crystal, leaves them out like the rigid translations without counting them: *What the solver does*)", o => S(o) is { } s ? ZeroModes.Total(s) : null),
            C<PointOutcome>("floppy", ColumnType.Bool, "", "more zero modes than rigid translations: some motion meets no spring at some wave vectors (its modes carry no heat)", o => S(o) is { } s ? ZeroModes.Floppy(s) : null),
            C<PointOutcome>("max_freq_thz", ColumnType.Double, "THz", "highest frequency", o => S(o)?.MaxFrequencyThz),
            C<PointOutcome>("min_freq_thz", ColumnType.Double, "THz", "lowest frequency (negative for an unstable model)", o => S(o)?.MinFrequencyThz),
            C<PointOutcome>("stable", ColumnType.Bool, "", "no negative eigenvalue beyond round-off", o => S(o)?.Stable),
            C<PointOutcome>("worst_q_reduced_x", ColumnType.Double, "reduced", "reduced wave vector of the worst instability", o => S(o)?.WorstQReduced?.X),
            C<PointOutcome>("worst_q_reduced_y", ColumnType.Double, "reduced", "reduced wave vector of the worst instability", o => S(o)?.WorstQReduced?.Y),
            C<PointOutcome>("worst_q_reduced_z", ColumnType.Double, "reduced", "reduced wave vector of the worst instability", o => S(o)?.WorstQReduced?.Z),
            C<PointOutcome>("gap_count", ColumnType.Int32, "", "band gaps found (empty for an unstable model)", o => S(o) is { Stable: true } s ? s.Gaps.Length : null),
            C<PointOutcome>("largest_gap_lower_thz", ColumnType.Double, "THz", "lower edge of the widest gap", o => Largest(o)?.LowerThz),
            C<PointOutcome>("largest_gap_upper_thz", ColumnType.Double, "THz", "upper edge of the widest gap", o => Largest(o)?.UpperThz),
            C<PointOutcome>("largest_gap_width_thz", ColumnType.Double, "THz", "width of the widest gap", o => Largest(o)?.WidthThz),
            C<PointOutcome>("lowest_gap_lower_thz", ColumnType.Double, "THz", "lower edge of the lowest gap", o => Lowest(o)?.LowerThz),
            C<PointOutcome>("lowest_gap_upper_thz", ColumnType.Double, "THz", "upper edge of the lowest gap", o => Lowest(o)?.UpperThz),
            C<PointOutcome>("sound_direction_count", ColumnType.Int32, "", "directions with sound speeds (each in sound_speeds/; empty for an unstable model)", o => S(o) is { Stable: true } s ? s.SoundSpeeds.Length : null),
            C<PointOutcome>("sound_speed_min_m_per_s", ColumnType.Double, "m/s", "slowest sound speed over directions and branches", o => Speeds(o) is { Length: > 0 } v ? v.Min() : null),
            C<PointOutcome>("sound_speed_mean_m_per_s", ColumnType.Double, "m/s", "mean sound speed over directions and branches", o => Speeds(o) is { Length: > 0 } v ? v.Average() : null),
            C<PointOutcome>("sound_speed_max_m_per_s", ColumnType.Double, "m/s", "fastest sound speed over directions and branches", o => Speeds(o) is { Length: > 0 } v ? v.Max() : null),
            C<PointOutcome>("reference_temperature_k", ColumnType.Double, "K", "temperature of the summary thermal numbers", o => S(o)?.ReferenceTemperatureK),
            C<PointOutcome>("cv_j_per_mol_k", ColumnType.Double, "J/(mol K)", "heat capacity per mole of atoms", o => S(o)?.HeatCapacityJPerMolK),
            C<PointOutcome>("cv_j_per_kg_k", ColumnType.Double, "J/(kg K)", "heat capacity per kg", o => PerKg(o, s => s.HeatCapacityJPerMolK)),
            C<PointOutcome>("cv_j_per_cell_k", ColumnType.Double, "J/(cell K)", "heat capacity per primitive cell", o => PerCell(o, s => s.HeatCapacityJPerMolK)),
            C<PointOutcome>("entropy_j_per_mol_k", ColumnType.Double, "J/(mol K)", "entropy per mole of atoms", o => S(o)?.EntropyJPerMolK),
            C<PointOutcome>("entropy_j_per_kg_k", ColumnType.Double, "J/(kg K)", "entropy per kg", o => PerKg(o, s => s.EntropyJPerMolK)),
            C<PointOutcome>("free_energy_j_per_mol", ColumnType.Double, "J/mol", "Helmholtz free energy per mole of atoms", o => S(o)?.FreeEnergyJPerMol),
            C<PointOutcome>("internal_energy_j_per_mol", ColumnType.Double, "J/mol", "internal energy per mole of atoms", o => S(o)?.InternalEnergyJPerMol),
            C<PointOutcome>("zero_point_energy_j_per_mol", ColumnType.Double, "J/mol", "zero-point energy per mole of atoms", o => S(o)?.ZeroPointEnergyJPerMol),
            C<PointOutcome>("debye_temperature_from_cv_k", ColumnType.Double, "K", "Debye temperature whose Debye Cv equals Cv at the reference temperature, both as fractions of the classical limit (kB per mode in the sums: a finite crystal leaves out its zero modes)", o => S(o)?.DebyeTemperatureFromCvK),
            C<PointOutcome>("debye_temperature_moment_minus2_k", ColumnType.Double, "K", "Debye temperature from the n = -2 frequency moment", o => S(o)?.DebyeTemperatureMomentMinus2K),
            C<PointOutcome>("debye_temperature_moment_log_k", ColumnType.Double, "K", "Debye temperature from the logarithmic moment", o => S(o)?.DebyeTemperatureMomentLogK),
            C<PointOutcome>("debye_temperature_moment_2_k", ColumnType.Double, "K", "Debye temperature from the n = 2 frequency moment", o => S(o)?.DebyeTemperatureMoment2K),
            C<PointOutcome>("molar_mass_kg_per_mol", ColumnType.Double, "kg/mol", "mean molar mass of the atoms", o => S(o)?.MolarMassKgPerMol),
            C<PointOutcome>("dos_method", ColumnType.Text, "", "how the density of states was integrated", o => o.Result?.Dos.Method),
            C<PointOutcome>("elastic_fit_relative_residual", ColumnType.Double, "1", "springs fitted to elastic constants: |C_model - C_given| / |C_given| over C11, C12, C44 (empty for other models)", o => o.Result?.ElasticFit?.RelativeResidual),
            C<PointOutcome>("elastic_c11_fitted_gpa", ColumnType.Double, "GPa", "C11 the fitted springs reproduce", o => o.Result?.ElasticFit?.Reproduced.C11Gpa),
            C<PointOutcome>("elastic_c12_fitted_gpa", ColumnType.Double, "GPa", "C12 the fitted springs reproduce (central springs give C12 = C44)", o => o.Result?.ElasticFit?.Reproduced.C12Gpa),
            C<PointOutcome>("elastic_c44_fitted_gpa", ColumnType.Double, "GPa", "C44 the fitted springs reproduce", o => o.Result?.ElasticFit?.Reproduced.C44Gpa),
            C<PointOutcome>("christoffel_speed_min_m_per_s", ColumnType.Double, "m/s", "slowest Christoffel sound speed of the fitted constants over [100], [110], [111]", o => Christoffel(o)?.Min()),
            C<PointOutcome>("christoffel_speed_mean_m_per_s", ColumnType.Double, "m/s", "mean Christoffel sound speed over those directions and branches", o => Christoffel(o)?.Average()),
            C<PointOutcome>("christoffel_speed_max_m_per_s", ColumnType.Double, "m/s", "fastest Christoffel sound speed over those directions", o => Christoffel(o)?.Max()),
            .. ConductivitySummaryColumns(),
            .. SurfaceSummaryColumns(),
            .. ElasticSummaryColumns(),
            .. ExpansionSummaryColumns(),
            .. ElasticFitColumns(),
        ];
    }

    /// <summary>Numbers of samples built in real space (free boundaries, shapes, disorder); empty for periodic crystals and the bulk.</summary>
    private static IEnumerable<TableColumn<PointOutcome>> SurfaceSummaryColumns()
    {
        static SurfaceResult? F(PointOutcome o) => o.Result?.Surface;
        static double? Ratio(PointOutcome o) =>
            F(o)?.PeriodicCvAtReferenceJPerMolK is { } p && p > 0 && o.Result!.Summary.HeatCapacityJPerMolK is { } cv ? cv / p : null;
        static double? SameCompositionRatio(PointOutcome o) =>
            F(o)?.PeriodicSameCompositionCvAtReferenceJPerMolK is { } p && p > 0 && o.Result!.Summary.HeatCapacityJPerMolK is { } cv ? cv / p : null;
        return
        [
            C<PointOutcome>("boundaries", ColumnType.Text, "", "boundary of each lattice direction, e.g. periodic,periodic,free (empty for periodic crystals given without boundaries, and the bulk)", o => F(o)?.Boundaries),
            C<PointOutcome>("shape", ColumnType.Text, "", "box, sphere or cylinder", o => F(o)?.Shape),
            C<PointOutcome>("solver_method", ColumnType.Text, "", "dense, dense per wave vector, or kernel polynomial", o => F(o)?.Method),
            C<PointOutcome>("atom_count", ColumnType.Int64, "", "atoms in the sample", o => F(o)?.AtomCount),
            C<PointOutcome>("surface_sites", ColumnType.Int64, "", "atoms that lost a nearest neighbour to a cut (layer 0)", o => F(o)?.SurfaceSites),
            C<PointOutcome>("interior_sites", ColumnType.Int64, "", "the other atoms", o => F(o)?.InteriorSites),
            C<PointOutcome>("layer_count", ColumnType.Int32, "", "layers below the surface (nearest-neighbour hops; 0 without a surface)", o => F(o)?.LayerCount),
            C<PointOutcome>("rigid_rotations", ColumnType.Int32, "", "rigid rotations among the rigid-body modes (3 for a free cluster, 1 for a wire or an in-plane flake)", o => F(o)?.RigidRotations),
            C<PointOutcome>("rotation_defect_thz", ColumnType.Double, "THz", "frequency the rigid rotations would have if not projected out (0 for rotationally invariant springs)", o => F(o)?.RotationDefectThz),
            C<PointOutcome>("confinement_gap_thz", ColumnType.Double, "THz", "lowest frequency above the zero modes", o => F(o)?.ConfinementGapThz),
            C<PointOutcome>("surface_mode_fraction", ColumnType.Double, "1", "fraction of non-zero modes with at least surface_weight_threshold of their weight on surface atoms", o => F(o)?.SurfaceModeFraction),
            C<PointOutcome>("surface_weight_threshold", ColumnType.Double, "1", "the weight that makes a mode a surface mode", o => F(o)?.SurfaceWeightThreshold),
            C<PointOutcome>("msd_surface_nm2", ColumnType.Double, "nm^2", "mean-square displacement of surface atoms at the reference temperature, mean over directions", o => F(o)?.MsdSurfaceNm2),
            C<PointOutcome>("msd_interior_nm2", ColumnType.Double, "nm^2", "the same for the interior atoms; where no atom lost a nearest neighbour (`layer_count` 0, msd_surface_nm2 empty: a free sample cut only across bonds that are nobody's nearest, or a periodic box such as a disordered supercell) every atom, the mean of the per-site values in `mean_square_displacements/` weighted by their atoms", o => F(o)?.MsdInteriorNm2),
            C<PointOutcome>("periodic_cells", ColumnType.Text, "", "cells per direction of the periodic crystal of the same size", o => F(o)?.PeriodicCells),
            C<PointOutcome>("periodic_cv_j_per_mol_k", ColumnType.Double, "J/(mol K)", "heat capacity of that periodic crystal at the reference temperature", o => F(o)?.PeriodicCvAtReferenceJPerMolK),
            C<PointOutcome>("cv_ratio_to_periodic", ColumnType.Double, "1", "cv_j_per_mol_k divided by periodic_cv_j_per_mol_k (the surface enhancement of an ordered sample; with disorder also the substitutes' effect)", o => Ratio(o)),
            C<PointOutcome>("periodic_ordered_cv_j_per_mol_k", ColumnType.Double, "J/(mol K)", "heat capacity at the reference temperature of the periodic crystal of the same cells and the sample's composition (a disordered sample's periodic virtual crystal; the host's otherwise)", o => F(o)?.PeriodicSameCompositionCvAtReferenceJPerMolK),
            C<PointOutcome>("cv_ratio_to_periodic_ordered", ColumnType.Double, "1", "cv_j_per_mol_k over the heat capacity of the periodic crystal of the sample's composition, ordered: the surface enhancement, with or without disorder (its standard error: cv_stderr_j_per_mol_k over that heat capacity)", o => SameCompositionRatio(o)),
            C<PointOutcome>("kpm_moments", ColumnType.Int32, "", "Chebyshev moments of the kernel polynomial method (empty for dense solutions)", o => F(o)?.KpmMoments),
            C<PointOutcome>("kpm_random_vectors", ColumnType.Int32, "", "random vectors of its stochastic trace", o => F(o)?.KpmRandomVectors),
            C<PointOutcome>("kpm_resolution_thz", ColumnType.Double, "THz", "its frequency resolution near zero, sqrt(pi a / moments)", o => F(o)?.KpmResolutionThz),
            .. ErrorColumns(),
            .. MeshChangeColumns(),
            .. OrderedColumns(),
            C<PointOutcome>("kappa_confined_w_per_m_k", ColumnType.Double, "W/(m K)", "films and wires: conductivity from their own confined modes at the reference temperature, mean over the periodic directions (same scattering channels as kappa_w_per_m_k, which uses the periodic crystal's modes)", o => V(o.Result?.ConfinedConductivity?.AtReference.KappaWPerMK)),
            C<PointOutcome>("kappa_confined_1_w_per_m_k", ColumnType.Double, "W/(m K)", "along the first periodic lattice direction", o => V(o.Result?.ConfinedConductivity?.AtReference.KappaXxWPerMK)),
            C<PointOutcome>("kappa_confined_2_w_per_m_k", ColumnType.Double, "W/(m K)", "along the second in-plane direction, orthogonal to the first (films)", o => V(o.Result?.ConfinedConductivity?.AtReference.KappaYyWPerMK)),
            C<PointOutcome>("kappa_confined_directions", ColumnType.Text, "", "the directions: along a3 (a wire) or in the a1-a2 plane (a film)", o => o.Result?.ConfinedConductivity?.Directions),
        ];
    }

    /// <summary>A disordered point's ordered virtual crystal beside it (empty for ordered samples).</summary>
    private static IEnumerable<TableColumn<PointOutcome>> OrderedColumns()
    {
        static PointResult? O(PointOutcome o) => o.Result?.Ordered;
        return
        [
            C<PointOutcome>("ordered_cv_j_per_mol_k", ColumnType.Double, "J/(mol K)", "Cv of the same sample ordered as its virtual crystal (mean masses and springs); cv_j_per_mol_k minus this is the effect of disorder", o => O(o)?.Summary.HeatCapacityJPerMolK),
            C<PointOutcome>("ordered_entropy_j_per_mol_k", ColumnType.Double, "J/(mol K)", "entropy of the virtual crystal", o => O(o)?.Summary.EntropyJPerMolK),
            C<PointOutcome>("ordered_free_energy_j_per_mol", ColumnType.Double, "J/mol", "free energy of the virtual crystal", o => O(o)?.Summary.FreeEnergyJPerMol),
            C<PointOutcome>("ordered_max_freq_thz", ColumnType.Double, "THz", "highest frequency of the virtual crystal", o => O(o)?.Summary.MaxFrequencyThz),
            C<PointOutcome>("ordered_confinement_gap_thz", ColumnType.Double, "THz", "confinement gap of the virtual crystal", o => O(o)?.Surface?.ConfinementGapThz),
            C<PointOutcome>("ordered_msd_surface_nm2", ColumnType.Double, "nm^2", "surface mean-square displacement of the virtual crystal", o => O(o)?.Surface?.MsdSurfaceNm2),
            C<PointOutcome>("ordered_msd_interior_nm2", ColumnType.Double, "nm^2", "interior mean-square displacement of the virtual crystal", o => O(o)?.Surface?.MsdInteriorNm2),
            C<PointOutcome>("ordered_cv_stderr_j_per_mol_k", ColumnType.Double, "J/(mol K)", "standard error of ordered_cv_j_per_mol_k over its own random vectors (kernel polynomial method; empty when exact); independent of cv_stderr_j_per_mol_k, so the error of cv - ordered_cv is the root of the sum of their squares", o => O(o)?.Errors?.HeatCapacityJPerMolK),
            C<PointOutcome>("ordered_msd_surface_stderr_nm2", ColumnType.Double, "nm^2", "standard error of ordered_msd_surface_nm2 (over its own random vectors, as for its Cv)", o => O(o)?.Errors?.MsdSurfaceNm2),
            C<PointOutcome>("ordered_msd_interior_stderr_nm2", ColumnType.Double, "nm^2", "standard error of ordered_msd_interior_nm2 (over its own random vectors, as for its Cv)", o => O(o)?.Errors?.MsdInteriorNm2),
        ];
    }

    /// <summary>Standard errors of the averaged numbers (random vectors and/or configurations); empty for exact results.</summary>
    private static IEnumerable<TableColumn<PointOutcome>> ErrorColumns()
    {
        static StatisticalErrors? E(PointOutcome o) => o.Result?.Errors;
        return
        [
            C<PointOutcome>("stderr_source", ColumnType.Text, "", "what the standard errors are over: random vectors or configurations", o => E(o)?.Source),
            C<PointOutcome>("stderr_samples", ColumnType.Int32, "", "how many random vectors or configurations were averaged", o => E(o)?.Samples),
            C<PointOutcome>("cv_stderr_j_per_mol_k", ColumnType.Double, "J/(mol K)", "standard error of cv_j_per_mol_k", o => E(o)?.HeatCapacityJPerMolK),
            C<PointOutcome>("entropy_stderr_j_per_mol_k", ColumnType.Double, "J/(mol K)", "standard error of entropy_j_per_mol_k", o => E(o)?.EntropyJPerMolK),
            C<PointOutcome>("free_energy_stderr_j_per_mol", ColumnType.Double, "J/mol", "standard error of free_energy_j_per_mol", o => E(o)?.FreeEnergyJPerMol),
            C<PointOutcome>("internal_energy_stderr_j_per_mol", ColumnType.Double, "J/mol", "standard error of internal_energy_j_per_mol", o => E(o)?.InternalEnergyJPerMol),
            C<PointOutcome>("zero_point_energy_stderr_j_per_mol", ColumnType.Double, "J/mol", "standard error of zero_point_energy_j_per_mol", o => E(o)?.ZeroPointEnergyJPerMol),
            C<PointOutcome>("max_freq_stderr_thz", ColumnType.Double, "THz", "standard error of max_freq_thz (configurations)", o => E(o)?.MaxFrequencyThz),
            C<PointOutcome>("confinement_gap_stderr_thz", ColumnType.Double, "THz", "standard error of confinement_gap_thz (configurations)", o => E(o)?.ConfinementGapThz),
            C<PointOutcome>("surface_mode_fraction_stderr", ColumnType.Double, "1", "standard error of surface_mode_fraction (configurations)", o => E(o)?.SurfaceModeFraction),
            C<PointOutcome>("msd_surface_stderr_nm2", ColumnType.Double, "nm^2", "standard error of msd_surface_nm2", o => E(o)?.MsdSurfaceNm2),
            C<PointOutcome>("msd_interior_stderr_nm2", ColumnType.Double, "nm^2", "standard error of msd_interior_nm2", o => E(o)?.MsdInteriorNm2),
            C<PointOutcome>("cv_ratio_stderr", ColumnType.Double, "1", "standard error of cv_ratio_to_periodic (configurations)", o => E(o)?.CvRatioToPeriodic),
        ];
    }

    /// <summary>
    /// Bulk points: how much the summary's thermal numbers move on the half-density mesh (this mesh's
    /// value minus the check mesh's); empty for finite crystals, samples built in real space, unstable
    /// points, meshes too small to halve, and with [output] thermal_mesh_check = false.
    /// </summary>
    private static IEnumerable<TableColumn<PointOutcome>> MeshChangeColumns()
    {
        static MeshChange? M(PointOutcome o) => o.Result?.MeshChange;
        return
        [
            C<PointOutcome>("thermal_check_mesh", ColumnType.Text, "", "the half-density mesh the thermal numbers were checked against", o => M(o) is { } m ? string.Join('x', m.CheckMesh) : null),
            C<PointOutcome>("cv_mesh_change_j_per_mol_k", ColumnType.Double, "J/(mol K)", "cv_j_per_mol_k on this mesh minus on the check mesh (an indicator of the mesh error, not an error bar)", o => V(M(o)?.HeatCapacityJPerMolK)),
            C<PointOutcome>("entropy_mesh_change_j_per_mol_k", ColumnType.Double, "J/(mol K)", "entropy_j_per_mol_k on this mesh minus on the check mesh", o => V(M(o)?.EntropyJPerMolK)),
            C<PointOutcome>("free_energy_mesh_change_j_per_mol", ColumnType.Double, "J/mol", "free_energy_j_per_mol on this mesh minus on the check mesh", o => V(M(o)?.FreeEnergyJPerMol)),
            C<PointOutcome>("internal_energy_mesh_change_j_per_mol", ColumnType.Double, "J/mol", "internal_energy_j_per_mol on this mesh minus on the check mesh", o => V(M(o)?.InternalEnergyJPerMol)),
            C<PointOutcome>("zero_point_energy_mesh_change_j_per_mol", ColumnType.Double, "J/mol", "zero_point_energy_j_per_mol on this mesh minus on the check mesh", o => V(M(o)?.ZeroPointEnergyJPerMol)),
            C<PointOutcome>("dos_mesh_change", ColumnType.Double, "1", "largest difference between the cumulative densities of states of this mesh and the check mesh, as a fraction of all states", o => V(M(o)?.DosStateFraction)),
        ];
    }

    /// <summary>The quasi-harmonic state at the reference temperature, and the Grueneisen parameter the conductivity used.</summary>
    private static IEnumerable<TableColumn<PointOutcome>> ExpansionSummaryColumns()
    {
        static ExpansionResult? X(PointOutcome o) => o.Result?.Expansion;
        static ExpansionRow? R(PointOutcome o) => X(o)?.AtReference;
        return
        [
            C<PointOutcome>("expansion_lattice_constant_nm", ColumnType.Double, "nm", "quasi-harmonic lattice constant at the reference temperature (empty without [output.expansion] or where it breaks down)", o => R(o)?.LatticeConstantNm),
            C<PointOutcome>("linear_expansion_per_k", ColumnType.Double, "1/K", "linear thermal expansion coefficient at the reference temperature", o => R(o)?.LinearExpansionPerK),
            C<PointOutcome>("volume_expansion_per_k", ColumnType.Double, "1/K", "volumetric (2D: areal) thermal expansion coefficient at the reference temperature", o => R(o)?.VolumeExpansionPerK),
            C<PointOutcome>("isothermal_bulk_modulus_gpa", ColumnType.Double, "GPa", "isothermal bulk modulus V d2F/dV2 at the reference temperature (3D)", o => R(o)?.IsothermalBulkModulusGpa),
            C<PointOutcome>("isothermal_bulk_modulus_n_per_m", ColumnType.Double, "N/m", "the same for a sheet, A d2F/dA2 (2D)", o => R(o)?.IsothermalBulkModulusNPerM),
            C<PointOutcome>("isothermal_bulk_modulus_n", ColumnType.Double, "N", "the same for a chain, L d2F/dL2 (1D)", o => R(o)?.IsothermalBulkModulusN),
            C<PointOutcome>("cp_j_per_mol_k", ColumnType.Double, "J/(mol K)", "heat capacity at constant pressure Cv + alpha_V^2 B_T V T at the reference temperature", o => R(o)?.CpJPerMolK),
            C<PointOutcome>("grueneisen_parameter", ColumnType.Double, "1", "thermal (Cv-weighted) Grueneisen parameter at the reference temperature", o => R(o)?.Grueneisen),
            C<PointOutcome>("expansion_breakdown", ColumnType.Text, "", "why the quasi-harmonic approximation gives no numbers at the reference temperature (empty when it holds)", o => R(o)?.Breakdown),
            C<PointOutcome>("expansion_volumes_used", ColumnType.Int32, "", "stable volumes the quasi-harmonic fit used", o => X(o)?.VolumesUsed),
            C<PointOutcome>("kappa_grueneisen_parameter", ColumnType.Double, "1", "Grueneisen parameter the conductivity's Umklapp rate and Slack's estimate used", o => o.Result?.Conductivity?.GrueneisenParameter),
            C<PointOutcome>("kappa_grueneisen_source", ColumnType.Text, "", "given (in the job file) or quasi_harmonic (computed at the reference temperature)", o => o.Result?.Conductivity?.GrueneisenSource),
        ];
    }

    private static TableColumn<RowOf<ExpansionRow>>[] ExpansionColumns() =>
    [
        C<RowOf<ExpansionRow>>("temperature_k", ColumnType.Double, "K", "temperature", r => r.Item.TemperatureK),
        C<RowOf<ExpansionRow>>("lattice_constant_nm", ColumnType.Double, "nm", "lattice constant at the minimum of F = E_static + F_vib", r => r.Item.LatticeConstantNm),
        C<RowOf<ExpansionRow>>("volume_ratio", ColumnType.Double, "1", "V(T) / V at the static minimum (zero-point motion makes it exceed 1 at 0 K)", r => r.Item.VolumeRatio),
        C<RowOf<ExpansionRow>>("linear_expansion_per_k", ColumnType.Double, "1/K", "linear thermal expansion coefficient alpha_V / d", r => r.Item.LinearExpansionPerK),
        C<RowOf<ExpansionRow>>("volume_expansion_per_k", ColumnType.Double, "1/K", "volumetric (2D: areal; 1D: linear) thermal expansion coefficient (1/V) dV/dT", r => r.Item.VolumeExpansionPerK),
        C<RowOf<ExpansionRow>>("isothermal_bulk_modulus_gpa", ColumnType.Double, "GPa", "isothermal bulk modulus V d2F/dV2 (3D)", r => r.Item.IsothermalBulkModulusGpa),
        C<RowOf<ExpansionRow>>("isothermal_bulk_modulus_n_per_m", ColumnType.Double, "N/m", "isothermal area modulus A d2F/dA2 (2D)", r => r.Item.IsothermalBulkModulusNPerM),
        C<RowOf<ExpansionRow>>("isothermal_bulk_modulus_n", ColumnType.Double, "N", "isothermal length modulus L d2F/dL2 (1D)", r => r.Item.IsothermalBulkModulusN),
        C<RowOf<ExpansionRow>>("cv_j_per_mol_k", ColumnType.Double, "J/(mol K)", "heat capacity at constant volume, at V(T)", r => r.Item.CvJPerMolK),
        C<RowOf<ExpansionRow>>("cp_j_per_mol_k", ColumnType.Double, "J/(mol K)", "heat capacity at constant pressure Cv + alpha_V^2 B_T V T", r => r.Item.CpJPerMolK),
        C<RowOf<ExpansionRow>>("grueneisen_parameter", ColumnType.Double, "1", "thermal Grueneisen parameter V (dS/dV)_T / Cv, the Cv-weighted mean of the mode parameters (empty at 0 K and where Cv is below 1e-12 kB per cell: no mode excited)", r => r.Item.Grueneisen),
        C<RowOf<ExpansionRow>>("free_energy_j_per_mol", ColumnType.Double, "J/mol", "F = E_static + F_vib at the minimum, per mole of atoms", r => r.Item.FreeEnergyJPerMol),
        C<RowOf<ExpansionRow>>("breakdown", ColumnType.Text, "", "why the approximation gives no numbers at this temperature (no minimum of F, runaway expansion); empty when it holds", r => r.Item.Breakdown),
    ];

    /// <summary>The model's lattice constant, long-wave elastic constants and any fit of its springs to them.</summary>
    private static IEnumerable<TableColumn<PointOutcome>> ElasticSummaryColumns()
    {
        static PointSummary? S(PointOutcome o) => o.Result?.Summary;
        return
        [
            C<PointOutcome>("lattice_constant_nm", ColumnType.Double, "nm", "lattice constant the point was solved at (after relaxation to the static minimum, when asked)", o => S(o)?.LatticeConstantNm),
            C<PointOutcome>("c11_gpa", ColumnType.Double, "GPa", "C11 from the long-wave limit, internal strain included (cubic lattices whose long waves are cubic along [100], [010] and [001]: empty where the springs differ between the axes; a model under static stress gives its stressed wave modulus)", o => S(o)?.ElasticConstants?.C11Gpa),
            C<PointOutcome>("c12_gpa", ColumnType.Double, "GPa", "C12 from the long-wave limit (cubic lattices)", o => S(o)?.ElasticConstants?.C12Gpa),
            C<PointOutcome>("c44_gpa", ColumnType.Double, "GPa", "C44 from the long-wave limit (cubic lattices)", o => S(o)?.ElasticConstants?.C44Gpa),
            C<PointOutcome>("elastic_fit_nearest_n_per_m", ColumnType.Double, "N/m", "fitted nearest-neighbour spring: central (elastic builder) or bond stretch (tetrahedral builder)", o => o.Result?.ElasticFit?.NearestNPerM),
            C<PointOutcome>("elastic_fit_next_nearest_n_per_m", ColumnType.Double, "N/m", "fitted next-nearest central spring (elastic builder; 0 when not fitted)", o => o.Result?.ElasticFit is { BendNPerM: null } f ? f.NextNearestNPerM : null),
            C<PointOutcome>("elastic_fit_bend_n_per_m", ColumnType.Double, "N/m", "fitted Keating bond-bend constant (tetrahedral builder)", o => o.Result?.ElasticFit?.BendNPerM),
            C<PointOutcome>("static_energy_ev_per_atom", ColumnType.Double, "eV", "static lattice energy of the potentials per atom at the geometry solved (empty without potentials)", o => S(o)?.StaticLattice?.EnergyEvPerAtom),
            C<PointOutcome>("static_pressure_gpa", ColumnType.Double, "GPa", "static pressure -dE/dV at the geometry solved (3D)", o => S(o)?.StaticLattice?.PressureGpa),
            C<PointOutcome>("static_lattice_constant_nm", ColumnType.Double, "nm", "lattice constant at the minimum of the static energy (isotropic scaling)", o => S(o)?.StaticLattice?.EquilibriumLatticeConstantNm),
            C<PointOutcome>("static_min_energy_ev_per_atom", ColumnType.Double, "eV", "static energy per atom at that minimum (minus the cohesive energy)", o => S(o)?.StaticLattice?.EquilibriumEnergyEvPerAtom),
            C<PointOutcome>("static_bulk_modulus_gpa", ColumnType.Double, "GPa", "static bulk modulus V d2E/dV2 at that minimum (3D)", o => S(o)?.StaticLattice?.EquilibriumBulkModulusGpa),
        ];
    }

    /// <summary>Christoffel speeds of the elastic constants given to the spring fit (`[model.elastic]`), beside the fitted ones; empty for other models.</summary>
    private static IEnumerable<TableColumn<PointOutcome>> ElasticFitColumns()
    {
        static double[] Given(PointOutcome o) => o.Result?.ElasticFit is { } f ? [.. f.GivenSoundSpeeds.SelectMany(s => s.SpeedsMPerS)] : [];
        return
        [
            C<PointOutcome>("elastic_given_speed_min_m_per_s", ColumnType.Double, "m/s", "slowest Christoffel sound speed of the given elastic constants over [100], [110], [111] (compare christoffel_speed_min_m_per_s, the fitted springs')", o => Given(o) is { Length: > 0 } v ? v.Min() : null),
            C<PointOutcome>("elastic_given_speed_mean_m_per_s", ColumnType.Double, "m/s", "mean Christoffel sound speed of the given elastic constants over [100], [110], [111] and branches", o => Given(o) is { Length: > 0 } v ? v.Average() : null),
            C<PointOutcome>("elastic_given_speed_max_m_per_s", ColumnType.Double, "m/s", "fastest Christoffel sound speed of the given elastic constants over [100], [110], [111]", o => Given(o) is { Length: > 0 } v ? v.Max() : null),
        ];
    }

    /// <summary>Conductivity numbers of a point (empty when it asked for none); NaN becomes empty, an unbounded kappa +Infinity.</summary>
    private static IEnumerable<TableColumn<PointOutcome>> ConductivitySummaryColumns()
    {
        static ConductivityResult? K(PointOutcome o) => o.Result?.Conductivity;
        static string? Mesh(ImmutableArray<int> mesh) => mesh.IsDefaultOrEmpty ? null : string.Join('x', mesh);
        const string w = "W/(m K)";
        return
        [
            C<PointOutcome>("kappa_w_per_m_k", ColumnType.Double, w, "lattice thermal conductivity at the reference temperature, mean over the lattice's directions (trace/3 in 3D)", o => V(K(o)?.AtReference.KappaWPerMK)),
            C<PointOutcome>("kappa_xx_w_per_m_k", ColumnType.Double, w, "kappa_xx at the reference temperature", o => V(K(o)?.AtReference.KappaXxWPerMK)),
            C<PointOutcome>("kappa_yy_w_per_m_k", ColumnType.Double, w, "kappa_yy at the reference temperature (empty for a chain)", o => V(K(o)?.AtReference.KappaYyWPerMK)),
            C<PointOutcome>("kappa_zz_w_per_m_k", ColumnType.Double, w, "kappa_zz at the reference temperature (empty for a chain or sheet)", o => V(K(o)?.AtReference.KappaZzWPerMK)),
            C<PointOutcome>("kappa_mesh_change", ColumnType.Double, "1", "relative change of kappa from the half-density mesh (bulk; empty for exact finite-crystal sums)", o => V(K(o)?.MeshRelativeChange)),
            C<PointOutcome>("kappa_mesh_change_lower_bound", ColumnType.Bool, "", "true: kappa_mesh_change can under-read the mesh error at the reference temperature (its heat carriers sit near q = 0, where this mesh is too coarse for the long-wave window and both meshes miss them alike, or a sheet's zero valley away from q = 0 is left to the mesh points or crossed by the whole zone's rays); refine the mesh (empty where no change is reported)", o => K(o) is { } k && !double.IsNaN(k.MeshRelativeChange) ? k.AtReference.MeshChangeIsLowerBound : null),
            C<PointOutcome>("kappa_mesh", ColumnType.Text, "", "wave vectors per direction of the conductivity sum", o => K(o) is { } k ? Mesh(k.Mesh) : null),
            C<PointOutcome>("kappa_check_mesh", ColumnType.Text, "", "the half-density mesh of the convergence check", o => K(o) is { } k ? Mesh(k.ConvergenceMesh) : null),
            C<PointOutcome>("kappa_min_w_per_m_k", ColumnType.Double, w, "Cahill-Pohl-Watson minimum conductivity at the reference temperature (3D)", o => V(K(o)?.KappaMinWPerMK)),
            C<PointOutcome>("kappa_min_high_t_w_per_m_k", ColumnType.Double, w, "its high-temperature limit", o => V(K(o)?.KappaMinHighTemperatureWPerMK)),
            C<PointOutcome>("kappa_slack_at_debye_w_per_m_k", ColumnType.Double, w, "Slack's Umklapp-limited estimate at the acoustic Debye temperature (3D, with a Grueneisen parameter)", o => V(K(o)?.SlackKappaAtDebyeTemperatureWPerMK)),
            C<PointOutcome>("kappa_slack_w_per_m_k", ColumnType.Double, w, "Slack's estimate at the reference temperature", o => V(K(o)?.SlackKappaAtReferenceWPerMK)),
            C<PointOutcome>("kappa_share_boundary", ColumnType.Double, "1", "share of boundary scattering at the reference temperature", o => V(K(o)?.SharesAtReference.Boundary)),
            C<PointOutcome>("kappa_share_point_defect", ColumnType.Double, "1", "share of point-defect and isotope scattering", o => V(K(o)?.SharesAtReference.PointDefect)),
            C<PointOutcome>("kappa_share_umklapp", ColumnType.Double, "1", "share of Umklapp scattering", o => V(K(o)?.SharesAtReference.Umklapp)),
            C<PointOutcome>("kappa_share_constant", ColumnType.Double, "1", "share of the constant relaxation time", o => V(K(o)?.SharesAtReference.Constant)),
            C<PointOutcome>("kappa_boundary_length_nm", ColumnType.Double, "nm", "effective boundary length used", o => V(K(o)?.BoundaryLengthNm)),
            C<PointOutcome>("kappa_mass_variance", ColumnType.Double, "1", "mass-variance parameter Gamma used", o => V(K(o)?.MassVarianceGamma)),
            C<PointOutcome>("kappa_umklapp_debye_temperature_k", ColumnType.Double, "K", "theta of the Umklapp rate", o => V(K(o)?.UmklappDebyeTemperatureK)),
            C<PointOutcome>("kappa_umklapp_sound_speed_m_per_s", ColumnType.Double, "m/s", "v of the Umklapp rate", o => V(K(o)?.UmklappSoundSpeedMPerS)),
            C<PointOutcome>("acoustic_debye_temperature_k", ColumnType.Double, "K", "acoustic Debye temperature from the direction-averaged sound speeds", o => V(K(o)?.AcousticDebyeTemperatureK)),
            C<PointOutcome>("debye_sound_speed_m_per_s", ColumnType.Double, "m/s", "Debye average of the acoustic sound speeds over directions", o => V(K(o)?.DebyeAverageSoundSpeedMPerS)),
        ];
    }

    /// <summary>The schema's rule for optional numbers: NaN (undefined) is written as null, an empty cell.</summary>
    internal static double? NullIfNaN(double? x) => x is { } v && !double.IsNaN(v) ? v : null;

    /// <summary><see cref="NullIfNaN"/>, short for the column list above.</summary>
    private static double? V(double? x) => NullIfNaN(x);

    private static TableColumn<RowOf<ThermalValue>>[] ThermalColumns()
    {
        static double Cell(RowOf<ThermalValue> r, double v) => v * ThermalScale.PerCellFactor(r.Outcome.Result!.Summary.SitesPerCell);
        static double Kg(RowOf<ThermalValue> r, double v) => v * ThermalScale.PerKgFactor(r.Outcome.Result!.Summary.MolarMassKgPerMol);
        const string w = "W/(m K)";
        return
        [
            C<RowOf<ThermalValue>>("temperature_k", ColumnType.Double, "K", "temperature", r => r.Item.Thermal.TemperatureK),
            C<RowOf<ThermalValue>>("internal_energy_j_per_mol", ColumnType.Double, "J/mol", "internal energy per mole of atoms", r => r.Item.Thermal.InternalEnergyJPerMol),
            C<RowOf<ThermalValue>>("free_energy_j_per_mol", ColumnType.Double, "J/mol", "Helmholtz free energy per mole of atoms", r => r.Item.Thermal.FreeEnergyJPerMol),
            C<RowOf<ThermalValue>>("entropy_j_per_mol_k", ColumnType.Double, "J/(mol K)", "entropy per mole of atoms", r => r.Item.Thermal.EntropyJPerMolK),
            C<RowOf<ThermalValue>>("cv_j_per_mol_k", ColumnType.Double, "J/(mol K)", "heat capacity per mole of atoms", r => r.Item.Thermal.HeatCapacityJPerMolK),
            C<RowOf<ThermalValue>>("debye_temperature_k", ColumnType.Double, "K", "Debye temperature matching this Cv as a fraction of the classical limit (empty where undefined)", r => r.Item.Thermal.DebyeTemperatureK),
            C<RowOf<ThermalValue>>("internal_energy_j_per_cell", ColumnType.Double, "J/cell", "internal energy per primitive cell", r => Cell(r, r.Item.Thermal.InternalEnergyJPerMol)),
            C<RowOf<ThermalValue>>("free_energy_j_per_cell", ColumnType.Double, "J/cell", "free energy per primitive cell", r => Cell(r, r.Item.Thermal.FreeEnergyJPerMol)),
            C<RowOf<ThermalValue>>("entropy_j_per_cell_k", ColumnType.Double, "J/(cell K)", "entropy per primitive cell", r => Cell(r, r.Item.Thermal.EntropyJPerMolK)),
            C<RowOf<ThermalValue>>("cv_j_per_cell_k", ColumnType.Double, "J/(cell K)", "heat capacity per primitive cell", r => Cell(r, r.Item.Thermal.HeatCapacityJPerMolK)),
            C<RowOf<ThermalValue>>("internal_energy_j_per_kg", ColumnType.Double, "J/kg", "internal energy per kg", r => Kg(r, r.Item.Thermal.InternalEnergyJPerMol)),
            C<RowOf<ThermalValue>>("free_energy_j_per_kg", ColumnType.Double, "J/kg", "free energy per kg", r => Kg(r, r.Item.Thermal.FreeEnergyJPerMol)),
            C<RowOf<ThermalValue>>("entropy_j_per_kg_k", ColumnType.Double, "J/(kg K)", "entropy per kg", r => Kg(r, r.Item.Thermal.EntropyJPerMolK)),
            C<RowOf<ThermalValue>>("cv_j_per_kg_k", ColumnType.Double, "J/(kg K)", "heat capacity per kg", r => Kg(r, r.Item.Thermal.HeatCapacityJPerMolK)),
            C<RowOf<ThermalValue>>("kappa_xx_w_per_m_k", ColumnType.Double, w, "lattice thermal conductivity along x (empty when not computed)", r => V(r.Item.Conductivity?.KappaXxWPerMK)),
            C<RowOf<ThermalValue>>("kappa_yy_w_per_m_k", ColumnType.Double, w, "along y (empty for a chain)", r => V(r.Item.Conductivity?.KappaYyWPerMK)),
            C<RowOf<ThermalValue>>("kappa_zz_w_per_m_k", ColumnType.Double, w, "along z (empty for a chain or sheet)", r => V(r.Item.Conductivity?.KappaZzWPerMK)),
            C<RowOf<ThermalValue>>("kappa_w_per_m_k", ColumnType.Double, w, "mean over the lattice's directions (trace/3 in 3D); +Infinity when the channels leave modes unscattered", r => V(r.Item.Conductivity?.KappaWPerMK)),
            C<RowOf<ThermalValue>>("kappa_mesh_change", ColumnType.Double, "1", "relative change of kappa from the half-density mesh (bulk only)", r => V(r.Item.Conductivity?.MeshRelativeChange)),
            C<RowOf<ThermalValue>>("kappa_mesh_change_lower_bound", ColumnType.Bool, "", "true: kappa_mesh_change can under-read the mesh error at this temperature (see the points column)", r => r.Item.Conductivity is { } k && !double.IsNaN(k.MeshRelativeChange) ? k.MeshChangeIsLowerBound : null),
            C<RowOf<ThermalValue>>("internal_energy_mesh_change_j_per_mol", ColumnType.Double, "J/mol", "internal_energy_j_per_mol on this mesh minus on the half-density mesh (bulk; an indicator of the mesh error, not an error bar)", r => V(r.Item.MeshChange?.InternalEnergyJPerMol)),
            C<RowOf<ThermalValue>>("free_energy_mesh_change_j_per_mol", ColumnType.Double, "J/mol", "free_energy_j_per_mol on this mesh minus on the half-density mesh", r => V(r.Item.MeshChange?.FreeEnergyJPerMol)),
            C<RowOf<ThermalValue>>("entropy_mesh_change_j_per_mol_k", ColumnType.Double, "J/(mol K)", "entropy_j_per_mol_k on this mesh minus on the half-density mesh", r => V(r.Item.MeshChange?.EntropyJPerMolK)),
            C<RowOf<ThermalValue>>("cv_mesh_change_j_per_mol_k", ColumnType.Double, "J/(mol K)", "cv_j_per_mol_k on this mesh minus on the half-density mesh", r => V(r.Item.MeshChange?.HeatCapacityJPerMolK)),
            C<RowOf<ThermalValue>>("msd_mesh_change_nm2", ColumnType.Double, "nm^2", "the change of largest size (over sites and directions) of the mean-square displacement on the half-density mesh (3D bulk)", r => V(r.Item.MsdMeshChangeNm2)),
            C<RowOf<ThermalValue>>("periodic_cv_j_per_mol_k", ColumnType.Double, "J/(mol K)", "heat capacity of the periodic crystal of the same size (samples with boundaries, shapes or disorder)", r => r.Item.PeriodicCvJPerMolK),
            C<RowOf<ThermalValue>>("cv_ratio_to_periodic", ColumnType.Double, "1", "cv_j_per_mol_k over periodic_cv_j_per_mol_k", r => r.Item.PeriodicCvJPerMolK is { } p && p > 0 && double.IsFinite(r.Item.Thermal.HeatCapacityJPerMolK) ? r.Item.Thermal.HeatCapacityJPerMolK / p : null),
            C<RowOf<ThermalValue>>("internal_energy_stderr_j_per_mol", ColumnType.Double, "J/mol", "standard error of internal_energy_j_per_mol (random vectors or configurations; empty for exact sums)", r => V(r.Item.StandardErrors?.InternalEnergyJPerMol)),
            C<RowOf<ThermalValue>>("free_energy_stderr_j_per_mol", ColumnType.Double, "J/mol", "standard error of free_energy_j_per_mol", r => V(r.Item.StandardErrors?.FreeEnergyJPerMol)),
            C<RowOf<ThermalValue>>("entropy_stderr_j_per_mol_k", ColumnType.Double, "J/(mol K)", "standard error of entropy_j_per_mol_k", r => V(r.Item.StandardErrors?.EntropyJPerMolK)),
            C<RowOf<ThermalValue>>("cv_stderr_j_per_mol_k", ColumnType.Double, "J/(mol K)", "standard error of cv_j_per_mol_k", r => V(r.Item.StandardErrors?.HeatCapacityJPerMolK)),
            C<RowOf<ThermalValue>>("ordered_cv_j_per_mol_k", ColumnType.Double, "J/(mol K)", "Cv of the ordered virtual crystal (disordered samples)", r => V(r.Item.OrderedCvJPerMolK)),
            C<RowOf<ThermalValue>>("kappa_confined_w_per_m_k", ColumnType.Double, w, "films and wires: kappa from the confined modes, mean over the periodic directions", r => V(r.Item.Confined?.KappaWPerMK)),
        ];
    }
}
