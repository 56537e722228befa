using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Output;

/// <summary>Turns a chunk's point outcomes into the rows of every table the sweep writes.</summary>
internal static class ChunkTables
{
    public static IReadOnlyList<TableRows> Build(ResultSchemas schemas, OutputSelection outputs, IReadOnlyList<PointOutcome> outcomes) =>
        Build(schemas, outputs, outcomes, typedColumns: true);

    /// <summary>
    /// The same; <paramref name="typedColumns"/> false builds every table on the generic row path
    /// only (for the tests that hold <see cref="LongTableColumns"/> equal to it).
    /// </summary>
    internal static IReadOnlyList<TableRows> Build(ResultSchemas schemas, OutputSelection outputs, IReadOnlyList<PointOutcome> outcomes, bool typedColumns)
    {
        ArgumentNullException.ThrowIfNull(schemas);
        var rowed = Rowed(outcomes);
        return [schemas.Points.Rows(rowed), .. OtherTables(schemas, outputs, rowed, typedColumns)];
    }

    /// <summary>
    /// The outcomes that have rows, in point id order: points without a result row (I/O or input failures) are left
    /// out (resume runs them again), and every part is sorted by point as the merged files are (TableMerger merges sorted runs).
    /// </summary>
    public static IReadOnlyList<PointOutcome> Rowed(IReadOnlyList<PointOutcome> outcomes) =>
        outcomes.Where(o => o.State is PointState.Done or PointState.Unstable || (o.State == PointState.Failed && o.FailureKind is { } k && k.HasResult()))
            .OrderBy(o => o.Point.PointId, StringComparer.Ordinal).ToList();

    /// <summary>The rows of every table but points/ (<see cref="Build"/>'s second table on) from the outcomes <see cref="Rowed"/> keeps.</summary>
    public static IReadOnlyList<TableRows> OtherTables(ResultSchemas schemas, OutputSelection outputs, IReadOnlyList<PointOutcome> rowed) =>
        OtherTables(schemas, outputs, rowed, typedColumns: true);

    private static List<TableRows> OtherTables(ResultSchemas schemas, OutputSelection outputs, IReadOnlyList<PointOutcome> rowed, bool typedColumns)
    {
        // An unstable model has no thermal state: only its points/ row and the tables of signed
        // frequencies (modes/, dispersion/: negative = imaginary) are written; sound speeds, DOS,
        // thermal functions, displacements and kappa would mislead (see README, Results).
        var solved = rowed.Where(o => o.Result is not null && o.State == PointState.Done).ToList();
        var spectral = rowed.Where(o => o.Result is not null && o.State is PointState.Done or PointState.Unstable).ToList();
        var tables = new List<TableRows>
        {
            (typedColumns ? LongTableColumns.SoundSpeeds(schemas.SoundSpeeds, solved) : null) ?? schemas.SoundSpeeds.Rows(solved.SelectMany(o => o.Result!.Summary.SoundSpeeds.SelectMany(s =>
                s.SpeedsMPerS.Select((v, i) => new RowOf<SoundSpeedValue>(o, new SoundSpeedValue(s.Direction, i, v)))))),
        };

        if (outputs.Dos)
        {
            tables.Add((typedColumns ? LongTableColumns.Dos(schemas.Dos, solved) : null) ?? schemas.Dos.Rows(solved.SelectMany(DosRows)));
        }

        if (outputs.Thermal)
        {
            tables.Add((typedColumns ? LongTableColumns.Thermal(schemas.Thermal, solved) : null) ?? schemas.Thermal.Rows(solved.SelectMany(ThermalRows)));
        }

        if (outputs.Dispersion)
        {
            tables.Add(schemas.Dispersion.Rows(spectral.SelectMany(o => o.Result!.Dispersion.Select(d => new RowOf<Engine.Results.DispersionRow>(o, d)))));
        }

        if (outputs.Modes)
        {
            tables.Add((typedColumns ? LongTableColumns.Modes(schemas.Modes, spectral) : null) ?? schemas.Modes.Rows(spectral.SelectMany(o => o.Result!.Modes.Select(m => new RowOf<Engine.Results.ModeLevel>(o, m)))));
        }

        if (outputs.Displacements)
        {
            tables.Add((typedColumns ? LongTableColumns.Displacements(schemas.Displacements, solved) : null) ?? schemas.Displacements.Rows(solved.SelectMany(o => o.Result!.Displacements.Select(d => new RowOf<Engine.Results.DisplacementRow>(o, d)))));
        }

        if (outputs.Layers)
        {
            tables.Add(schemas.Layers.Rows(solved.SelectMany(o => (o.Result!.Surface?.Layers ?? []).Select(l => new RowOf<Engine.Results.LayerRow>(o, l)))));
        }

        if (outputs.LayerDos)
        {
            tables.Add(schemas.LayerDos.Rows(solved.SelectMany(LayerDosRows)));
        }

        if (outputs.Expansion)
        {
            tables.Add(schemas.Expansion.Rows(solved.SelectMany(o => (o.Result!.Expansion?.Rows ?? []).Select(r => new RowOf<Engine.QuasiHarmonic.ExpansionRow>(o, r)))));
        }

        if (outputs.CumulativeKappa)
        {
            tables.Add(schemas.CumulativeKappa.Rows(solved.SelectMany(o => (o.Result!.Conductivity?.CumulativeByMeanFreePath ?? []).Select(m => new RowOf<MeanFreePathRow>(o, m)))));
        }

        return tables;
    }

    /// <summary>Each thermal row with the conductivity at the same temperature (the Engine lists both in the order of the temperatures asked for).</summary>
    private static IEnumerable<RowOf<ThermalValue>> ThermalRows(PointOutcome o)
    {
        for (var i = 0; i < o.Result!.Thermal.Length; i++)
        {
            yield return new RowOf<ThermalValue>(o, ThermalAt(o.Result, i));
        }
    }

    /// <summary>
    /// Thermal row <paramref name="i"/> of a result with what goes beside it: the conductivity when it
    /// is at the same temperature, the periodic and ordered crystals' Cv, the standard errors and the
    /// confined conductivity, each when the result has one at that index. Shared by the row path and
    /// <see cref="LongTableColumns.Thermal"/>, so both put the same values in the same rows.
    /// </summary>
    internal static ThermalValue ThermalAt(Engine.Results.PointResult result, int i)
    {
        var thermal = result.Thermal;
        var kappa = result.Conductivity?.ByTemperature ?? [];
        var periodic = result.Surface?.PeriodicCvJPerMolK ?? [];
        var ordered = result.Ordered?.Thermal ?? [];
        var confined = result.ConfinedConductivity?.ByTemperature ?? [];
        var k = i < kappa.Length && kappa[i].TemperatureK == thermal[i].TemperatureK ? kappa[i] : null;
        var errors = result.Errors?.Thermal is { } e && i < e.Length ? e[i] : null;
        var meshChange = result.MeshChange is { } m && i < m.Thermal.Length ? m : null;
        return new ThermalValue(thermal[i], k) { PeriodicCvJPerMolK = i < periodic.Length ? periodic[i] : null, StandardErrors = errors, OrderedCvJPerMolK = i < ordered.Length ? ordered[i].HeatCapacityJPerMolK : null, Confined = i < confined.Length ? confined[i] : null, MeshChange = meshChange?.Thermal[i], MsdMeshChangeNm2 = meshChange?.MsdNm2[i] };
    }

    private static IEnumerable<RowOf<LayerDosValue>> LayerDosRows(PointOutcome o)
    {
        var frequencies = o.Result!.Dos.FrequencyThz;
        foreach (var layer in o.Result.Surface?.LayerDos ?? [])
        {
            for (var i = 0; i < frequencies.Length && i < layer.DensityPerThzPerAtom.Length; i++)
            {
                var error = i < layer.StandardErrorPerThzPerAtom.Length && double.IsFinite(layer.StandardErrorPerThzPerAtom[i]) ? layer.StandardErrorPerThzPerAtom[i] : (double?)null;
                yield return new RowOf<LayerDosValue>(o, new LayerDosValue(layer.Layer, layer.Sites, frequencies[i], layer.DensityPerThzPerAtom[i], error));
            }
        }
    }

    private static IEnumerable<RowOf<DosValue>> DosRows(PointOutcome o)
    {
        var dos = o.Result!.Dos;
        var errors = o.Result.Errors?.DosTotal ?? [];
        for (var i = 0; i < dos.FrequencyThz.Length; i++)
        {
            yield return new RowOf<DosValue>(o, new DosValue(null, dos.FrequencyThz[i], dos.Total[i], i < errors.Length && double.IsFinite(errors[i]) ? errors[i] : null));
        }

        for (var site = 0; site < dos.PartialBySite.Length; site++)
        {
            var curve = dos.PartialBySite[site];
            for (var i = 0; i < dos.FrequencyThz.Length && i < curve.Length; i++)
            {
                yield return new RowOf<DosValue>(o, new DosValue(site, dos.FrequencyThz[i], curve[i]));
            }
        }
    }
}
