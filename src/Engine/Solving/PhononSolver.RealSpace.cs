using System.Collections.Immutable;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Samples built in real space (<see cref="RealSpaceSample"/>): the block is assembled from the
/// compiled couplings, solved densely (exact modes) or by the kernel polynomial method, assembled
/// into the same summary, thermal table and densities as a periodic crystal, and given its surface
/// numbers and the heat capacity of the periodic crystal of the same size.
/// </summary>
public static partial class PhononSolver
{
    private static PointResult SolveRealSpace(CrystalModel model, RealSpaceSample sample, SolveOptions options, CancellationToken ct)
    {
        sample.Validate(model);
        options = WithWallDistance(model, sample, options);
        var crystal = CompiledCrystal.From(model);
        var solver = new ModeSolver(new DynamicalMatrix(crystal));
        CheckNoFloppyBranch(solver);
        var temperatures = TemperatureList(options);

        var lattice = RealSpaceLattice.Build(crystal, sample, bloch: sample.Disorder is null);
        var periodic = PeriodicCounterpart(model.Lattice, sample, lattice.AtomCount, crystal.Sites);
        var conductivity = Transport.ConductivityStep.ComputeIfAsked(model, crystal, periodic, options, ct);
        var speeds = SoundSpeedFinder.Find(solver);
        var dispersion = options.Dispersion is null ? [] : DispersionCalculator.Compute(solver, options.Dispersion, ct);
        var periodicCv = PeriodicHeatCapacity(model, periodic, options, ct);

        PointResult result;
        if (sample.Disorder is not { } disorder)
        {
            var run = SolveBlock(lattice, SiteProperties.Ordered(lattice), sample, temperatures, options, record: false, configuration: 0, ct);
            result = AssembleRealSpace(model, crystal, sample, options, temperatures, run, speeds, dispersion, periodic, periodicCv);
            var confined = Transport.ConfinedConductivityCalculator.ComputeIfAsked(model, crystal, lattice, SiteProperties.Ordered(lattice), periodic, options, ct);
            result = result with { ConfinedConductivity = result.Summary.Stable ? confined : null };
        }
        else
        {
            result = SolveDisordered(model, crystal, sample, disorder, lattice, options, temperatures, speeds, dispersion, periodic, periodicCv, ct);
        }

        return Transport.ConductivityStep.Attach(result, conductivity);
    }

    /// <summary>
    /// Every configuration solved on the same block (periodic directions wrapped) and assembled on one
    /// frequency grid, averaged with standard errors; beside it the ordered virtual crystal, solved with
    /// exact wave vectors where the sample is periodic.
    /// </summary>
    private static PointResult SolveDisordered(
        CrystalModel model, CompiledCrystal crystal, RealSpaceSample sample, Disorder disorder, RealSpaceLattice lattice, SolveOptions options,
        double[] temperatures, List<SoundSpeed> speeds, ImmutableArray<DispersionRow> dispersion, FiniteSample periodic, double?[] periodicCv, CancellationToken ct)
    {
        var runs = new List<RealSpaceRun>(disorder.Configurations);
        for (var k = 0; k < disorder.Configurations; k++)
        {
            ct.ThrowIfCancellationRequested();
            runs.Add(SolveBlock(lattice, SiteProperties.Random(lattice, disorder, k), sample, temperatures, options, record: true, configuration: k, ct));
        }

        var top = runs.Max(r => r.Kpm is { } kpm ? kpm.Centre + kpm.Scale : r.Statistics.MaxLambda);
        var bottom = runs.Min(r => Math.Min(0, r.Statistics.WorstLambda));
        var grid = RealSpaceDenseSolver.GridFor(bottom, top, options);
        var results = runs.Select(r => AssembleRealSpace(model, crystal, sample, options, temperatures, r, speeds, dispersion, periodic, periodicCv, grid)).ToList();
        var average = ConfigurationAverage.Of(results, model.Lattice.Dimension);

        // The virtual crystal draws its random vectors (kernel polynomial method) as a configuration after the
        // last would: independent of every configuration's, so its own standard error and theirs combine in
        // quadrature in cv - ordered_cv.
        var orderedLattice = RealSpaceLattice.Build(crystal, sample, bloch: true);
        var virtualCrystal = SiteProperties.VirtualCrystal(orderedLattice, disorder);
        var orderedRun = SolveBlock(orderedLattice, virtualCrystal, sample, temperatures, options, record: false, configuration: disorder.Configurations, ct);
        var ordered = AssembleRealSpace(model, crystal, sample, options, temperatures, orderedRun, speeds, dispersion, periodic, periodicCv);
        var sameComposition = SameCompositionHeatCapacity(model, crystal, periodic, orderedLattice, virtualCrystal, options, temperatures, ct);
        var surface = average.Surface! with
        {
            PeriodicSameCompositionCvJPerMolK = [.. sameComposition.Take(options.TemperaturesK.Length)],
            PeriodicSameCompositionCvAtReferenceJPerMolK = sameComposition[^1],
        };
        return average with { Ordered = ordered, Surface = surface };
    }

    /// <summary>
    /// The block solved by the method the sample asks for, or that fits: dense while the block has at
    /// most <see cref="RealSpaceSample.DenseMaxAtoms"/> atoms and its matrix fits the memory limit,
    /// else the kernel polynomial method on the whole sample (periodic directions wrapped).
    /// </summary>
    private static RealSpaceRun SolveBlock(RealSpaceLattice lattice, SiteProperties properties, RealSpaceSample sample, double[] temperatures, SolveOptions options, bool record, int configuration, CancellationToken ct)
    {
        var tooLarge = DenseTooLarge(lattice.Sites, lattice.Size, lattice.ImagesPerSite > 1, sample, options);
        if (sample.Method == RealSpaceMethod.Dense && tooLarge is not null)
        {
            throw Guard.Single(ModelProblemKind.TooLarge, "sample.method",
                $"the sample is too large for the dense solver and method = \"dense\" leaves the kernel polynomial method off: {tooLarge}; use method = \"auto\" or \"kpm\", a smaller sample, or raise the limit");
        }

        if (sample.Method == RealSpaceMethod.KernelPolynomial || tooLarge is not null)
        {
            if (lattice.ImagesPerSite > 1)
            {
                // The whole sample, wrapped where periodic; the block's masses and springs carried over
                // (a virtual crystal keeps its mean masses, not the host's).
                var unfolded = RealSpaceLattice.Build(lattice.Crystal, sample, bloch: false);
                properties = properties.OnBlock(lattice, unfolded);
                lattice = unfolded;
            }

            var (blocked, bytes) = RealSpaceKpmSolver.MemoryPlan(lattice.AtomCount, lattice.Neighbour.Length / Math.Max(1, lattice.Sites), options.MemoryLimitBytes);
            if (bytes > options.MemoryLimitBytes)
            {
                throw Guard.Single(ModelProblemKind.TooLarge, "sample",
                    $"the kernel polynomial method needs about {bytes >> 20} MiB for {lattice.AtomCount} atoms, more than output.memory_limit_gib allows ({options.MemoryLimitBytes >> 20} MiB); raise the limit or use a smaller sample");
            }

            return RealSpaceKpmSolver.Solve(lattice, properties, temperatures, options, sample.Kpm, configuration, ct, blocked);
        }

        return RealSpaceDenseSolver.Solve(lattice, properties, temperatures, options, sample.SurfaceWeightThreshold, record, ct);
    }

    /// <summary>Whether a block of this size is solved by the kernel polynomial method (asked for, or too large to solve densely).</summary>
    private static bool TakesKernelPolynomial(long blockSites, long size, bool complex, RealSpaceSample sample, SolveOptions options) =>
        sample.Method == RealSpaceMethod.KernelPolynomial || DenseTooLarge(blockSites, size, complex, sample, options) is not null;

    /// <summary>Why a block does not fit the dense solver, or null when it does.</summary>
    private static string? DenseTooLarge(long blockSites, long size, bool complex, RealSpaceSample sample, SolveOptions options)
    {
        var bytes = RealSpaceDenseSolver.BytesFor(size, complex);
        if (blockSites > sample.DenseMaxAtoms)
        {
            return $"its block has {blockSites} atoms, more than sample.dense_max_atoms = {sample.DenseMaxAtoms}";
        }

        return bytes > options.MemoryLimitBytes
            ? $"its block needs {bytes >> 20} MiB, more than output.memory_limit_gib allows ({options.MemoryLimitBytes >> 20} MiB)"
            : null;
    }

    /// <summary>
    /// Throws <see cref="ModelException"/> when the sample keeps no site (key <c>sample.shape</c>), has
    /// more atoms than the engine takes, or asks for the dense solver with a block too large for it
    /// (key <c>sample.method</c>): found before any point runs.
    /// </summary>
    public static void CheckRealSpaceSize(CrystalModel model, RealSpaceSample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        var crystal = CompiledCrystal.From(model);
        var ordered = sample.Disorder is null;
        var (blockSites, images) = BlockSize(crystal, sample, ordered);
        if (blockSites == 0)
        {
            throw Guard.Single(ModelProblemKind.OutOfRange, "sample.shape",
                $"the {sample.Shape.Name} keeps no site of the lattice; make it larger or move its centre onto a site (centre = [0, 0, 0] is site 0)");
        }

        if (blockSites * images > RealSpaceSample.MaxAtoms)
        {
            throw Guard.Single(ModelProblemKind.TooLarge, "sample", $"the sample has {blockSites * images} atoms, more than the {RealSpaceSample.MaxAtoms} this engine takes; make it smaller");
        }

        if (sample.Method == RealSpaceMethod.Dense && DenseTooLarge(blockSites, blockSites * crystal.Components, images > 1, sample, options) is { } why)
        {
            throw Guard.Single(ModelProblemKind.TooLarge, "sample.method",
                $"the sample is too large for the dense solver and method = \"dense\" leaves the kernel polynomial method off: {why}; use method = \"auto\" or \"kpm\", a smaller sample, or raise the limit");
        }
    }

    /// <summary>Sites of the block and how many sample sites each stands for (the cells of the Bloch directions).</summary>
    private static (long BlockSites, long Images) BlockSize(CompiledCrystal crystal, RealSpaceSample sample, bool ordered)
    {
        var atoms = RealSpaceLattice.CountSites(crystal, sample, bloch: ordered);
        var images = 1L;
        for (var i = 0; i < crystal.Lattice.Dimension; i++)
        {
            if (ordered && sample.BoundaryOf(i) == Boundary.Periodic)
            {
                images *= sample.Cells(i);
            }
        }

        return (atoms / Math.Max(1, images), images);
    }

    private static WorkEstimate EstimateRealSpace(CrystalModel model, RealSpaceSample sample, SolveOptions options)
    {
        var crystal = CompiledCrystal.From(model);
        var ordered = sample.Disorder is null;
        var (blockSites, images) = BlockSize(crystal, sample, ordered);
        var configurations = sample.Disorder?.Configurations ?? 1;
        var n = blockSites * crystal.Components;
        var complex = images > 1;
        if (TakesKernelPolynomial(blockSites, n, complex, sample, options))
        {
            // Each of R vectors: moments / 2 products with the sparse operator (18 flops per spring and
            // direction) plus the group sums and the projection; then the densities on 4096 + bins edges.
            var atoms = (double)blockSites * images;
            var springs = crystal.Couplings.Length / (double)Math.Max(1, crystal.Sites);
            var (blocked, bytes) = RealSpaceKpmSolver.MemoryPlan((long)atoms, (int)Math.Ceiling(springs), options.MemoryLimitBytes);
            var perProduct = atoms * crystal.Components * ((springs * 6) + 40) / (blocked ? RealSpaceKpmSolver.MeasuredBlockSpeedup : 1);
            var vectors = sample.Kpm.RandomVectors * configurations;
            var flops = vectors * (sample.Kpm.Moments / 2.0) * perProduct;
            return new WorkEstimate(0, (int)Math.Min(int.MaxValue, (long)atoms * crystal.Components), flops, bytes);
        }

        var points = complex ? (images + 1) / 2 : 1;
        var order = complex && n > RealSpaceDenseSolver.SmallOrder ? 2.0 * n : n;

        // Blocked reduction, inverse iteration and back-transformation: about 10/3 order^3 with vectors.
        var perBlock = 10.0 / 3.0 * order * order * order;
        return new WorkEstimate(points * configurations, (int)Math.Min(int.MaxValue, n), perBlock * points * configurations, RealSpaceDenseSolver.BytesFor(n, complex));
    }

    /// <summary>
    /// The periodic crystal of the same size: the same cells for a box; for a sphere the cube of
    /// cells holding about as many atoms, N = round((atoms / r)^(1/d)); for a cylinder the cells
    /// along its axis and a square cross-section of about as many atoms.
    /// </summary>
    /// <summary>
    /// Boundary scattering without a length takes the distance between the sample's free surfaces
    /// (<see cref="WallDistance"/>), not the periodic counterpart's smallest edge, which may be a
    /// periodic direction with no walls; a sample without free surfaces keeps the counterpart's rule.
    /// </summary>
    private static SolveOptions WithWallDistance(CrystalModel model, RealSpaceSample sample, SolveOptions options) =>
        options.Conductivity is { Boundary: { LengthNm: null } boundary } conductivity && WallDistance.SmallestNm(model.Lattice, sample) is { } wallsNm
            ? options with { Conductivity = conductivity with { Boundary = boundary with { LengthNm = wallsNm } } }
            : options;

    internal static FiniteSample PeriodicCounterpart(Lattice lattice, RealSpaceSample sample, long atoms, int sitesPerCell)
    {
        var d = lattice.Dimension;
        var cells = (double)atoms / sitesPerCell;
        var n = new[] { 1, 1, 1 };
        switch (sample.Shape)
        {
            case SphereShape:
                for (var i = 0; i < d; i++)
                {
                    n[i] = Math.Max(1, (int)Math.Round(Math.Pow(cells, 1.0 / d), MidpointRounding.AwayFromZero));
                }

                break;
            case CylinderShape c:
                n[c.Axis] = sample.Cells(c.Axis);
                var across = Math.Pow(cells / sample.Cells(c.Axis), 1.0 / (d - 1));
                for (var i = 0; i < d; i++)
                {
                    if (i != c.Axis)
                    {
                        n[i] = Math.Max(1, (int)Math.Round(across, MidpointRounding.AwayFromZero));
                    }
                }

                break;
            default:
                for (var i = 0; i < d; i++)
                {
                    n[i] = sample.Cells(i);
                }

                break;
        }

        return FiniteSample.Create(n[0], n[1], n[2]);
    }

    /// <summary>The options of a periodic comparison crystal: its thermal sums only (no partial DOS, displacements, modes, dispersion or conductivity).</summary>
    private static SolveOptions HeatCapacityOnly(SolveOptions options) => options with
    {
        PartialDos = false,
        MeanSquareDisplacement = false,
        ModeListMaxModes = 0,
        Dispersion = null,
        Conductivity = null,
    };

    /// <summary>Cv per mole of atoms of the periodic crystal at every temperature of the list (null where undefined).</summary>
    private static double?[] PeriodicHeatCapacity(CrystalModel model, FiniteSample periodic, SolveOptions options, CancellationToken ct)
    {
        var plain = HeatCapacityOnly(options);
        var result = SolveCore(model, periodic, plain, ct);
        if (result.Thermal.Length != options.TemperaturesK.Length)
        {
            return new double?[options.TemperaturesK.Length + 1]; // an unstable crystal has no heat capacity
        }

        return [.. result.Thermal.Select(r => (double?)r.HeatCapacityJPerMolK), result.Summary.HeatCapacityJPerMolK];
    }

    /// <summary>A run's densities on one grid: total and per basis site in states per THz-bin per cell-equivalent, per layer per atom.</summary>
    private sealed record Densities(FrequencyGrid Grid, double[] Total, double[] Partial, double[] Layers, string Method);

    /// <summary>The run's densities on <paramref name="grid"/>, or on its own grid when null.</summary>
    private static Densities DensitiesOf(RealSpaceRun run, FrequencyGrid? grid, SolveOptions options)
    {
        if (run.Modes is { } modes)
        {
            if (modes.IsRecording)
            {
                var stats = run.Statistics;
                modes.BinInto(grid ?? RealSpaceDenseSolver.GridFor(Math.Min(0, stats.WorstLambda), stats.MaxLambda, options));
            }

            return new Densities(modes.Grid!.Value, modes.Total, modes.Partial, modes.LayerDensity, modes.GaussianSigmaThz > 0 ? "gaussian" : "exact modes");
        }

        var kpm = run.Kpm!;
        var lattice = kpm.Lattice;
        var g = grid ?? FrequencyGrid.Covering(ModeSolver.SignedThz(Math.Min(0, run.Statistics.WorstLambda)), ModeSolver.SignedThz(kpm.Centre + kpm.Scale), options.DosBins);
        var masses = kpm.Between(KpmSpectrum.Edges(g), kpm.Mean, kpm.Groups);
        var r = lattice.Crystal.Sites;
        var perCell = (double)r / lattice.AtomCount;
        var total = new double[g.Bins];

        // The rigid-body modes were projected out of the trace; like the dense solution's they sit at zero.
        total[g.BinOf(0)] += run.RigidModes * perCell;
        var partial = new double[r * g.Bins];
        var layers = new double[lattice.LayerCount * g.Bins];
        for (var b = 0; b < g.Bins; b++)
        {
            total[b] += masses[b * kpm.Groups] * perCell;
            for (var s = 0; s < r; s++)
            {
                partial[(s * g.Bins) + b] = masses[(b * kpm.Groups) + kpm.BasisGroup(s)] * perCell;
            }

            for (var l = 0; l < lattice.LayerCount; l++)
            {
                layers[(l * g.Bins) + b] = masses[(b * kpm.Groups) + kpm.LayerGroup(l)] / lattice.LayerSites[l];
            }
        }

        return new Densities(g, total, partial, layers, "kernel polynomial");
    }

    /// <summary>Mean-square displacement (m^2) of a displacement channel at temperature index t, or null.</summary>
    private static double? Msd(RealSpaceRun run, SolveOptions options, int t, int channel)
    {
        if (!options.MeanSquareDisplacement)
        {
            return null;
        }

        if (run.Kpm is null)
        {
            return run.Sink.Msd(t, channel);
        }

        var channels = (run.Lattice.Crystal.Sites + run.Lattice.LayerCount) * run.Lattice.Components;
        return run.KpmDisplacements is { } d ? d[(t * channels) + channel] : null;
    }

    private static PointResult AssembleRealSpace(
        CrystalModel model, CompiledCrystal crystal, RealSpaceSample sample, SolveOptions options, double[] temperatures,
        RealSpaceRun run, List<SoundSpeed> speeds, ImmutableArray<DispersionRow> dispersion, FiniteSample periodic, double?[] periodicCv,
        FrequencyGrid? commonGrid = null)
    {
        var lattice = run.Lattice;
        var densities = DensitiesOf(run, commonGrid, options);
        var grid = densities.Grid;
        var dos = DosAssembly.FromStates(grid, densities.Total, options.PartialDos ? densities.Partial : [], crystal.Sites, densities.Method);

        // Periodic directions give bands: gaps between branch ranges, as for a periodic crystal. A block
        // solved at q = 0 alone has a discrete spectrum whose spacing is no band gap: only empty stretches
        // wider than 2% of the top (and two DOS bins) count, and the one above zero is the confinement gap.
        // The kernel polynomial method's smoothed density gives no gaps.
        var top = ModeSolver.SignedThz(run.Statistics.MaxLambda);
        var gaps = run.Kpm is not null ? ImmutableArray<BandGap>.Empty
            : lattice.ImagesPerSite > 1 || run.SortedThz.Length == 0
                ? WideGaps(run.Statistics, 1e-6 * top)
                : GapsOf(run.SortedThz, Math.Max(2 * grid.WidthThz, DiscreteGapFraction * top));
        var modeList = run.SortedThz.Length > 0 && run.SortedThz.Length <= options.ModeListMaxModes
            ? ModeLevels.Distinct(run.SortedThz, run.SortedThz.Length, 0)
            : [];
        // Every excluded zero mode (the rigid-body ones and any beyond them, a floppy model); the kernel
        // polynomial method cannot count those beyond.
        var zeroModes = run.Modes is { } modes ? Math.Max(0, (long)Math.Round(modes.ZeroModes) - run.RigidModes) : 0;
        var outcome = new SpectrumOutcome
        {
            SampleKind = "finite",
            CellsOrMeshPoints = (long)Math.Round((double)lattice.AtomCount / crystal.Sites, MidpointRounding.AwayFromZero),
            QPointsSolved = run.QPointsSolved,
            ModeCount = run.ModeCount,
            RigidModesExcluded = run.RigidModes,
            ZeroModesExcluded = run.RigidModes + zeroModes,
            Statistics = run.Statistics,
            Sink = run.Sink,
            Dos = dos,
            Modes = modeList,
            Gaps = gaps,
        };

        var result = Assemble(model, crystal, options, temperatures, outcome, speeds, dispersion);

        // Per kg: the atoms actually there (substitutes, or the mean masses of a virtual crystal).
        result = result with { Summary = result.Summary with { MolarMassKgPerMol = run.Properties.MassKg.Average() / PhysicalConstants.AtomicMassKg * 1e-3 } };
        var stable = result.Summary.Stable;
        var reference = Array.IndexOf(temperatures, options.ReferenceTemperatureK);
        if (run.Kpm is not null)
        {
            result = result with { Displacements = KpmDisplacementRows(model, run, options, temperatures, stable) };
        }

        var layers = LayerRows(run, options, temperatures, stable);
        var (surfaceMsd, interiorMsd) = SurfaceAndInteriorMsd(run, options, reference, stable);
        var layerDos = ImmutableArray.CreateBuilder<LayerDos>(lattice.LayerCount);
        for (var l = 0; l < lattice.LayerCount; l++)
        {
            var curve = new double[grid.Bins];
            for (var b = 0; b < grid.Bins; b++)
            {
                curve[b] = densities.Layers[(l * grid.Bins) + b] / grid.WidthThz;
            }

            layerDos.Add(new LayerDos(l, lattice.LayerSites[l] * lattice.ImagesPerSite, [.. curve]));
        }

        var lowest = run.Modes?.LowestNonZeroLambda ?? (run.KpmLowestRitz > RealSpaceDenseSolver.ZeroTolerance * run.Statistics.MaxLambda ? run.KpmLowestRitz : double.PositiveInfinity);
        var surfaceFraction = run.Modes is { } m2 && lattice.LayerCount > 0 && m2.NonZeroModes > 0 ? m2.SurfaceModes / m2.NonZeroModes : (double?)null;
        var surface = new SurfaceResult
        {
            Boundaries = sample.BoundaryText(model.Lattice.Dimension),
            Shape = sample.Shape.Name,
            Method = run.Method,
            AtomCount = lattice.AtomCount,
            SurfaceSites = lattice.SurfaceSites * lattice.ImagesPerSite,
            InteriorSites = (lattice.Sites - lattice.SurfaceSites) * lattice.ImagesPerSite,
            LayerCount = lattice.LayerCount,
            RigidRotations = run.RigidRotations,
            RotationDefectThz = run.RigidRotations > 0
                ? run.RotationDefectLambda <= RealSpaceDenseSolver.ZeroTolerance * run.Statistics.MaxLambda ? 0.0 : ModeSolver.SignedThz(run.RotationDefectLambda)
                : null,
            ConfinementGapThz = stable && double.IsFinite(lowest) ? ModeSolver.SignedThz(lowest) : null,
            SurfaceModeFraction = stable ? surfaceFraction : null,
            SurfaceWeightThreshold = sample.SurfaceWeightThreshold,
            MsdSurfaceNm2 = surfaceMsd,
            MsdInteriorNm2 = interiorMsd,
            PeriodicCells = string.Join('x', new[] { periodic.N1, periodic.N2, periodic.N3 }.Take(model.Lattice.Dimension)),
            PeriodicCvJPerMolK = [.. periodicCv.Take(options.TemperaturesK.Length)],
            PeriodicCvAtReferenceJPerMolK = periodicCv[^1],
            PeriodicSameCompositionCvJPerMolK = [.. periodicCv.Take(options.TemperaturesK.Length)],
            PeriodicSameCompositionCvAtReferenceJPerMolK = periodicCv[^1],
            Layers = layers,
            LayerDos = layerDos.MoveToImmutable(),
            KpmMoments = run.Kpm?.Moments,
            KpmRandomVectors = run.Kpm?.Vectors,
            KpmResolutionThz = run.Kpm?.ResolutionThz,
        };

        var errors = run.Kpm is { } kpm && stable
            ? KpmErrors.Of(kpm, RealSpaceKpmSolver.FineGrid(kpm.Centre + kpm.Scale), grid, temperatures, options.TemperaturesK.Length, reference,
                run.KpmDisplacements is null ? null : Math.Sqrt(run.KpmLowestRitz))
            : null;
        return result with { Surface = errors is null ? surface : WithLayerErrors(surface, errors), Errors = errors?.Point };
    }

    /// <summary>The layers' rows and densities with the standard errors of the kernel polynomial method's random vectors.</summary>
    private static SurfaceResult WithLayerErrors(SurfaceResult surface, KpmErrors.Set errors)
    {
        static double? Finite(double x) => double.IsFinite(x) ? x : null;
        var layers = surface.LayerCount;
        var layerRows = surface.Layers;
        if (errors.LayerMsdNm2 is { } msd && layers > 0)
        {
            var c = msd.Length / Math.Max(1, layerRows.Length);
            layerRows = [.. surface.Layers.Select((row, i) => row with
            {
                MsdXStderrNm2 = row.MsdXNm2 is null ? null : Finite(msd[i * c]),
                MsdYStderrNm2 = row.MsdYNm2 is null || c < 2 ? null : Finite(msd[(i * c) + 1]),
                MsdZStderrNm2 = row.MsdZNm2 is null || c < 3 ? null : Finite(msd[(i * c) + 2]),
            })];
        }

        return surface with
        {
            Layers = layerRows,
            LayerDos = [.. surface.LayerDos.Select((l, i) => l with { StandardErrorPerThzPerAtom = [.. errors.LayerDos[i]] })],
        };
    }

    /// <summary>Per basis site, from the kernel polynomial method's displacement densities.</summary>
    private static ImmutableArray<DisplacementRow> KpmDisplacementRows(CrystalModel model, RealSpaceRun run, SolveOptions options, double[] temperatures, bool stable)
    {
        var rows = ImmutableArray.CreateBuilder<DisplacementRow>();
        if (!options.MeanSquareDisplacement)
        {
            return rows.ToImmutable();
        }

        var c = run.Lattice.Components;
        for (var t = 0; t < options.TemperaturesK.Length; t++)
        {
            for (var site = 0; site < model.Sites.Length; site++)
            {
                double? Get(int axis) => !stable || axis >= c ? null : Msd(run, options, t, (site * c) + axis) * 1e18;
                rows.Add(new DisplacementRow(temperatures[t], site, model.Sites[site].Label, Get(0), Get(1), Get(2)));
            }
        }

        return rows.ToImmutable();
    }

    private static ImmutableArray<LayerRow> LayerRows(RealSpaceRun run, SolveOptions options, double[] temperatures, bool stable)
    {
        var rows = ImmutableArray.CreateBuilder<LayerRow>();
        if (!options.MeanSquareDisplacement)
        {
            return rows.ToImmutable();
        }

        var lattice = run.Lattice;
        var r = lattice.Crystal.Sites;
        var c = lattice.Components;
        for (var t = 0; t < options.TemperaturesK.Length; t++)
        {
            for (var l = 0; l < lattice.LayerCount; l++)
            {
                double? Get(int axis) => !stable || axis >= c ? null : Msd(run, options, t, ((r + l) * c) + axis) * 1e18;
                rows.Add(new LayerRow(l, lattice.LayerSites[l] * lattice.ImagesPerSite, temperatures[t], Get(0), Get(1), Get(2)));
            }
        }

        return rows.ToImmutable();
    }

    /// <summary>
    /// Mean over directions at the reference temperature: layer 0, and the site-weighted mean of the deeper layers.
    /// A sample without layers has no surface and every atom interior: a cut sample where no atom lost a nearest
    /// neighbour, and a periodic box (a disordered supercell), which has no cut at all. The interior is then the mean
    /// of the basis sites' values weighted by their atoms, i.e. the mean over all atoms.
    /// </summary>
    private static (double? Surface, double? Interior) SurfaceAndInteriorMsd(RealSpaceRun run, SolveOptions options, int reference, bool stable)
    {
        var lattice = run.Lattice;
        if (!stable || reference < 0)
        {
            return (null, null);
        }

        var r = lattice.Crystal.Sites;
        var c = lattice.Components;
        double? Mean(int group)
        {
            var sum = 0.0;
            for (var a = 0; a < c; a++)
            {
                if (Msd(run, options, reference, (group * c) + a) is not { } v)
                {
                    return null;
                }

                sum += v;
            }

            return sum / c * 1e18;
        }

        if (lattice.LayerCount == 0)
        {
            double? all = 0.0;
            for (var b = 0; b < r; b++)
            {
                all += lattice.BasisSites[b] == 0 ? 0 : Mean(b) * lattice.BasisSites[b];
            }

            return (null, all / lattice.Sites);
        }

        var surface = Mean(r);
        double? weighted = 0.0;
        var sites = 0L;
        for (var l = 1; l < lattice.LayerCount; l++)
        {
            weighted += Mean(r + l) * lattice.LayerSites[l];
            sites += lattice.LayerSites[l];
        }

        return (surface, sites > 0 ? weighted / sites : null);
    }

    /// <summary>Smallest gap of a discrete (q = 0) spectrum that is reported, relative to the top frequency.</summary>
    public const double DiscreteGapFraction = 0.02;

    /// <summary>Gaps of a discrete spectrum: empty stretches between consecutive non-zero frequencies wider than <paramref name="minimumThz"/>.</summary>
    internal static ImmutableArray<BandGap> GapsOf(double[] sortedThz, double minimumThz)
    {
        var gaps = ImmutableArray.CreateBuilder<BandGap>();
        for (var k = 0; k + 1 < sortedThz.Length; k++)
        {
            if (sortedThz[k] > 0 && sortedThz[k + 1] - sortedThz[k] > minimumThz)
            {
                gaps.Add(new BandGap(sortedThz[k], sortedThz[k + 1]));
            }
        }

        return gaps.ToImmutable();
    }

    /// <summary>Gaps between branch ranges wider than <paramref name="minimumThz"/> (ranges merged first, since branches of a block overlap).</summary>
    private static ImmutableArray<BandGap> WideGaps(SpectrumStatistics stats, double minimumThz)
    {
        var ranges = Enumerable.Range(0, stats.BranchMin.Length)
            .Select(k => (Lo: ModeSolver.SignedThz(stats.BranchMin[k]), Hi: ModeSolver.SignedThz(stats.BranchMax[k])))
            .Where(x => double.IsFinite(x.Lo) && double.IsFinite(x.Hi))
            .OrderBy(x => x.Lo)
            .ToList();
        var gaps = ImmutableArray.CreateBuilder<BandGap>();
        var reach = double.NegativeInfinity;
        foreach (var (lo, hi) in ranges)
        {
            if (reach >= 0 && lo - reach > minimumThz)
            {
                gaps.Add(new BandGap(reach, lo));
            }

            reach = Math.Max(reach, hi);
        }

        return gaps.ToImmutable();
    }
}
