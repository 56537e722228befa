using System.Numerics;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Exact modes of a real-space block: one real symmetric matrix at q = 0 when no direction is Bloch
/// (free clusters, disordered supercells), or one Hermitian block per allowed wave vector of the
/// Bloch directions (ordered films and wires), each solved with its eigenvectors. Blocks above
/// <see cref="SmallOrder"/> go to <see cref="SymmetricEigenSolver"/>; a complex block H = A + iB
/// does so as the real symmetric [[A, -B], [B, A]], whose eigenvalues are H's, each twice, with
/// eigenvectors (x; y) of z = x + iy, so every copy counts half.
/// <para>
/// The per-mode numbers the densities need are kept while they fit <see cref="RecordBudget"/> and
/// binned once the range is known; beyond it a first pass finds the range from eigenvalues alone.
/// Memory: the matrix (8 n^2 bytes at q = 0, 32 n^2 bytes for a complex block through the real
/// form) plus n x 256 doubles of vectors, whatever the number of wave vectors.
/// </para>
/// </summary>
internal static class RealSpaceDenseSolver
{
    /// <summary>
    /// Eigenvalues within this fraction of the largest are zero modes: the dense solver's round-off
    /// is about n eps ||D|| (1e-11 at n = 36,000), the lowest physical mode of the largest dense block
    /// about 1e-4 of the top.
    /// </summary>
    public const double ZeroTolerance = 1e-10;

    /// <summary>Blocks up to this order use the small-matrix solver.</summary>
    public const int SmallOrder = 64;

    /// <summary>Doubles of per-mode data kept for binning after the solve.</summary>
    public const long RecordBudget = 16_000_000;

    /// <summary>Frequencies kept for the mode list and the gaps.</summary>
    public const long StoredModeLimit = 8_000_000;

    /// <summary>Bytes a dense solve of a block of n degrees of freedom needs.</summary>
    public static long BytesFor(long n, bool complex)
    {
        var order = complex && n > SmallOrder ? 2 * n : n;
        return (8L * order * order) + (8L * order * (SymmetricEigenSolver.BatchSize + 96)) + (complex ? 48L * n * n : 16L * n * n);
    }

    public static RealSpaceRun Solve(
        RealSpaceLattice lattice, SiteProperties properties, double[] temperatures, SolveOptions options,
        double surfaceThreshold, bool forceRecording, CancellationToken ct)
    {
        var op = new RealSpaceOperator(lattice, properties);
        var n = op.Size;
        var grid = new PeriodicGrid(lattice.BlochCells[0], lattice.BlochCells[1], lattice.BlochCells[2]);
        var complex = grid.Count > 1;
        var bytes = BytesFor(n, complex);
        if (bytes > options.MemoryLimitBytes)
        {
            throw Guard.Single(ModelProblemKind.TooLarge, "sample.method",
                $"a dense solution of a block of {lattice.Sites} atoms needs {bytes >> 20} MiB, more than output.memory_limit_gib allows ({options.MemoryLimitBytes >> 20} MiB); raise the limit or use method = \"kpm\"");
        }

        // q = 0: the real block with the rigid motions projected out (rotations are not always zero modes of the springs).
        var real = new double[(long)n * n];
        op.BuildReal(real);
        var rigid = RigidBodyModes.Of(lattice, properties.MassKg);
        var rotation = rigid.RotationStiffness(v => Multiply(real, n, v));
        rigid.ProjectOutOfMatrix(real);

        var modeCount = lattice.AtomCount * lattice.Components;
        var groups = 1 + lattice.Crystal.Sites + lattice.LayerCount;
        var record = forceRecording || modeCount * groups <= RecordBudget;
        var stats = new SpectrumStatistics(n);
        var sink = NewSink(lattice, temperatures, options);
        var sigma = options.DosMethod == DosMethod.Gaussian ? options.GaussianSigmaThz : 0;
        var frequencies = modeCount <= StoredModeLimit ? new List<double>((int)modeCount) : null;
        var top = 0.0;
        var bottom = 0.0;
        var blocks = new BlockSolver(op, real, n);

        if (!record)
        {
            foreach (var point in grid.HalfSet())
            {
                ct.ThrowIfCancellationRequested();
                var (lo, hi) = blocks.Range(point, ct);
                top = Math.Max(top, hi);
                bottom = Math.Min(bottom, lo);
            }

            if (top > 0)
            {
                sink.PrepareBins(Math.Sqrt(top), modeCount);
            }
        }

        var tolerance = ZeroTolerance * Math.Max(Math.Abs(top), Math.Abs(bottom));
        var modes = new RealSpaceModes(lattice, properties, sink, tolerance, surfaceThreshold) { GaussianSigmaThz = sigma };
        if (!record)
        {
            modes.BinInto(GridFor(bottom, top, options));
        }

        var values = new double[n];
        foreach (var point in grid.HalfSet())
        {
            ct.ThrowIfCancellationRequested();
            blocks.Solve(point, values, (lo, hi) =>
            {
                // Recording: the range grows block by block, and with it the zero threshold.
                if (record)
                {
                    top = Math.Max(top, hi);
                    bottom = Math.Min(bottom, lo);
                    modes.ZeroTolerance = ZeroTolerance * Math.Max(Math.Abs(top), Math.Abs(bottom));
                }
            }, (lambda, squares, share) =>
            {
                modes.AddSquares(lambda, squares, share * point.Weight);
                if (frequencies is not null && share == 1.0)
                {
                    for (var w = 0; w < point.Weight; w++)
                    {
                        frequencies.Add(lambda);
                    }
                }
            }, ct);
            if (frequencies is not null && values.Length > 0 && !point.IsGamma && n > SmallOrder)
            {
                // Doubled eigenvalues came in halves: the list takes each once.
                foreach (var v in values)
                {
                    for (var w = 0; w < point.Weight; w++)
                    {
                        frequencies.Add(v);
                    }
                }
            }

            ObserveRange(values, point, stats, modes.ZeroTolerance);
        }

        // A forced recording (a disordered sample's configuration) stays unbinned: the caller bins every
        // configuration into one grid covering them all, so their densities average bin by bin.
        if (record && !forceRecording)
        {
            modes.BinInto(GridFor(bottom, top, options));
        }

        var thz = Array.Empty<double>();
        if (frequencies is not null)
        {
            var tol = modes.ZeroTolerance;
            thz = [.. frequencies.Select(l => ModeSolver.SignedThz(Math.Abs(l) <= tol ? 0 : l)).Order()];
        }

        return new RealSpaceRun
        {
            Lattice = lattice,
            Properties = properties,
            Statistics = stats,
            Modes = modes,
            Sink = sink,
            RigidModes = rigid.Count,
            RigidRotations = rigid.Rotations,
            RotationDefectLambda = rotation,
            Method = complex ? "dense per wave vector" : "dense",
            QPointsSolved = grid.HalfCount,
            ModeCount = modeCount,
            SortedThz = thz,
        };
    }

    /// <summary>Statistics take zero modes as exactly zero (their sign is round-off).</summary>
    private static void ObserveRange(double[] values, GridPoint point, SpectrumStatistics stats, double tolerance)
    {
        for (var k = 0; k < values.Length; k++)
        {
            if (Math.Abs(values[k]) <= tolerance)
            {
                values[k] = 0;
            }
        }

        Array.Sort(values);
        stats.Observe(values, point.Reduced, 0);
    }

    public static ModeSink NewSink(RealSpaceLattice lattice, double[] temperatures, SolveOptions options) =>
        new(temperatures, (lattice.Crystal.Sites + lattice.LayerCount) * lattice.Components, RealSpaceModes.ChannelMasses(lattice), options.MeanSquareDisplacement);

    /// <summary>The point's DOS grid from the lowest and highest eigenvalue (rad^2/s^2).</summary>
    public static FrequencyGrid GridFor(double lowestLambda, double highestLambda, SolveOptions options)
    {
        // A zero mode's round-off sign must not start the grid at -sqrt(eps) of the top.
        if (Math.Abs(lowestLambda) <= ZeroTolerance * Math.Abs(highestLambda))
        {
            lowestLambda = 0;
        }

        var tail = options.DosMethod == DosMethod.Gaussian ? 6 * options.GaussianSigmaThz : 0;
        return FrequencyGrid.Covering(ModeSolver.SignedThz(Math.Min(0, lowestLambda)) - tail, ModeSolver.SignedThz(highestLambda) + tail, options.DosBins);
    }

    internal static double[] Multiply(double[] a, int n, double[] v)
    {
        var result = new double[n];
        for (var r = 0; r < n; r++)
        {
            var row = a.AsSpan(r * n, n);
            var sum = 0.0;
            for (var c = 0; c < n; c++)
            {
                sum += row[c] * v[c];
            }

            result[r] = sum;
        }

        return result;
    }

    /// <summary>(eigenvalue, |e_i|^2 of its unit eigenvector, the share of a mode it stands for).</summary>
    private delegate void ModeVisitor(double lambda, ReadOnlySpan<double> squares, double share);

    /// <summary>Solves the block at one wave vector by the right method for its size; reuses its buffers.</summary>
    private sealed class BlockSolver(RealSpaceOperator op, double[] real, int n)
    {
        private Complex[]? _complex;
        private Complex[]? _vectors;
        private double[]? _work;
        private double[]? _squares;

        public (double Lo, double Hi) Range(GridPoint point, CancellationToken ct)
        {
            var values = new double[n];
            if (point.IsGamma)
            {
                if (n <= SmallOrder)
                {
                    HermitianEigenSolver.Eigenvalues(real, n, values);
                }
                else
                {
                    var a = Work((long)n * n);
                    Array.Copy(real, a, (long)n * n);
                    SymmetricEigenSolver.Solve(a, n, values, null, ct);
                }

                return (values[0], values[^1]);
            }

            var h = BuildComplex(point);
            if (n <= SmallOrder)
            {
                HermitianEigenSolver.Eigenvalues(h, n, values);
                return (values[0], values[^1]);
            }

            var m = Embed(h);
            var doubled = new double[2 * n];
            SymmetricEigenSolver.Solve(m, 2 * n, doubled, null, ct);
            return (doubled[0], doubled[^1]);
        }

        /// <summary>Solves with vectors: <paramref name="range"/> first (lowest, highest eigenvalue), then every mode; values gets each eigenvalue once.</summary>
        public void Solve(GridPoint point, double[] values, Action<double, double> range, ModeVisitor visit, CancellationToken ct)
        {
            _squares ??= new double[n];
            var squares = _squares;
            if (point.IsGamma || n > SmallOrder)
            {
                var order = point.IsGamma ? n : 2 * n;
                double[] a;
                if (point.IsGamma)
                {
                    a = Work((long)n * n);
                    Array.Copy(real, a, (long)n * n);
                }
                else
                {
                    a = Embed(BuildComplex(point));
                }

                var all = new double[order];
                var share = order == n ? 1.0 : 0.5;
                var started = false;
                SymmetricEigenSolver.Solve(a, order, all, (batchValues, vectors, count) =>
                {
                    if (!started)
                    {
                        range(all[0], all[^1]);
                        started = true;
                    }

                    for (var k = 0; k < count; k++)
                    {
                        var v = vectors.Slice(k * order, order);
                        for (var i = 0; i < n; i++)
                        {
                            squares[i] = order == n ? v[i] * v[i] : (v[i] * v[i]) + (v[n + i] * v[n + i]);
                        }

                        visit(batchValues[k], squares, share);
                    }
                }, ct);

                for (var k = 0; k < n; k++)
                {
                    values[k] = order == n ? all[k] : all[2 * k];
                }

                return;
            }

            var h = BuildComplex(point);
            _vectors ??= new Complex[n * n];
            HermitianEigenSolver.EigenSystem(h, n, values, _vectors);
            range(values[0], values[^1]);
            for (var k = 0; k < n; k++)
            {
                for (var i = 0; i < n; i++)
                {
                    var v = _vectors[(i * n) + k];
                    squares[i] = (v.Real * v.Real) + (v.Imaginary * v.Imaginary);
                }

                visit(values[k], squares, 1.0);
            }
        }

        private Complex[] BuildComplex(GridPoint point)
        {
            _complex ??= new Complex[n * n];
            op.BuildComplex(op.Lattice.Crystal.Lattice.ToCartesianQ(point.Reduced), _complex);
            return _complex;
        }

        /// <summary>[[A, -B], [B, A]] for H = A + iB (symmetric, so either major order).</summary>
        private double[] Embed(Complex[] h)
        {
            var m = 2 * n;
            var a = Work((long)m * m);
            for (var i = 0; i < n; i++)
            {
                for (var j = 0; j < n; j++)
                {
                    var z = h[(i * n) + j];
                    a[(i * m) + j] = z.Real;
                    a[(i * m) + n + j] = -z.Imaginary;
                    a[((n + i) * m) + j] = z.Imaginary;
                    a[((n + i) * m) + n + j] = z.Real;
                }
            }

            return a;
        }

        private double[] Work(long length)
        {
            if (_work is null || _work.LongLength < length)
            {
                _work = new double[length];
            }

            return _work;
        }
    }
}
