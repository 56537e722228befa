using System.Numerics;
using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.QPoints;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>Diagonalises D(q) into eigenvalues omega^2 (rad^2/s^2, ascending) and, on request, eigenvectors. Reuses its buffers: one per thread.</summary>
internal sealed class ModeSolver
{
    private readonly DynamicalMatrix _matrix;
    private readonly Complex[] _d;

    private readonly Vec3 _origin;
    private readonly bool _shifted;

    public ModeSolver(DynamicalMatrix matrix)
    {
        _matrix = matrix;
        _d = new Complex[matrix.Size * matrix.Size];
        Values = new double[matrix.Size];
        Vectors = new Complex[matrix.Size * matrix.Size];
    }

    /// <summary>
    /// A solver whose wave vectors are taken from <paramref name="originPerM"/>: every solve (one at a time or listed) is of
    /// D(origin + q). Why: a branch that reaches zero away from q = 0 (a sheet's zone-corner valley) gets the same long-wave rays
    /// as q = 0 (<see cref="Dos.ZeroValleys"/>), which measure their branches from q = 0 of the solver they are given.
    /// </summary>
    public ModeSolver(DynamicalMatrix matrix, Vec3 originPerM)
        : this(matrix)
    {
        _origin = originPerM;
        _shifted = true;
    }

    /// <summary>The origin of the wave vectors (zero but for a valley's solver).</summary>
    public Vec3 OriginPerM => _origin;

    // The unshifted solver passes q on untouched, so ordinary solves keep their bits (even the sign of a zero).
    private Vec3 Shift(Vec3 qPerM) => _shifted ? qPerM + _origin : qPerM;

    /// <summary>The wave vector a solve at <paramref name="qPerM"/> is of (origin + q; q itself for the unshifted solver).</summary>
    public Vec3 Absolute(Vec3 qPerM) => Shift(qPerM);

    public int Size => _matrix.Size;

    public DynamicalMatrix Matrix => _matrix;

    /// <summary>Eigenvalues of the last solve.</summary>
    public double[] Values { get; }

    /// <summary>Eigenvectors of the last solve with vectors: column k is mode k.</summary>
    public Complex[] Vectors { get; }

    public void SolveValues(Vec3 qPerM)
    {
        _matrix.Build(Shift(qPerM), _d);
        HermitianEigenSolver.Eigenvalues(_d, Size, Values);
    }

    public void SolveWithVectors(Vec3 qPerM)
    {
        _matrix.Build(Shift(qPerM), _d);
        HermitianEigenSolver.EigenSystem(_d, Size, Values, Vectors);
    }

    /// <summary>Wave vectors built and solved together by <see cref="SolveHalfSet"/> (four groups of the batched eigen-solver at 512 bits).</summary>
    public const int BatchSize = 4 * HermitianEigenSolver.MaxBatchLanes;

    private Complex[]? _batchD;
    private double[]? _batchValues;
    private Complex[]? _batchVectors;

    /// <summary>Called for each solved point of <see cref="SolveHalfSet"/>; its results are at <paramref name="slot"/>.</summary>
    public delegate void SolvedPoint(in GridPoint point, int slot);

    /// <summary>Called for each solved batch of <see cref="SolveHalfSet"/>: point k's results are at slot k.</summary>
    public delegate void SolvedBatch(ReadOnlySpan<GridPoint> points);

    /// <summary>
    /// Solves every point of the grid's half set, <see cref="BatchSize"/> at a time through the batched
    /// eigen-solver, and calls <paramref name="visit"/> for each in grid order. Inside the call,
    /// <see cref="BatchValues"/> and <see cref="BatchChannelFractions"/> give that point's results.
    /// </summary>
    public void SolveHalfSet(PeriodicGrid grid, bool withVectors, SolvedPoint visit, CancellationToken ct) =>
        SolveHalfSet(grid, withVectors, points =>
        {
            for (var k = 0; k < points.Length; k++)
            {
                visit(in points[k], k);
            }
        }, ct);

    /// <summary>
    /// As above, one call per batch of up to <see cref="BatchSize"/> points (in grid order), so a
    /// caller with little work per point (a chain's one mode) pays no call per point.
    /// </summary>
    public void SolveHalfSet(PeriodicGrid grid, bool withVectors, SolvedBatch visit, CancellationToken ct)
    {
        var n = Size;
        var nn = n * n;
        _batchD ??= new Complex[BatchSize * nn];
        _batchValues ??= new double[BatchSize * n];
        if (withVectors)
        {
            _batchVectors ??= new Complex[BatchSize * nn];
        }

        var points = new GridPoint[BatchSize];
        var q = new Vec3[BatchSize];
        var lattice = _matrix.Crystal.Lattice;
        var cursor = default(HalfSetCursor);
        int count;
        while ((count = grid.FillHalfSet(ref cursor, points)) > 0)
        {
            ct.ThrowIfCancellationRequested();
            for (var k = 0; k < count; k++)
            {
                q[k] = Shift(lattice.ToCartesianQ(points[k].Reduced));
            }

            _matrix.BuildMany(q.AsSpan(0, count), _batchD.AsSpan(0, count * nn));
            HermitianEigenSolver.SolveBatch(_batchD.AsSpan(0, count * nn), n, count, _batchValues.AsSpan(0, count * n),
                withVectors ? _batchVectors.AsSpan(0, count * nn) : []);
            visit(points.AsSpan(0, count));
        }
    }

    /// <summary>Called for each wave vector of <see cref="SolveList"/>; its results are at <paramref name="slot"/>.</summary>
    public delegate void SolvedVector(int index, int slot);

    /// <summary>
    /// Solves D(q) at every wave vector of a list (Cartesian, 1/m), <see cref="BatchSize"/> at a time
    /// through the batched eigen-solver, and calls <paramref name="visit"/> for each in list order with
    /// its results at the slot (<see cref="BatchValues"/>, <see cref="BatchChannelFractions"/>).
    /// </summary>
    public void SolveList(IReadOnlyList<Vec3> qPerM, bool withVectors, SolvedVector visit)
    {
        var n = Size;
        var nn = n * n;
        _batchD ??= new Complex[BatchSize * nn];
        _batchValues ??= new double[BatchSize * n];
        if (withVectors)
        {
            _batchVectors ??= new Complex[BatchSize * nn];
        }

        for (var first = 0; first < qPerM.Count; first += BatchSize)
        {
            var count = Math.Min(BatchSize, qPerM.Count - first);
            for (var k = 0; k < count; k++)
            {
                _matrix.Build(Shift(qPerM[first + k]), _batchD.AsSpan(k * nn, nn));
            }

            HermitianEigenSolver.SolveBatch(_batchD.AsSpan(0, count * nn), n, count, _batchValues.AsSpan(0, count * n),
                withVectors ? _batchVectors.AsSpan(0, count * nn) : []);
            for (var k = 0; k < count; k++)
            {
                visit(first + k, k);
            }
        }
    }

    /// <summary>Eigenvalues (ascending) of the point at <paramref name="slot"/> of the current batch.</summary>
    public ReadOnlySpan<double> BatchValues(int slot) => _batchValues.AsSpan(slot * Size, Size);

    /// <summary>Eigenvalues of the first <paramref name="count"/> points of the current batch, point after point.</summary>
    public ReadOnlySpan<double> BatchValues(int first, int count) => _batchValues.AsSpan(first * Size, count * Size);

    /// <summary>|e_c|^2 of mode k of the point at <paramref name="slot"/>, for every channel c; sums to 1.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    public void BatchChannelFractions(int slot, int mode, Span<double> fractions)
    {
        var n = Size;
        var vectors = _batchVectors.AsSpan(slot * n * n, n * n);
        for (var c = 0; c < n; c++)
        {
            var v = vectors[c * n + mode];
            fractions[c] = ComplexParts.Re(v) * ComplexParts.Re(v) + ComplexParts.Im(v) * ComplexParts.Im(v);
        }
    }

    /// <summary>|e_{c}|^2 of mode k for every component channel c (site x direction); sums to 1.</summary>
    public void ChannelFractions(int mode, Span<double> fractions)
    {
        var n = Size;
        for (var c = 0; c < n; c++)
        {
            var v = Vectors[c * n + mode];
            fractions[c] = ComplexParts.Re(v) * ComplexParts.Re(v) + ComplexParts.Im(v) * ComplexParts.Im(v);
        }
    }

    /// <summary>Signed frequency in THz of an eigenvalue: -sqrt(|lambda|) marks an unstable mode.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)] // per mode in BulkSolver's per-point callback
    public static double SignedThz(double lambda) =>
        SignOf.Value(lambda) * Math.Sqrt(Math.Abs(lambda)) / (2.0 * Math.PI) / 1e12;
}
