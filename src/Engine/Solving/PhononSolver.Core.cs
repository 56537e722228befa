using System.Collections.Immutable;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Thermal;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Solving;

public static partial class PhononSolver
{
    private static PointResult SolveCore(CrystalModel model, Sample sample, SolveOptions options, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        OptionsValidation.Check(options);
        if (sample is RealSpaceSample realSpace)
        {
            return SolveRealSpace(model, realSpace, options, ct);
        }

        CheckSample(model, sample);

        var crystal = CompiledCrystal.From(model);
        var staticLattice = ModelPropertiesStep.StaticLatticeOf(model);
        var solver = new ModeSolver(new DynamicalMatrix(crystal));
        CheckNoFloppyBranch(solver);
        if (ValleyProblem(solver, sample, options) is { } valley)
        {
            throw new ModelException([valley]); // before the conductivity's pass, which the refusal would waste
        }

        var conductivity = Transport.ConductivityStep.ComputeIfAsked(model, crystal, sample, options, ct);

        var temperatures = TemperatureList(options);
        var channelMasses = Enumerable.Range(0, crystal.Size).Select(c => crystal.MassesKg[c / crystal.Components]).ToArray();
        var sink = new ModeSink(temperatures, crystal.Size, channelMasses, options.MeanSquareDisplacement);
        var outcome = sample switch
        {
            FiniteSample finite => FiniteCrystalSolver.Solve(solver, finite, options, temperatures, sink, ct),
            BulkSample bulk => BulkSolver.Solve(solver, bulk, options, sink, ct),
            _ => throw new ArgumentException($"unknown sample type {sample.GetType().Name}", nameof(sample)),
        };

        var speeds = SoundSpeedFinder.Find(solver);
        var dispersion = options.Dispersion is null ? [] : DispersionCalculator.Compute(solver, options.Dispersion, ct);
        var zeroPointDivergent = sample is BulkSample && model.Lattice.Dimension == 2 && options.MeanSquareDisplacement
            ? QuadraticLongWaves.Channels(solver, speeds)
            : null;
        var assembled = Assemble(model, crystal, options, temperatures, outcome, speeds, dispersion, zeroPointDivergent);
        if (sample is BulkSample bulkSample)
        {
            assembled = assembled with { MeshChange = CheckMesh(model, crystal, solver, bulkSample, options, temperatures, assembled, speeds, zeroPointDivergent, ct) };
        }

        var result = Transport.ConductivityStep.Attach(assembled, conductivity);
        return ModelPropertiesStep.Attach(result, model, crystal, staticLattice);
    }

    private static WorkEstimate EstimateCore(CrystalModel model, Sample sample, SolveOptions options)
    {
        var n = model.BranchCount;
        var vectors = options.PartialDos || options.MeanSquareDisplacement;
        long solves;
        long bytes;
        switch (sample)
        {
            case FiniteSample f:
                // Two passes over the half set of wave vectors (range first, then sums).
                solves = (f.CellCount + 1) / 2 * 2;
                bytes = Math.Min(f.CellCount * n, FiniteCrystalSolver.StoredModeLimit) * 8L;
                break;
            case BulkSample b:
                solves = ((b.PointCount + 1) / 2) + LongWaveSolves(model, b, options);
                if (options.MeshCheck && MeshCheckSample(b, model.Lattice.Dimension) is { } half)
                {
                    solves += ((half.PointCount + 1) / 2) + LongWaveSolves(model, half, options);
                }

                bytes = BulkSolver.EstimateBytes(b.PointCount, n, vectors);
                break;
            case RealSpaceSample r:
                return EstimateRealSpace(model, r, options);
            default:
                throw new ArgumentException($"unknown sample type {sample.GetType().Name}", nameof(sample));
        }

        // Householder + QL: about 4/3 n^3 for values, about 9 n^3 with vectors (complex arithmetic counts 4x).
        var perSolve = 4.0 * (vectors ? 9.0 : 4.0 / 3.0) * n * (double)n * n + 8.0 * n * n;
        var modeWork = (double)solves * n * options.TemperaturesK.Length * 30.0;
        return new WorkEstimate(solves, n, solves * perSolve + modeWork, bytes);
    }

    private static void CheckSample(CrystalModel model, Sample sample)
    {
        switch (sample)
        {
            case FiniteSample f:
                f.CheckAgainst(model.Lattice);
                break;
            case RealSpaceSample r:
                r.Validate(model);
                break;
            case BulkSample b:
                var d = model.Lattice.Dimension;
                if ((d < 3 && b.M3 != 1) || (d < 2 && b.M2 != 1))
                {
                    throw Guard.Single(ModelProblemKind.DimensionMismatch, "sample.mesh",
                        $"a {d}D lattice takes {d} mesh count(s); the others must be 1, got [{b.M1}, {b.M2}, {b.M3}]");
                }

                break;
        }
    }

    /// <summary>
    /// A branch of zero frequency at a general wave vector means some motion meets no spring at all
    /// (a floppy model): its thermal sums would diverge, so it is refused with the site it moves.
    /// </summary>
    private static void CheckNoFloppyBranch(ModeSolver solver)
    {
        if (FloppyBranchProblem(solver) is { } problem)
        {
            throw new ModelException([problem]);
        }
    }

    private static ModelProblem? FloppyBranchProblem(ModeSolver solver)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        var reduced = new Vec3(0.1234567, lattice.Dimension >= 2 ? 0.2718281 : 0, lattice.Dimension >= 3 ? 0.3141592 : 0);
        solver.SolveWithVectors(lattice.ToCartesianQ(reduced));
        var values = solver.Values;
        var top = Math.Abs(values[^1]);
        if (top == 0 || values[0] > 1e-10 * top)
        {
            return null;
        }

        if (values[0] < -1e-8 * top)
        {
            return null; // unstable, not floppy: reported in the summary
        }

        var crystal = solver.Matrix.Crystal;
        var fractions = new double[solver.Size];
        solver.ChannelFractions(0, fractions);
        var channel = Array.IndexOf(fractions, fractions.Max());
        var site = crystal.Model.Sites[channel / crystal.Components];
        var axis = crystal.Components == 1 ? "" : " along " + "xyz"[channel % crystal.Components];
        return new ModelProblem(ModelProblemKind.UnconnectedSite, "springs",
            $"a branch has zero frequency at a general wave vector: site '{site.Label}' can move{axis} without stretching any spring. Add springs (a transverse constant or another shell) or use the scalar model");
    }

    private static double[] TemperatureList(SolveOptions options)
    {
        var list = options.TemperaturesK.ToList();
        if (!list.Contains(options.ReferenceTemperatureK))
        {
            list.Add(options.ReferenceTemperatureK);
        }

        return [.. list];
    }

    private static PointResult Assemble(
        CrystalModel model, CompiledCrystal crystal, SolveOptions options, double[] temperatures,
        SpectrumOutcome outcome, List<SoundSpeed> speeds, ImmutableArray<DispersionRow> dispersion,
        bool[]? zeroPointDivergent = null)
    {
        var stats = outcome.Statistics;
        var maxLambda = stats.MaxLambda;
        var unstable = stats.WorstLambda < -1e-8 * maxLambda;
        var sink = outcome.Sink;
        var r = model.Sites.Length;
        var perMolAtoms = PhysicalConstants.AvogadroPerMol / r;
        var dimension = model.Lattice.Dimension;

        // kB per mode the sums hold: a bulk mesh's DOS holds every branch; a finite crystal's sums leave
        // out its zero modes (rigid-body and floppy), and 3R would make its Debye temperature climb
        // without end at high T (a 4-cell chain: 10^4 K at 3000 K).
        var classicalCv = outcome.SampleKind == "bulk"
            ? crystal.Components * PhysicalConstants.GasConstantJPerMolK
            : sink.StatesCounted * PhysicalConstants.GasConstantJPerMolK / r;

        // An unstable model has no thermal state: no thermal or displacement rows, and every number
        // derived from the spectrum's thermal sums is null (never NaN, never a value from |omega|).
        var rows = ImmutableArray.CreateBuilder<ThermalRow>(options.TemperaturesK.Length);
        ThermalRow? reference = null;
        for (var t = 0; t < temperatures.Length && !unstable; t++)
        {
            var s = sink.Sums(t);
            var cv = s.HeatCapacity * perMolAtoms;
            var row = new ThermalRow(
                temperatures[t],
                s.Internal * perMolAtoms,
                s.Free * perMolAtoms,
                s.Entropy * perMolAtoms,
                cv,
                Defined(DebyeModel.TemperatureFromHeatCapacity(temperatures[t], cv / classicalCv, dimension)));
            if (t < options.TemperaturesK.Length)
            {
                rows.Add(row);
            }

            if (temperatures[t] == options.ReferenceTemperatureK)
            {
                reference = row;
            }
        }

        var displacements = ImmutableArray.CreateBuilder<DisplacementRow>();
        if (options.MeanSquareDisplacement && !unstable)
        {
            var components = crystal.Components;
            var bulk = outcome.SampleKind == "bulk";
            var symmetry = bulk ? Symmetry.ModelSymmetry.Find(crystal) : null;
            var values = new double[r * components];
            for (var t = 0; t < options.TemperaturesK.Length; t++)
            {
                // An infinite 1D crystal (any T) or 2D one (T > 0) has no finite mean-square displacement:
                // the long waves' 1/omega^2 weight diverges at q = 0 (Mermin-Wagner); any finite number
                // would be set by the mesh. Finite crystals give their own finite value.
                var divergent = bulk && (dimension == 1 || (dimension == 2 && temperatures[t] > 0));
                for (var c = 0; c < values.Length; c++)
                {
                    values[c] = divergent ? double.PositiveInfinity : sink.Msd(t, c) * 1e18;
                }

                if (symmetry is not null && !divergent)
                {
                    symmetry.SymmetriseDiagonal(values, components);
                }

                // A 2D bulk crystal at 0 K: the channels of a branch with omega ~ q^2 (a sheet's flexural
                // branch) diverge too, logarithmically (QuadraticLongWaves); the others stay finite.
                if (zeroPointDivergent is not null && !divergent)
                {
                    for (var c = 0; c < values.Length; c++)
                    {
                        values[c] = zeroPointDivergent[c] ? double.PositiveInfinity : values[c];
                    }
                }

                for (var site = 0; site < r; site++)
                {
                    double? Get(int axis) => axis >= components ? null : values[site * components + axis];
                    displacements.Add(new DisplacementRow(temperatures[t], site, model.Sites[site].Label, Get(0), Get(1), Get(2)));
                }
            }
        }

        var states = sink.StatesCounted;
        var stable = !unstable && states > 0;
        var zeroPoint = sink.Sums(0).ZeroPoint * perMolAtoms;

        // <omega^-2> of the d-dimensional Debye model diverges for d < 3: the n = -2 value exists in 3D only.
        var thetaMinus2 = stable && dimension >= 3
            ? Defined(DebyeModel.TemperatureFromMoment(sink.SumInverseOmegaSquared / states, -2, dimension))
            : null;
        var thetaLog = stable ? Defined(DebyeModel.TemperatureFromLogMoment(sink.SumLnOmega / states, dimension)) : null;
        var meanOmegaSquared = outcome.MeanOmegaSquared ?? (sink.SumOmegaSquared / states);
        var theta2 = stable ? Defined(DebyeModel.TemperatureFromMoment(meanOmegaSquared, 2, dimension)) : null;

        var summary = new PointSummary
        {
            Dimension = dimension,
            SitesPerCell = r,
            BranchCount = crystal.Size,
            SampleKind = outcome.SampleKind,
            CellsOrMeshPoints = outcome.CellsOrMeshPoints,
            QPointsSolved = outcome.QPointsSolved,
            ModeCount = outcome.ModeCount,
            RigidModesExcluded = outcome.RigidModesExcluded,
            ZeroModesExcluded = outcome.ZeroModesExcluded,
            // The top of the spectrum often lies at a zone-boundary point an odd mesh does not hold; the
            // bulk pass solved those points for the gaps, and the highest frequency counts them too.
            MaxFrequencyThz = ModeSolver.SignedThz(Math.Max(maxLambda, outcome.BoundaryMaxLambda ?? double.NegativeInfinity)),
            MinFrequencyThz = ModeSolver.SignedThz(Math.Min(stats.WorstLambda, stats.BranchMin.Min())),
            Stable = !unstable,
            WorstQReduced = unstable ? stats.WorstQReduced : null,
            Gaps = unstable ? [] : outcome.Gaps,
            SoundSpeeds = unstable ? [] : [.. speeds],
            ReferenceTemperatureK = options.ReferenceTemperatureK,
            HeatCapacityJPerMolK = reference?.HeatCapacityJPerMolK,
            EntropyJPerMolK = reference?.EntropyJPerMolK,
            FreeEnergyJPerMol = reference?.FreeEnergyJPerMol,
            InternalEnergyJPerMol = reference?.InternalEnergyJPerMol,
            ZeroPointEnergyJPerMol = unstable ? null : Defined(zeroPoint),
            ClassicalHeatCapacityJPerMolK = classicalCv,
            DebyeTemperatureFromCvK = reference?.DebyeTemperatureK,
            DebyeTemperatureMomentMinus2K = thetaMinus2,
            DebyeTemperatureMomentLogK = thetaLog,
            DebyeTemperatureMoment2K = theta2,
            MolarMassKgPerMol = model.CellMassAmu / r * 1e-3,
        };

        return new PointResult(summary, outcome.Dos, rows.ToImmutable(), displacements.ToImmutable(), dispersion, outcome.Modes)
        {
            ElasticFit = model.ElasticFit,
            MeshModeSums = outcome.MeshModeSums,
        };
    }

    /// <summary>The helpers mark an undefined number NaN; results say it with null.</summary>
    private static double? Defined(double value) => double.IsNaN(value) ? null : value;
}
