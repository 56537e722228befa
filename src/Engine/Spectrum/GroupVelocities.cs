using System.Numerics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// Group velocities v = d omega / dq = e^H (dD/dq) e / (2 omega) (Hellmann-Feynman). Inside a
/// degenerate set of branches the eigenvectors are first rotated to diagonalise dD/dq along a
/// chosen direction (the path direction on a dispersion path), so each branch gets the velocity
/// of the branch that continues it along that direction (degenerate perturbation theory;
/// common practice, no source). A mode of zero frequency gets velocity zero, never NaN. On request it also
/// gives each branch's squared velocity in the basis-independent form (<see cref="Solve(Vec3, Vec3, Span{double}, Span{double})"/>).
/// </summary>
internal sealed class GroupVelocities
{
    private readonly ModeSolver _solver;
    private readonly Complex[][] _derivatives;
    private readonly int[] _setStart;
    private readonly int[] _setEnd;

    public GroupVelocities(ModeSolver solver)
    {
        _solver = solver;
        var n2 = solver.Size * solver.Size;
        _derivatives = [new Complex[n2], new Complex[n2], new Complex[n2]];
        _setStart = new int[solver.Size];
        _setEnd = new int[solver.Size];
    }

    /// <summary>Whether branch k shared its frequency with another branch at the last solve.</summary>
    public bool IsDegenerate(int k) => _setEnd[k] - _setStart[k] > 1;

    /// <summary>
    /// Solves at q and fills velocities[k * 3 + alpha] (m/s) for every branch k. Frequencies are in
    /// <see cref="ModeSolver.Values"/> afterwards.
    /// </summary>
    public void Solve(Vec3 qPerM, Vec3 preferredDirection, Span<double> velocities) => Solve(qPerM, preferredDirection, velocities, []);

    /// <summary>
    /// As above, and, when <paramref name="squares"/> is not empty, fills squares[k * 3 + alpha] with (V_alpha^2)_kk =
    /// sum over the branches l of k's degenerate set of |V_alpha,kl|^2, V_alpha,kl = e_k^H (dD/dq_alpha) e_l /
    /// (omega_k + omega_l), the velocity matrix of the harmonic heat current (Hardy, Phys. Rev. 132, 168 (1963)).
    /// Its sum over a set is Tr_S(V_alpha^2), the same in any basis of the set; a branch alone gets v_alpha^2.
    /// </summary>
    public void Solve(Vec3 qPerM, Vec3 preferredDirection, Span<double> velocities, Span<double> squares)
    {
        var n = _solver.Size;
        _solver.SolveWithVectors(qPerM);
        var values = _solver.Values;
        var vectors = _solver.Vectors;
        var dimension = _solver.Matrix.Crystal.Lattice.Dimension;
        // dD/dq where the solve was (a valley's shifted solver solves D(origin + q)).
        var at = _solver.Absolute(qPerM);
        _solver.Matrix.BuildDerivative(at, new Vec3(1, 0, 0), _derivatives[0]);
        _solver.Matrix.BuildDerivative(at, new Vec3(0, 1, 0), _derivatives[1]);
        _solver.Matrix.BuildDerivative(at, new Vec3(0, 0, 1), _derivatives[2]);

        var scale = Math.Max(Math.Abs(values[n - 1]), Math.Abs(values[0]));
        var dir = preferredDirection.Length > 0 ? preferredDirection.Unit() : new Vec3(0.5345225, 0.2672612, 0.8017837);
        var start = 0;
        while (start < n)
        {
            var end = start + 1;
            while (end < n && Math.Abs(Math.Sqrt(Math.Abs(values[end])) - Math.Sqrt(Math.Abs(values[start]))) <= 1e-6 * Math.Sqrt(scale))
            {
                end++;
            }

            if (end - start > 1)
            {
                RotateDegenerateSet(vectors, n, start, end - start, dir);
            }

            for (var k = start; k < end; k++)
            {
                _setStart[k] = start;
                _setEnd[k] = end;
            }

            start = end;
        }

        for (var k = 0; k < n; k++)
        {
            var omega = Math.Sqrt(Math.Max(values[k], 0));
            for (var a = 0; a < 3; a++)
            {
                velocities[k * 3 + a] = omega <= 1e-9 * Math.Sqrt(scale) || a >= dimension
                    ? 0.0
                    : Expectation(_derivatives[a], vectors, n, k, k).Real / (2.0 * omega);
            }
        }

        if (!squares.IsEmpty)
        {
            FillSquares(values, vectors, n, dimension, 1e-9 * Math.Sqrt(scale), velocities, squares);
        }
    }

    private void FillSquares(double[] values, Complex[] vectors, int n, int dimension, double zero, ReadOnlySpan<double> velocities, Span<double> squares)
    {
        for (var k = 0; k < n; k++)
        {
            var omegaK = Math.Sqrt(Math.Max(values[k], 0));
            for (var a = 0; a < 3; a++)
            {
                var v = velocities[k * 3 + a];
                var square = v * v;
                if (IsDegenerate(k) && omegaK > zero && a < dimension)
                {
                    // The off-diagonal elements inside the set: they do not oscillate in time and carry heat like the diagonal ones.
                    for (var l = _setStart[k]; l < _setEnd[k]; l++)
                    {
                        var omegaL = Math.Sqrt(Math.Max(values[l], 0));
                        if (l != k && omegaL > zero)
                        {
                            var element = Expectation(_derivatives[a], vectors, n, k, l) / (omegaK + omegaL);
                            square += (element.Real * element.Real) + (element.Imaginary * element.Imaginary);
                        }
                    }
                }

                squares[k * 3 + a] = square;
            }
        }
    }

    private void RotateDegenerateSet(Complex[] vectors, int n, int first, int count, Vec3 dir)
    {
        // M = P^H (dD . dir) P, diagonalised; new vectors P U.
        Span<Complex> m = stackalloc Complex[count * count];
        for (var a = 0; a < count; a++)
        {
            for (var b = 0; b < count; b++)
            {
                var sum = Complex.Zero;
                for (var axis = 0; axis < 3; axis++)
                {
                    var w = dir[axis];
                    if (w != 0)
                    {
                        sum += w * Expectation(_derivatives[axis], vectors, n, first + a, first + b);
                    }
                }

                m[a * count + b] = sum;
            }
        }

        // M is Hermitian in exact arithmetic; where it cancels to round-off (q = 0, inversion
        // symmetry) the residue is not, so average it with its conjugate transpose first.
        DynamicalMatrix.MakeHermitian(m, count);

        Span<double> values = stackalloc double[count];
        Span<Complex> u = stackalloc Complex[count * count];
        HermitianEigenSolver.EigenSystem(m, count, values, u);
        Span<Complex> rotated = stackalloc Complex[count];
        for (var row = 0; row < n; row++)
        {
            for (var b = 0; b < count; b++)
            {
                var sum = Complex.Zero;
                for (var a = 0; a < count; a++)
                {
                    sum += vectors[row * n + first + a] * u[a * count + b];
                }

                rotated[b] = sum;
            }

            for (var b = 0; b < count; b++)
            {
                vectors[row * n + first + b] = rotated[b];
            }
        }
    }

    /// <summary>e_k^H A e_l for columns k, l of the eigenvector matrix.</summary>
    private static Complex Expectation(Complex[] a, Complex[] vectors, int n, int k, int l)
    {
        var sum = Complex.Zero;
        for (var i = 0; i < n; i++)
        {
            var row = Complex.Zero;
            for (var j = 0; j < n; j++)
            {
                row += a[i * n + j] * vectors[j * n + l];
            }

            sum += Complex.Conjugate(vectors[i * n + k]) * row;
        }

        return sum;
    }
}
