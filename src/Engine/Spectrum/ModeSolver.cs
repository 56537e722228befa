using System.Numerics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;

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
