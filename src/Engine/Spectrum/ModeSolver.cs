using System.Numerics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.QPoints;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>Diagonalises D(q) into eigenvalues omega^2 (rad^2/s^2, ascending) and, on request, eigenvectors. Reuses its buffers: one per thread.</summary>
internal sealed class ModeSolver
{
    private readonly DynamicalMatrix _matrix;
    private readonly Complex[] _d;

    public ModeSolver(DynamicalMatrix matrix)
    {
        _matrix = matrix;
        _d = new Complex[matrix.Size * matrix.Size];
        Values = new double[matrix.Size];
        Vectors = new Complex[matrix.Size * matrix.Size];
    }

    public int Size => _matrix.Size;

    public DynamicalMatrix Matrix => _matrix;

    /// <summary>Eigenvalues of the last solve.</summary>
    public double[] Values { get; }

    /// <summary>Eigenvectors of the last solve with vectors: column k is mode k.</summary>
    public Complex[] Vectors { get; }

    public void SolveValues(Vec3 qPerM)
    {
        _matrix.Build(qPerM, _d);
        HermitianEigenSolver.Eigenvalues(_d, Size, Values);
    }

    public void SolveWithVectors(Vec3 qPerM)
    {
        _matrix.Build(qPerM, _d);
        HermitianEigenSolver.EigenSystem(_d, Size, Values, Vectors);
    }

    /// <summary>Wave vectors built and solved together by <see cref="SolveHalfSet"/> (four groups of the batched eigen-solver at 512 bits).</summary>
    public const int BatchSize = 4 * HermitianEigenSolver.MaxBatchLanes;

    private Complex[]? _batchD;
    private double[]? _batchValues;
    private Complex[]? _batchVectors;

    /// <summary>Called for each solved point of <see cref="SolveHalfSet"/>; its results are at <paramref name="slot"/>.</summary>
    public delegate void SolvedPoint(in GridPoint point, int slot);

    /// <summary>
    /// Solves every point of the grid's half set, <see cref="BatchSize"/> at a time through the batched
    /// eigen-solver, and calls <paramref name="visit"/> for each in grid order. Inside the call,
    /// <see cref="BatchValues"/> and <see cref="BatchChannelFractions"/> give that point's results.
    /// </summary>
    public void SolveHalfSet(PeriodicGrid grid, bool withVectors, SolvedPoint visit, CancellationToken ct)
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
        var fill = 0;
        foreach (var point in grid.HalfSet())
        {
            points[fill] = point;
            q[fill] = lattice.ToCartesianQ(point.Reduced);
            if (++fill == BatchSize)
            {
                Flush(fill);
                fill = 0;
            }
        }

        if (fill > 0)
        {
            Flush(fill);
        }

        void Flush(int count)
        {
            ct.ThrowIfCancellationRequested();
            _matrix.BuildMany(q.AsSpan(0, count), _batchD.AsSpan(0, count * nn));
            HermitianEigenSolver.SolveBatch(_batchD.AsSpan(0, count * nn), n, count, _batchValues.AsSpan(0, count * n),
                withVectors ? _batchVectors.AsSpan(0, count * nn) : []);
            for (var k = 0; k < count; k++)
            {
                visit(in points[k], k);
            }
        }
    }

    /// <summary>Eigenvalues (ascending) of the point at <paramref name="slot"/> of the current batch.</summary>
    public ReadOnlySpan<double> BatchValues(int slot) => _batchValues.AsSpan(slot * Size, Size);

    /// <summary>|e_c|^2 of mode k of the point at <paramref name="slot"/>, for every channel c; sums to 1.</summary>
    public void BatchChannelFractions(int slot, int mode, Span<double> fractions)
    {
        var n = Size;
        var vectors = _batchVectors.AsSpan(slot * n * n, n * n);
        for (var c = 0; c < n; c++)
        {
            var v = vectors[c * n + mode];
            fractions[c] = v.Real * v.Real + v.Imaginary * v.Imaginary;
        }
    }

    /// <summary>|e_{c}|^2 of mode k for every component channel c (site x direction); sums to 1.</summary>
    public void ChannelFractions(int mode, Span<double> fractions)
    {
        var n = Size;
        for (var c = 0; c < n; c++)
        {
            var v = Vectors[c * n + mode];
            fractions[c] = v.Real * v.Real + v.Imaginary * v.Imaginary;
        }
    }

    /// <summary>Signed frequency in THz of an eigenvalue: -sqrt(|lambda|) marks an unstable mode.</summary>
    public static double SignedThz(double lambda) =>
        Math.Sign(lambda) * Math.Sqrt(Math.Abs(lambda)) / (2.0 * Math.PI) / 1e12;
}
