using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// The bulk limit: eigenvalues (and eigenvector weights) on a Gamma-centred mesh, integrated into a
/// fine density of states by the linear simplex method (or Gaussian broadening); thermal functions,
/// moments and displacements are integrals over that fine DOS.
/// </summary>
internal static class BulkSolver
{
    /// <summary>
    /// Fine bins per output bin target: the thermal integrals use at least this many bins. Measured on a
    /// two-site fcc model against 4096: S and Cv move by 2e-5 and 8e-6 relative at 5 K, below 3e-6 from
    /// 50 K (the midpoint rule's h^2 error), far inside what the mesh itself leaves; half the bins halve
    /// the tetrahedra's bin-edge work.
    /// </summary>
    public const int FineBinsTarget = 2048;

    /// <summary>
    /// Tests only: integrate every cube (inversion pairs alone) on this thread, the reference the
    /// reduction by axis permutations is held to.
    /// </summary>
    [ThreadStatic]
    internal static bool FullTetrahedronSumOnThisThread;

    /// <summary>Tests only: the order of the axis-permutation group the last 3D tetrahedron solve on this thread found (1: none).</summary>
    [ThreadStatic]
    internal static int LastAxisPermutationOrderOnThisThread;

    public static long EstimateBytes(long meshPoints, int branches, bool weights) =>
        meshPoints * branches * 8L * (weights ? 1 + branches : 1);

    /// <summary>The refusal of a mesh whose frequencies (and eigenvector weights) would not fit the memory limit, or null.</summary>
    public static ModelProblem? MemoryProblem(BulkSample sample, int branches, SolveOptions options)
    {
        var bytes = EstimateBytes(sample.PointCount, branches, options.PartialDos || options.MeanSquareDisplacement);
        return bytes <= options.MemoryLimitBytes ? null : new ModelProblem(ModelProblemKind.TooLarge, "sample.mesh",
            $"a {sample.M1}x{sample.M2}x{sample.M3} mesh with {branches} branches needs about {bytes / (1 << 20)} MiB, more than the {options.MemoryLimitBytes / (1 << 20)} MiB allowed; use a coarser mesh, or turn off partial DOS and displacements");
    }

    /// <param name="checkMesh">The half-density mesh of the mesh check: its arrays are kept apart from the main mesh's, so a sweep keeps both.</param>
    public static SpectrumOutcome Solve(ModeSolver solver, BulkSample sample, SolveOptions options, ModeSink sink, CancellationToken ct, bool checkMesh = false)
    {
        var n = solver.Size;
        var grid = new PeriodicGrid(sample.M1, sample.M2, sample.M3);
        if (MemoryProblem(sample, n, options) is { } tooLarge)
        {
            throw new ModelException([tooLarge]);
        }

        // A sheet's or a chain's zero valleys away from q = 0, searched once: refused below where the mesh misses one, else each gets rays.
        IReadOnlyList<(Models.Vec3 Reduced, int Branches)> valleys = options.DosMethod == DosMethod.Gaussian ? [] : ZeroValleys.ForBulkMesh(solver);

        // A sheet's or chain's zero valley the mesh leaves off its points and cell corners, or a 3D crystal's zero valley (no
        // rays for those): refused rather than a silently low heat capacity (the check mesh of a convergence estimate may
        // leave a sheet's valley: its change then reads large, not small).
        if (!checkMesh && options.DosMethod != DosMethod.Gaussian && ZeroValleys.BulkProblem(solver, valleys, sample, options.Conductivity is not null) is { } offMesh)
        {
            throw new ModelException([offMesh]);
        }

        var wantWeights = sink.WantsChannelFractions || options.PartialDos;
        ref var keptF = ref checkMesh ? ref keptCheckFrequencies : ref keptFrequencies;
        ref var keptW = ref checkMesh ? ref keptCheckWeights : ref keptWeights;
        var frequencies = TakeKept(ref keptF, grid.Count * n);
        var weights = wantWeights ? TakeKept(ref keptW, grid.Count * n * n) : null;
        try
        {
            return Solve(solver, sample, options, sink, grid, frequencies, weights, valleys, ct);
        }
        finally
        {
            ReturnKept(ref keptF, frequencies);
            if (weights is not null)
            {
                ReturnKept(ref keptW, weights);
            }
        }
    }

    /// <summary>
    /// A mesh's frequency array, and its channel-weight array (branches times larger: ~32 MB for a
    /// two-site 48^3 point), kept for the next solve of the same mesh on this thread (sweeps solve many
    /// points of one mesh): a fresh array costs page faults and zeroing (~5% of a 48^3 point for the
    /// frequencies), and a fresh 32 MB one lands on the large-object heap, whose collections are gen-2
    /// ones. Every element is written before it is read (each mesh point is in the half set or its
    /// partner is; every branch and channel of it), so nothing of the previous point can leak into the
    /// next. Taken out while in use, so a nested solve gets its own. Arrays over 64 MiB are not kept.
    /// </summary>
    [ThreadStatic]
    private static double[]? keptFrequencies;

    [ThreadStatic]
    private static double[]? keptWeights;

    [ThreadStatic]
    private static double[]? keptCheckFrequencies;

    [ThreadStatic]
    private static double[]? keptCheckWeights;

    private const long KeptBytesLimit = 64L << 20;

    private static double[] TakeKept(ref double[]? kept, long length)
    {
        var array = kept;
        if (array is not null && array.LongLength == length)
        {
            kept = null;
            return array;
        }

        return new double[length];
    }

    private static void ReturnKept(ref double[]? kept, double[] array)
    {
        if (array.LongLength * sizeof(double) <= KeptBytesLimit)
        {
            kept = array;
        }
    }

    private static SpectrumOutcome Solve(ModeSolver solver, BulkSample sample, SolveOptions options, ModeSink sink, PeriodicGrid grid, double[] frequencies, double[]? weights, IReadOnlyList<(Models.Vec3 Reduced, int Branches)> valleys, CancellationToken ct)
    {
        var n = solver.Size;
        var crystal = solver.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var dimension = lattice.Dimension;
        var wantWeights = weights is not null;
        var stats = new SpectrumStatistics(n);
        var fractions = new double[n];
        solver.SolveHalfSet(grid, wantWeights, (in GridPoint point, int slot) =>
        {
            var values = solver.BatchValues(slot);
            stats.Observe(values, point.Reduced, point.IsGamma ? crystal.Components : 0);
            for (var k = 0; k < n; k++)
            {
                frequencies[point.Index * n + k] = ModeSolver.SignedThz(values[k]);
            }

            if (weights is not null)
            {
                // Each mode's channel fractions straight into the point's block (mode-major, n each).
                for (var k = 0; k < n; k++)
                {
                    solver.BatchChannelFractions(slot, k, weights.AsSpan((int)((point.Index * n + k) * n), n));
                }
            }

            if (point.Weight > 1)
            {
                // The partner -q has the same frequencies, and |e(-q)|^2 = |e(q)*|^2 the same weights.
                // Plain loops: Array.Copy is a call out of precompiled code.
                var from = point.Index * n;
                var to = point.PartnerIndex * n;
                for (var k = 0; k < n; k++)
                {
                    frequencies[to + k] = frequencies[from + k];
                }

                if (weights is not null)
                {
                    for (var c = 0; c < n * n; c++)
                    {
                        weights[(to * n) + c] = weights[(from * n) + c];
                    }
                }
            }
        }, ct);

        var lowest = ModeSolver.SignedThz(Math.Min(0, stats.WorstLambda));
        var highest = ModeSolver.SignedThz(stats.MaxLambda);
        var perOutput = Math.Max(1, (FineBinsTarget + options.DosBins - 1) / options.DosBins);
        var gaussian = options.DosMethod == DosMethod.Gaussian;
        var rigid = crystal.Components;
        // A sheet's or chain's zero valleys away from q = 0 (a flexural bend on the second shell alone; the caller's search): their floors
        // on the mesh are counted as the rigid translations are, and each valley gets the long-wave rays q = 0 gets.
        var zeroModes = rigid + CountZeroModes(frequencies, grid, n, rigid, highest, ZeroValleys.MeshCentres(valleys, sample, grid));
        var unstable = stats.WorstLambda < -1e-8 * stats.MaxLambda;

        // The acoustic branches around q = 0 from the model's own long waves (not for Gaussian
        // broadening, nor for unstable or floppy models: their thermal numbers are not trusted anyway).
        var longWaves = gaussian || unstable || zeroModes > rigid
            ? null
            : LongWaveRegions.TryBuild(solver, sample, frequencies, wantWeights, valleys);
        ct.ThrowIfCancellationRequested();

        // Gaussian tails reach 6 sigma past the spectrum; the grid takes them in so no state is lost.
        var tail = gaussian ? 6 * options.GaussianSigmaThz : 0;
        // A layered crystal's slow valleys put states of a few kelvin into the rays' bins above their split (a box one
        // cell long along the slow axis ends there at 1-2 K): finer bins (SlowAxisColumn.FinerBins) keep the sums right at 0.5 K.
        perOutput *= longWaves?.Column is not null ? SlowAxisColumn.FinerBins : 1;
        var fine = FrequencyGrid.Covering(lowest - tail, highest + tail, options.DosBins * perOutput);
        var total = new double[fine.Bins];
        var partial = weights is null ? [] : new double[n * fine.Bins];

        // 1D and 2D meshes have few simplices: their bins keep the states' moments for a two-point rule.
        var moments = dimension <= 2 && !gaussian ? new BinMoments(fine.Bins) : null;
        if (gaussian)
        {
            var share = 1.0 / grid.Count;
            for (long p = 0; p < grid.Count; p++)
            {
                for (var k = 0; k < n; k++)
                {
                    var w = weights is null ? default : new ReadOnlySpan<double>(weights, (int)((p * n + k) * n), n);
                    GaussianBroadening.Deposit(frequencies[p * n + k], share, options.GaussianSigmaThz, fine, total, partial, w);
                }
            }
        }
        else
        {
            // The cubic axis permutations (where the spectrum has them) cut the tetrahedra sixfold; the
            // channel weights (partial DOS, displacements) are read at every cube of an orbit and averaged.
            var mesh = (sample.M1, sample.M2, sample.M3);
            var axisPermutations = dimension == 3 && !FullTetrahedronSumOnThisThread ? MeshAxisPermutations.Find(mesh, n, frequencies, longWaves?.Box, Math.Max(-lowest, highest)) : null;
            LastAxisPermutationOrderOnThisThread = axisPermutations?.Order ?? 1;
            SimplexDosIntegrator.Accumulate(dimension, mesh, n, frequencies, weights, weights is null ? 0 : n, fine, total, partial, longWaves?.Box, moments, axisPermutations: axisPermutations);
            longWaves?.DepositColumn(fine, total, partial);
        }

        // The DOS table and the thermal sums take the long waves above omega_c differently (see
        // LongWaveRegion.DepositAboveSplit): the table's bins start from the simplices' as well.
        var tableTotal = total;
        var tablePartial = partial;
        if (longWaves is not null)
        {
            tableTotal = (double[])total.Clone();
            tablePartial = (double[])partial.Clone();
            longWaves.DepositAboveSplit(fine, total, partial, spreadEnds: false, moments);
            longWaves.DepositAboveSplit(fine, tableTotal, tablePartial, spreadEnds: true);
        }

        ct.ThrowIfCancellationRequested();
        for (var b = 0; b < fine.Bins; b++)
        {
            if (total[b] <= 0)
            {
                continue;
            }

            if (sink.WantsChannelFractions && weights is not null)
            {
                for (var c = 0; c < n; c++)
                {
                    fractions[c] = partial[c * fine.Bins + b] / total[b];
                }
            }

            var channelFractions = sink.WantsChannelFractions ? fractions : default;
            if (moments is null)
            {
                sink.Add(2.0 * Math.PI * 1e12 * fine.Centre(b), total[b], channelFractions);
                continue;
            }

            var (low, high) = moments.Nodes2(fine, b, total[b]);
            sink.Add(2.0 * Math.PI * 1e12 * low, 0.5 * total[b], channelFractions);
            sink.Add(2.0 * Math.PI * 1e12 * high, 0.5 * total[b], channelFractions);
        }

        // Below omega_c the long waves go to the thermal sums by their own quadrature (exact at any
        // temperature) and to the DOS table by bins.
        longWaves?.AddBelowSplit(sink, sink.TemperaturesK);

        // Where the plain mesh sum of U and Cv has converged (the long waves' poles far enough from
        // the real wave vectors for this mesh's step), it replaces the simplices' (Thermal/PeriodicMeshSums: exponential
        // against h^2 convergence). Not for chains (their meshes are fine already), broadening, unstable or floppy models,
        // nor sheets' zero valleys (floors the estimate does not see).
        if (dimension >= 2 && !gaussian && !unstable && zeroModes == rigid && valleys.Count == 0)
        {
            BlendPlainSums(solver, sink, frequencies, n, grid);
        }

        var outGrid = new FrequencyGrid(fine.StartThz, fine.WidthThz * perOutput, options.DosBins);
        var outTotal = new double[outGrid.Bins];
        var sites = crystal.Sites;
        var outPartial = options.PartialDos && weights is not null ? new double[sites * outGrid.Bins] : [];
        for (var b = 0; b < fine.Bins; b++)
        {
            var ob = b / perOutput;
            outTotal[ob] += tableTotal[b];
            if (outPartial.Length > 0)
            {
                for (var c = 0; c < n; c++)
                {
                    outPartial[(c / crystal.Components) * outGrid.Bins + ob] += tablePartial[c * fine.Bins + b];
                }
            }
        }

        if (longWaves is not null)
        {
            var lowTotal = new double[outGrid.Bins];
            var lowPartial = outPartial.Length > 0 ? new double[n * outGrid.Bins] : [];
            longWaves.DepositBelowSplit(outGrid, lowTotal, lowPartial);
            for (var b = 0; b < outGrid.Bins; b++)
            {
                outTotal[b] += lowTotal[b];
                for (var c = 0; c < lowPartial.Length / outGrid.Bins; c++)
                {
                    outPartial[(c / crystal.Components) * outGrid.Bins + b] += lowPartial[c * outGrid.Bins + b];
                }
            }
        }

        var (gapMin, gapMax) = unstable ? (stats.BranchMin, stats.BranchMax) : ZoneBoundaryRanges.Of(solver, sample, stats);
        var gaps = BandGaps.FromBranches(gapMin, gapMax, unstable);
        var method = gaussian ? "gaussian" : dimension switch { 1 => "linear intervals", 2 => "linear triangles", _ => "linear tetrahedra" };
        return new SpectrumOutcome
        {
            SampleKind = "bulk",
            CellsOrMeshPoints = grid.Count,
            QPointsSolved = grid.HalfCount,
            ModeCount = grid.Count * n,
            RigidModesExcluded = rigid,
            ZeroModesExcluded = zeroModes,
            Statistics = stats,
            Gaps = gaussian ? gaps : BandGaps.ConfirmedBy(gaps, fine, tableTotal),
            Sink = sink,
            MeanOmegaSquared = MeanOmegaSquared(frequencies),
            BoundaryMaxLambda = unstable ? null : gapMax.Max(),
            Dos = DosAssembly.FromStates(outGrid, outTotal, outPartial, sites, method),
            Modes = [],
            MeshModeSums = options.MeshModeSums && !unstable ? MeshModeSums.Of(frequencies, grid, n, rigid, sink.TemperaturesK) : null,
        };
    }

    private static void BlendPlainSums(ModeSolver solver, ModeSink sink, double[] frequencies, int branches, PeriodicGrid grid)
    {
        var temperatures = sink.TemperaturesK;
        var internalJ = new double[temperatures.Length];
        var heatCapacity = new double[temperatures.Length];
        var freeLogSum = new double[temperatures.Length];
        var gammaStart = grid.Index(grid.N1 / 2, grid.N2 / 2, grid.N3 / 2) * branches;
        var rigid = solver.Matrix.Crystal.Components;
        for (var t = 0; t < temperatures.Length; t++)
        {
            if (temperatures[t] > 0)
            {
                (internalJ[t], heatCapacity[t], freeLogSum[t]) = Thermal.PeriodicMeshSums.SumsWithFree(frequencies, branches, temperatures[t], gammaStart, rigid);
            }
        }

        // Null where the mesh is too small or a long-wave probe fails (a q^2 branch): the density of states' sums stay.
        var weights = Thermal.PeriodicMeshSums.PlainWeights(solver, grid, temperatures, heatCapacity);
        if (weights is null)
        {
            return;
        }

        // The zero-point energy, S and F from the same mesh, its q = 0 point's acoustic modes from the long waves' cones
        // (Thermal/GammaCellSums: h^(d+1) or better against the simplices' h^2); S and F where U's plain sum is taken.
        var gammaCell = Thermal.GammaCellSums.Of(solver, grid);
        if (gammaCell is not null)
        {
            sink.ReplaceZeroPoint(gammaCell.ZeroPointJ(frequencies, grid, branches));
        }

        for (var t = 0; t < temperatures.Length; t++)
        {
            if (!(temperatures[t] > 0))
            {
                continue;
            }

            sink.BlendPlainSums(t, weights[t], internalJ[t], heatCapacity[t]);
            if (gammaCell is not null && weights[t] > 0)
            {
                var entropy = (internalJ[t] - gammaCell.FreeJ(freeLogSum[t], grid, temperatures[t])) / temperatures[t];
                sink.BlendPlainEntropy(t, weights[t], entropy);
            }
        }
    }

    /// <summary>
    /// The zone average of omega^2: the mean over the mesh of tr D(q) / branches. tr D(q) is a sum of
    /// cos(q . R) over the bonds from a site to its own images, whose mesh mean vanishes unless the
    /// mesh count divides R: exact for springs that reach fewer than half the mesh's cells (nearest
    /// neighbours from a 3-point mesh), where the DOS's linear simplices are off at second order in
    /// the mesh spacing (0.4% in the Debye temperature from this moment on an 8^3 mesh).
    /// </summary>
    private static double MeanOmegaSquared(double[] frequencyThz)
    {
        var sum = 0.0;
        foreach (var f in frequencyThz)
        {
            sum += SignOf.Value(f) * f * f;
        }

        var radPerS = 2 * Math.PI * 1e12;
        return sum / frequencyThz.Length * radPerS * radPerS;
    }

    /// <summary>
    /// Modes of zero frequency (within the eigen-solver's round-off, 1e-7 of the top frequency, i.e.
    /// 1e-14 in omega^2) at the mesh points, the rigid translations at q = 0 not counted. More than none
    /// marks a floppy model (directions without a restoring force on whole lines or planes of q).
    /// </summary>
    /// <param name="valleyCentres">Mesh points that are the floors of zero valleys (<see cref="ZeroValleys.MeshCentres"/>), with their zero branches: not counted.</param>
    private static long CountZeroModes(double[] frequencyThz, PeriodicGrid grid, int branches, int rigid, double highestThz, Dictionary<long, int> valleyCentres)
    {
        var gamma = grid.Index(grid.N1 / 2, grid.N2 / 2, grid.N3 / 2);
        var tolerance = 1e-7 * highestThz;
        long count = 0;
        for (long p = 0; p < grid.Count; p++)
        {
            for (var k = p == gamma ? rigid : valleyCentres.GetValueOrDefault(p); k < branches; k++)
            {
                if (Math.Abs(frequencyThz[p * branches + k]) <= tolerance)
                {
                    count++;
                }
            }
        }

        return count;
    }
}
