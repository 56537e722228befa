using System.Collections.Immutable;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Exact mode sums over the allowed wave vectors of a Born-von Karman crystal. Memory does not grow
/// with the crystal: pass 1 streams eigenvalues into the thermal sums (and keeps them only while
/// they fit a fixed budget), pass 2 (only when eigenvectors or a re-scan are needed) streams the
/// density of states and the displacements.
/// </summary>
internal static class FiniteCrystalSolver
{
    /// <summary>Modes kept in memory between passes (8 bytes each).</summary>
    public const long StoredModeLimit = 8_000_000;

    /// <summary>Largest crystal accepted, in modes: beyond this one solve would run for days.</summary>
    public const long MaxModes = 4_000_000_000;

    private const double ThzPerRadPerS = 1.0 / (2.0 * Math.PI) / 1e12;

    /// <summary>Wave vectors whose modes pass 2 hands to the sink together (a multiple of the solver's batch).</summary>
    private const int PassTwoBatch = 8 * ModeSolver.BatchSize;

    public static SpectrumOutcome Solve(ModeSolver solver, FiniteSample sample, SolveOptions options, double[] temperaturesK, ModeSink sink, CancellationToken ct)
    {
        var n = solver.Size;
        var crystal = solver.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var grid = new PeriodicGrid(sample.N1, sample.N2, sample.N3);
        var modes = grid.Count * n;
        if (SizeProblem(sample, n) is { } tooLarge)
        {
            throw new ModelException([tooLarge]);
        }

        var perCell = 1.0 / grid.Count;
        var stats = new SpectrumStatistics(n);
        var store = modes <= Math.Min(StoredModeLimit, options.ModeListMaxModes) ? new double[modes] : null;
        var storedCount = 0L;
        var rigid = crystal.Components;
        long zeroModes = 0;

        // A periodic crystal's wave vectors that are the floors of zero valleys away from q = 0 (M of an even sheet whose
        // flexural bend couples only the diagonals; pi / a of an even chain whose bend skips a cell, Round 29): their zeros are
        // left out of the sums like the rigid translations and, as in bulk (BulkSolver), not counted as floppy zeros; the
        // lowest branches there are the floor's.
        var floors = ZeroValleys.MeshCentres([.. ZeroValleys.Find(solver), .. ZeroValleys.FindBeyondSheets(solver)], sample.N1, sample.N2, grid, sample.N3);
        int FloorAt(in GridPoint point) => floors.Count > 0 && floors.TryGetValue(point.Index, out var b) ? b : 0;
        var wantVectors = sink.WantsChannelFractions || options.PartialDos;

        // Without eigenvectors, pass 2 reads pass 1's eigenvalues back when they fit the same fixed
        // budget (memory still does not grow with the crystal: beyond it, pass 2 solves again).
        var cached = !wantVectors && grid.HalfCount * n <= StoredModeLimit ? new double[grid.HalfCount * n] : null;
        var visited = 0L;

        // Pass 1: eigenvalues only. The range is needed before any histogram can be binned.
        solver.SolveHalfSet(grid, withVectors: false, points =>
        {
            var batch = solver.BatchValues(0, points.Length);
            stats.ObserveMany(batch, points, rigid);
            for (var p = 0; p < points.Length && store is not null; p++)
            {
                ref readonly var point = ref points[p];
                var values = batch.Slice(p * n, n);
                for (var k = point.IsGamma ? rigid : 0; k < n; k++)
                {
                    for (var w = 0; w < point.Weight; w++)
                    {
                        store[storedCount++] = ModeSolver.SignedThz(values[k]);
                    }
                }
            }

            if (cached is not null)
            {
                batch.CopyTo(cached.AsSpan((int)(visited * n), batch.Length));
            }

            visited += points.Length;
        }, ct);

        // The largest eigenvalue seen (its branch's maximum), or 0.
        var scaleLambda = Math.Max(0.0, stats.BranchMax[n - 1]);

        // Eigenvalues within the eigen-solver's round-off of zero (about 1e-14 of the largest) are
        // zero modes: a 1e7-cell chain's lowest mode (ratio ~1e-13) still counts as a mode.
        var zeroTolerance = 1e-14 * scaleLambda;
        var tail = options.DosMethod == DosMethod.Gaussian ? 6 * options.GaussianSigmaThz : 0;
        var grid0 = FrequencyGrid.Covering(ModeSolver.SignedThz(Math.Min(0, stats.WorstLambda)) - tail, ModeSolver.SignedThz(scaleLambda) + tail, options.DosBins);
        var channels = n;
        var sites = crystal.Sites;
        var total = new double[grid0.Bins];
        var partial = options.PartialDos ? new double[sites * grid0.Bins] : [];
        var siteFractions = new double[sites];
        var fractions = new double[channels];
        var gaussian = options.DosMethod == DosMethod.Gaussian;

        // Pass 2: thermal sums, histogram and displacements, mode by mode. The top is known now, so the
        // sink may bin the modes (exact to 1e-12) instead of summing each at every temperature.
        if (scaleLambda > 0)
        {
            sink.PrepareBins(Math.Sqrt(scaleLambda), modes);
        }

        // Without vectors the modes go to the sink a batch at a time (their thermal sums binned by
        // runs); with them, one by one with their channel fractions.
        var modeOmegas = new double[PassTwoBatch * n];
        var modeWeights = new double[PassTwoBatch * n];
        if (cached is not null)
        {
            visited = 0L;
            var points = new GridPoint[PassTwoBatch];
            var cursor = default(HalfSetCursor);
            int count;
            while ((count = grid.FillHalfSet(ref cursor, points)) > 0)
            {
                ct.ThrowIfCancellationRequested();
                CollectMany(points.AsSpan(0, count), cached.AsSpan((int)(visited * n), count * n));
                visited += count;
            }
        }
        else if (!wantVectors)
        {
            solver.SolveHalfSet(grid, withVectors: false, points => CollectMany(points, solver.BatchValues(0, points.Length)), ct);
        }
        else
        {
            solver.SolveHalfSet(grid, wantVectors, (in GridPoint point, int slot) => Collect(point, solver.BatchValues(slot), slot), ct);
        }

        void CollectMany(ReadOnlySpan<GridPoint> points, ReadOnlySpan<double> values)
        {
            var added = 0;
            for (var p = 0; p < points.Length; p++)
            {
                ref readonly var point = ref points[p];
                var skip = point.IsGamma ? rigid : 0;
                var weight = point.Weight * perCell;
                var floor = FloorAt(point);
                for (var k = skip; k < n; k++)
                {
                    var lambda = values[(p * n) + k];
                    var omega = Math.Sqrt(Math.Abs(lambda));
                    var thz = lambda < 0 ? -omega * ThzPerRadPerS : omega * ThzPerRadPerS;
                    Deposit(thz, weight, gaussian, options.GaussianSigmaThz, grid0, total, partial, default);
                    if (Math.Abs(lambda) <= zeroTolerance)
                    {
                        zeroModes += k < floor ? 0 : point.Weight;
                        continue;
                    }

                    if (lambda > 0)
                    {
                        modeOmegas[added] = omega;
                        modeWeights[added++] = weight;
                    }
                }
            }

            sink.AddMany(modeOmegas.AsSpan(0, added), modeWeights.AsSpan(0, added));
        }

        void Collect(in GridPoint point, ReadOnlySpan<double> values, int slot)
        {
            var skip = point.IsGamma ? rigid : 0;
            var weight = point.Weight * perCell;
            var floor = FloorAt(point);
            for (var k = skip; k < n; k++)
            {
                var lambda = values[k];
                if (wantVectors)
                {
                    solver.BatchChannelFractions(slot, k, fractions);
                    SumSites(fractions, siteFractions, crystal.Components);
                }

                var omega = Math.Sqrt(Math.Abs(lambda));
                var thz = lambda < 0 ? -omega * ThzPerRadPerS : omega * ThzPerRadPerS;
                Deposit(thz, weight, gaussian, options.GaussianSigmaThz, grid0, total, partial, options.PartialDos ? siteFractions : default);
                if (Math.Abs(lambda) <= zeroTolerance)
                {
                    zeroModes += k < floor ? 0 : point.Weight;
                    continue;
                }

                if (lambda > 0)
                {
                    sink.Add(omega, weight, wantVectors ? fractions : default);
                }
            }
        }

        // Rigid translations sit at zero frequency: in the histogram, out of the sums.
        // Their eigenvectors are sqrt(m_I) / sqrt(sum m): each site carries its share of the mass.
        var massTotal = crystal.MassesKg.Sum();
        var rigidFractions = options.PartialDos ? crystal.MassesKg.Select(m => m / massTotal).ToArray() : [];
        Deposit(0, rigid * perCell, gaussian, options.GaussianSigmaThz, grid0, total, partial, rigidFractions);

        var dos = DosAssembly.FromStates(grid0, total, partial, sites, gaussian ? "gaussian" : "exact modes");
        var modeList = store is not null && modes <= options.ModeListMaxModes
            ? ModeLevels.Distinct(store, storedCount, rigid)
            : [];

        return new SpectrumOutcome
        {
            SampleKind = "finite",
            CellsOrMeshPoints = grid.Count,
            QPointsSolved = grid.HalfCount,
            ModeCount = modes,
            RigidModesExcluded = rigid,
            ZeroModesExcluded = rigid + zeroModes,
            Statistics = stats,
            Gaps = BandGaps.FromBranches(stats, stats.WorstLambda < -1e-8 * scaleLambda),
            Sink = sink,
            Dos = dos,
            Modes = modeList,
        };
    }

    /// <summary>The refusal of a crystal with more modes than an exact sum can take, or null.</summary>
    public static ModelProblem? SizeProblem(FiniteSample sample, int branches)
    {
        var modes = sample.CellCount * (double)branches; // double: no overflow for any int sizes
        return modes <= MaxModes ? null : new ModelProblem(ModelProblemKind.TooLarge, "sample.cells",
            $"{sample.CellCount} cells x {branches} branches = {modes:0} modes is more than the {MaxModes} this engine accepts for an exact sum; use a bulk mesh or a smaller crystal");
    }

    internal static void SumSites(ReadOnlySpan<double> channelFractions, Span<double> siteFractions, int components)
    {
        for (var s = 0; s < siteFractions.Length; s++)
        {
            var sum = 0.0;
            for (var a = 0; a < components; a++)
            {
                sum += channelFractions[s * components + a];
            }

            siteFractions[s] = sum;
        }
    }

    private static void Deposit(double thz, double weight, bool gaussian, double sigmaThz, FrequencyGrid grid, double[] total, double[] partial, ReadOnlySpan<double> siteFractions)
    {
        if (gaussian)
        {
            GaussianBroadening.Deposit(thz, weight, sigmaThz, grid, total, partial, siteFractions);
            return;
        }

        var bin = grid.BinOf(thz);
        total[bin] += weight;
        for (var s = 0; s < siteFractions.Length; s++)
        {
            partial[s * grid.Bins + bin] += weight * siteFractions[s];
        }
    }
}
