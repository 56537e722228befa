using System.Collections.Immutable;
using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>
/// The quasi-harmonic approximation, above the harmonic solver: one harmonic solve per volume
/// (isotropic scalings of the lattice around the static minimum; springs from the potentials at each
/// geometry), F = E_static + F_vib minimised over the volume at each temperature, then the
/// conductivity with the computed Grueneisen parameter when none was given, and mode Grueneisen
/// parameters along the dispersion path when asked. The point's own spectrum, DOS and thermal table
/// are those of the lattice as given (relaxed or not); when that lattice is the static minimum
/// (relaxed) its solve serves as that volume too, otherwise it is one extra solve. Every volume keeps
/// the pairs that are within the cutoff at the static minimum (the cutoffs scale with the lattice),
/// so F(V) is smooth: with a fixed cutoff, shells crossing it would make the springs, and F_vib,
/// jump between volumes.
/// </summary>
internal static class QuasiHarmonicLoop
{
    private const double SameScale = 1e-9;

    public static PointResult Solve(CrystalModel model, Sample sample, SolveOptions options, CancellationToken ct)
    {
        var expansion = options.Expansion!;
        Validate(model, expansion);
        if (options.Conductivity is { } asked)
        {
            // Fail on bad conductivity options before the volumes are solved; gamma may still come from below.
            ConductivityOptionsValidation.Check(model, sample, asked with { GrueneisenParameter = asked.GrueneisenParameter ?? 1.0 });
        }

        var statics = StaticLattice.Analyse(model)!;
        var s0 = statics.EquilibriumScale;
        var curve = new StaticEnergyCurve(model, StaticLattice.SmallestScale, frozenAtScale: s0);
        var temperatures = Temperatures(options);
        // A bulk mesh's volumes also sum their modes plainly: F_vib's volume dependence comes from those sums (FreeEnergySurface).
        var harmonic = options with { Expansion = null, Conductivity = null, MeshModeSums = sample is BulkSample };
        var main = PhononSolver.SolveHarmonic(model, sample, harmonic, ct);
        if (!main.Summary.Stable)
        {
            return UnstableAsGiven(main, model, sample, options, statics, temperatures, ct);
        }

        var lean = harmonic with { Dispersion = null, PartialDos = false, MeanSquareDisplacement = false, ModeListMaxModes = 0, MeshCheck = false };

        // Model at the static minimum with its cutoffs there; each volume scales both from it.
        var atMinimum = model.Scaled(s0);
        VolumeSample Solve(double scale) => Math.Abs(scale - 1) <= SameScale
            ? Sample(curve, 1, main, temperatures)
            : SolveVolume(atMinimum.Scaled(scale / s0, scaleCutoffs: true), sample, lean, scale, curve, temperatures, ct);

        var samples = new List<VolumeSample>();
        foreach (var scale in Grid(s0, expansion))
        {
            ct.ThrowIfCancellationRequested();
            samples.Add(Solve(scale));
        }

        // While some temperature's minimum lies beyond the sampled volumes (and they are stable there),
        // add volumes one step further, up to MaxStrain: a genuine runaway then ends in an unstable volume
        // or at that limit, and is reported as a breakdown, never extrapolated.
        var step = expansion.LargestLinearStrain / (expansion.VolumeCount - 2);
        var limit = MaxStrain(expansion);
        ExpansionResult result;
        while (true)
        {
            var (outcome, sides) = Expansion(model, sample, options, statics, curve, samples, temperatures);
            result = outcome;
            var top = samples[^1].Scale / s0 - 1;
            var bottom = samples[0].Scale / s0 - 1;
            if (sides.Contains(FreeEnergySurface.Side.Above) && samples[^1].Usable && top + step <= limit + 1e-12)
            {
                ct.ThrowIfCancellationRequested();
                samples.Add(Solve(s0 * (1 + top + step)));
            }
            else if (sides.Contains(FreeEnergySurface.Side.Below) && samples[0].Usable && bottom - step >= -limit - 1e-12)
            {
                ct.ThrowIfCancellationRequested();
                samples.Insert(0, Solve(s0 * (1 + bottom - step)));
            }
            else
            {
                break;
            }
        }

        // The mesh sums served the volumes; the point's result does not carry them.
        var withConductivity = AttachConductivity(main with { Expansion = result, MeshModeSums = null }, model, sample, options, ct);
        return expansion.ModeGrueneisen && options.Dispersion is not null && main.Summary.Stable
            ? withConductivity with { Dispersion = ModeGrueneisen.Attach(model, withConductivity.Dispersion) }
            : withConductivity;
    }

    /// <summary>Harmonic solves a point costs at first: the volumes, plus the given lattice when it is not the static minimum (volumes added for a runaway come on top).</summary>
    public static int SolveCount(ExpansionOptions expansion) => expansion.VolumeCount + 1;

    /// <summary>How far volumes are added when a minimum lies beyond the sampled ones: three times the largest strain asked for, at most 30 %.</summary>
    public static double MaxStrain(ExpansionOptions expansion) => Math.Min(0.3, 3 * expansion.LargestLinearStrain);

    /// <summary>What <see cref="Solve"/> refuses before any volume is solved: a model without potentials, counts or strains out of range.</summary>
    internal static void Validate(CrystalModel model, ExpansionOptions expansion)
    {
        var problems = new List<ModelProblem>();
        if (model.Potentials.IsEmpty)
        {
            problems.Add(new(ModelProblemKind.NotSupported, "output.expansion",
                "thermal expansion needs springs that change with volume: add [[model.potentials]] (hand-set springs and bends keep their constants when the lattice expands)"));
        }

        if (expansion.VolumeCount is < ExpansionOptions.MinVolumes or > ExpansionOptions.MaxVolumes)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "output.expansion.volumes", $"must be in [{ExpansionOptions.MinVolumes}, {ExpansionOptions.MaxVolumes}], got {expansion.VolumeCount}"));
        }

        if (!(expansion.LargestLinearStrain is >= 0.002 and <= 0.3))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "output.expansion.largest_strain", $"must be in [0.002, 0.3], got {Guard.Show(expansion.LargestLinearStrain)}"));
        }

        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }
    }

    /// <summary>Scale factors s0 (1 + e_k) with e_k = (k - 1) h, k = 0 .. n - 1, h = largest / (n - 2).</summary>
    internal static double[] Grid(double staticScale, ExpansionOptions expansion)
    {
        var n = expansion.VolumeCount;
        var h = expansion.LargestLinearStrain / (n - 2);
        return [.. Enumerable.Range(0, n).Select(k => staticScale * (1 + (k - 1) * h))];
    }

    private static double[] Temperatures(SolveOptions options) =>
        options.TemperaturesK.Contains(options.ReferenceTemperatureK) ? [.. options.TemperaturesK] : [.. options.TemperaturesK, options.ReferenceTemperatureK];

    private static VolumeSample SolveVolume(CrystalModel scaled, Sample sample, SolveOptions lean, double scale, StaticEnergyCurve curve, double[] temperatures, CancellationToken ct)
    {
        try
        {
            return Sample(curve, scale, PhononSolver.SolveHarmonic(scaled, sample, lean, ct), temperatures);
        }
        catch (ModelException)
        {
            // A volume whose springs leave a direction without stiffness (floppy) is as unusable as an unstable one.
            return new VolumeSample(scale, curve.MeasureAt(scale), [], [], [], Usable: false);
        }
    }

    /// <summary>F_vib, S and Cv per cell at every temperature (the reference one from the summary when it is not in the table).</summary>
    private static VolumeSample Sample(StaticEnergyCurve curve, double scale, PointResult result, double[] temperatures)
    {
        var perCell = curve.AtomsPerCell / PhysicalConstants.AvogadroPerMol;
        var n = temperatures.Length;
        var (f, s, c) = (new double[n], new double[n], new double[n]);
        for (var t = 0; t < n; t++)
        {
            var row = result.Thermal.FirstOrDefault(r => r.TemperatureK == temperatures[t]);
            var summary = result.Summary;
            // An unstable volume has no thermal rows and empty summary numbers: NaN marks it unusable below.
            (f[t], s[t], c[t]) = row is not null
                ? (row.FreeEnergyJPerMol, row.EntropyJPerMolK, row.HeatCapacityJPerMolK)
                : (summary.FreeEnergyJPerMol ?? double.NaN, summary.EntropyJPerMolK ?? double.NaN, summary.HeatCapacityJPerMolK ?? double.NaN);
            (f[t], s[t], c[t]) = (f[t] * perCell, s[t] * perCell, c[t] * perCell);
        }

        var usable = result.Summary.Stable && f.All(double.IsFinite) && s.All(double.IsFinite) && c.All(double.IsFinite);
        return new VolumeSample(scale, curve.MeasureAt(scale), f, s, c, usable) { MeshSums = result.MeshModeSums };
    }

    private static (ExpansionResult Result, FreeEnergySurface.Side[] Sides) Expansion(CrystalModel model, Sample sample, SolveOptions options, StaticLatticeResult statics, StaticEnergyCurve curve, List<VolumeSample> samples, double[] temperatures)
    {
        // The contiguous run of usable volumes around the static minimum; the fit never crosses an unstable one.
        var centre = samples.FindIndex(v => v.Scale >= statics.EquilibriumScale * (1 - SameScale));
        var (first, last) = (centre, centre);
        while (first > 0 && samples[first - 1].Usable)
        {
            first--;
        }

        while (last + 1 < samples.Count && samples[last + 1].Usable)
        {
            last++;
        }

        var run = samples[centre].Usable ? samples.GetRange(first, last - first + 1) : [];
        ExpansionRow[] rows;
        FreeEnergySurface.Side[] sides;
        if (run.Count < 4)
        {
            var reason = samples[centre].Usable
                ? "too few stable volumes around the static minimum for a quasi-harmonic fit (the lattice turns unstable within a small strain)"
                : "the harmonic spectrum is unstable at the static minimum: no quasi-harmonic state exists";
            rows = [.. temperatures.Select(t => new ExpansionRow { TemperatureK = t, Breakdown = reason })];
            sides = [];
        }
        else
        {
            var surface = new FreeEnergySurface(curve, run, statics.EquilibriumScale, model.Lattice.ConstantNm, first > 0, last + 1 < samples.Count, exactModeSums: sample is FiniteSample);
            var minima = temperatures.Select((t, i) => surface.Minimise(i, t)).ToArray();
            rows = [.. minima.Select(m => m.Row)];
            sides = [.. minima.Select(m => m.Side)];
        }

        var reference = rows[Array.IndexOf(temperatures, options.ReferenceTemperatureK)];
        return (new ExpansionResult
        {
            Rows = [.. rows.Take(options.TemperaturesK.Length)],
            AtReference = reference,
            StaticLatticeConstantNm = statics.EquilibriumLatticeConstantNm,
            ScalesSolved = [.. samples.Select(v => v.Scale)],
            VolumesUsed = run.Count,
        }, sides);
    }

    /// <summary>
    /// The lattice as given is unstable, so its point has no thermal numbers (the lead's rule for unstable
    /// points): no volumes are solved and every row says why, with the way to a quasi-harmonic state. The
    /// state around the static minimum does not depend on the lattice as given, but printing Cp and alpha
    /// beside "unstable" would read as the given lattice's. A conductivity with a given Grueneisen
    /// parameter runs as in a harmonic solve (its numbers come out empty for an unstable model); without
    /// one there is none to use, and the conductivity is left out rather than failing the point.
    /// </summary>
    private static PointResult UnstableAsGiven(PointResult main, CrystalModel model, Sample sample, SolveOptions options, StaticLatticeResult statics, double[] temperatures, CancellationToken ct)
    {
        var reason = string.Create(CultureInfo.InvariantCulture,
            $"not computed: the lattice as given is unstable; relax = true, or a lattice constant near the static minimum ({statics.EquilibriumLatticeConstantNm:G6} nm), gives the quasi-harmonic state");
        ExpansionRow[] rows = [.. temperatures.Select(t => new ExpansionRow { TemperatureK = t, Breakdown = reason })];
        var result = main with
        {
            Expansion = new ExpansionResult
            {
                Rows = [.. rows.Take(options.TemperaturesK.Length)],
                AtReference = rows[Array.IndexOf(temperatures, options.ReferenceTemperatureK)],
                StaticLatticeConstantNm = statics.EquilibriumLatticeConstantNm,
                ScalesSolved = [1.0],
                VolumesUsed = 0,
            },
        };
        return options.Conductivity is { GrueneisenParameter: not null }
            ? ConductivityStep.Attach(result, ConductivityStep.ComputeIfAsked(model, CompiledCrystal.From(model), sample, options, ct))
            : result;
    }

    /// <summary>
    /// The conductivity at the lattice as given, with the Grueneisen parameter given in the options or,
    /// when none was, the thermal one at the reference temperature (and says which).
    /// </summary>
    private static PointResult AttachConductivity(PointResult result, CrystalModel model, Sample sample, SolveOptions options, CancellationToken ct)
    {
        if (options.Conductivity is not { } asked)
        {
            return result;
        }

        var computed = result.Expansion!.AtReference.Grueneisen;
        var source = asked.GrueneisenParameter is null && computed is not null ? "quasi_harmonic" : "given";
        var gamma = asked.GrueneisenParameter ?? computed;
        if (gamma is null && asked.Umklapp is not null)
        {
            var why = result.Expansion.AtReference.Breakdown ?? "it is undefined at the reference temperature (no mode is excited at 0 K)";
            throw Guard.Single(ModelProblemKind.OutOfRange, "output.conductivity.grueneisen_parameter",
                $"the Umklapp channel needs a Grueneisen parameter and the quasi-harmonic one is not available: {why}. Give grueneisen_parameter");
        }

        var withGamma = options with { Conductivity = asked with { GrueneisenParameter = gamma } };
        var conductivity = ConductivityStep.ComputeIfAsked(model, CompiledCrystal.From(model), sample, withGamma, ct, source);
        return ConductivityStep.Attach(result, conductivity);
    }
}
