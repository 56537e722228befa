namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Eigenvectors of an unreduced real symmetric tridiagonal matrix for known eigenvalues, by inverse
/// iteration: solve (T - lambda I) x = b with Gaussian elimination and partial pivoting a few times,
/// O(m) per solve (LAPACK's dstein/dlagtf/dlagts, Wilkinson's method, from memory). Vectors of
/// eigenvalues closer than <see cref="ClusterGap"/> x ||T|| to each other are orthogonalised against the
/// earlier members of their cluster after each solve (modified Gram-Schmidt); all others are orthogonal
/// to about eps ||T|| / gap, below 1e-8 for the gaps that are not clustered.
/// </summary>
internal sealed class TridiagonalInverseIteration
{
    /// <summary>Relative gap below which eigenvalues form a cluster whose vectors are orthogonalised together.</summary>
    public const double ClusterGap = 1e-7;

    private const int Iterations = 4;
    private const double Epsilon = 1.0 / (1L << 52);

    private readonly double[] _d;
    private readonly double[] _e;
    private readonly int _m;
    private readonly double _norm;

    // LU factors of T - lambda I: diagonal of U, first and second super-diagonals, multipliers, pivots.
    private readonly double[] _u0;
    private readonly double[] _u1;
    private readonly double[] _u2;
    private readonly double[] _l;
    private readonly bool[] _swap;
    private readonly double[] _x;

    /// <param name="d">Diagonal (m).</param>
    /// <param name="e">Off-diagonal (m - 1), none of them negligible.</param>
    public TridiagonalInverseIteration(ReadOnlySpan<double> d, ReadOnlySpan<double> e)
    {
        _m = d.Length;
        _d = d.ToArray();
        _e = e[..Math.Max(0, _m - 1)].ToArray();
        var norm = 0.0;
        for (var i = 0; i < _m; i++)
        {
            norm = Math.Max(norm, Math.Abs(_d[i]) + (i > 0 ? Math.Abs(_e[i - 1]) : 0) + (i < _m - 1 ? Math.Abs(_e[i]) : 0));
        }

        _norm = norm == 0 ? 1.0 : norm;
        _u0 = new double[_m];
        _u1 = new double[_m];
        _u2 = new double[_m];
        _l = new double[_m];
        _swap = new bool[_m];
        _x = new double[_m];
    }

    /// <summary>Largest |T| row sum (the scale of the cluster and pivot thresholds).</summary>
    public double Norm => _norm;

    /// <summary>True when <paramref name="upper"/> and <paramref name="lower"/> (ascending neighbours) belong to one cluster.</summary>
    public bool SameCluster(double lower, double upper) => upper - lower <= ClusterGap * _norm;

    /// <summary>
    /// Writes the unit eigenvector of eigenvalue <paramref name="lambda"/> to <paramref name="vector"/> (m),
    /// orthogonal to the <paramref name="clusterBefore"/> vectors (each of length m) of its cluster.
    /// Returns the shifted eigenvalue actually used, which the next member of a cluster must exceed.
    /// </summary>
    public double Solve(double lambda, double previousShift, ReadOnlySpan<double> clusterBefore, int clusterCount, int stride, Span<double> vector, ulong seed)
    {
        // Equal shifts would give equal vectors: nudge each cluster member above the one before.
        var separation = 10.0 * Epsilon * _norm;
        var shift = clusterCount > 0 && lambda - previousShift < separation ? previousShift + separation : lambda;
        Factor(shift);
        var x = _x.AsSpan();
        var state = seed * 0x9E3779B97F4A7C15UL + 0x632BE59BD9B4E019UL;
        for (var i = 0; i < _m; i++)
        {
            x[i] = NextUniform(ref state);
        }

        for (var iteration = 0; iteration < Iterations; iteration++)
        {
            SolveFactored(x);
            for (var c = 0; c < clusterCount; c++)
            {
                var other = clusterBefore.Slice(c * stride, _m);
                var dot = 0.0;
                for (var i = 0; i < _m; i++)
                {
                    dot += other[i] * x[i];
                }

                for (var i = 0; i < _m; i++)
                {
                    x[i] -= dot * other[i];
                }
            }

            Normalise(x);
        }

        x.CopyTo(vector);
        return shift;
    }

    /// <summary>Gaussian elimination with partial pivoting of T - shift I (LAPACK's dlagtf).</summary>
    private void Factor(double shift)
    {
        var m = _m;
        for (var i = 0; i < m; i++)
        {
            _u0[i] = _d[i] - shift;
            _u1[i] = i < m - 1 ? _e[i] : 0.0;
            _u2[i] = 0.0;
            _l[i] = 0.0;
            _swap[i] = false;
        }

        for (var k = 0; k < m - 1; k++)
        {
            var sub = _e[k];
            if (Math.Abs(_u0[k]) >= Math.Abs(sub))
            {
                var mult = _u0[k] == 0.0 ? 0.0 : sub / _u0[k];
                _l[k] = mult;
                _u0[k + 1] -= mult * _u1[k];
            }
            else
            {
                // Rows k and k + 1 swap: row k becomes (sub, u0[k+1], u1[k+1]).
                var mult = _u0[k] / sub;
                _l[k] = mult;
                _swap[k] = true;
                var oldDiag = _u0[k + 1];
                var oldSuper = _u1[k];
                _u0[k] = sub;
                _u1[k] = oldDiag;
                _u2[k] = k < m - 2 ? _u1[k + 1] : 0.0;
                _u0[k + 1] = oldSuper - (mult * oldDiag);
                if (k < m - 2)
                {
                    _u1[k + 1] = -mult * _u2[k];
                }
            }
        }
    }

    /// <summary>Solves (T - shift I) x = b in place; pivots below eps ||T|| are replaced by it (the shift is an eigenvalue).</summary>
    private void SolveFactored(Span<double> x)
    {
        var m = _m;
        for (var k = 0; k < m - 1; k++)
        {
            if (_swap[k])
            {
                (x[k], x[k + 1]) = (x[k + 1], x[k]);
            }

            x[k + 1] -= _l[k] * x[k];
        }

        var tiny = Epsilon * _norm;
        for (var k = m - 1; k >= 0; k--)
        {
            var r = x[k];
            if (k + 1 < m)
            {
                r -= _u1[k] * x[k + 1];
            }

            if (k + 2 < m)
            {
                r -= _u2[k] * x[k + 2];
            }

            var pivot = _u0[k];
            if (Math.Abs(pivot) < tiny)
            {
                pivot = pivot < 0 ? -tiny : tiny;
            }

            x[k] = r / pivot;

            // Growth by 1/eps per tiny pivot could overflow a long chain: rescale what is solved and what is left.
            if (Math.Abs(x[k]) > 1e150)
            {
                var s = 1.0 / Math.Abs(x[k]);
                for (var i = 0; i < m; i++)
                {
                    x[i] *= s;
                }
            }
        }
    }

    private static void Normalise(Span<double> x)
    {
        var big = 0.0;
        foreach (var v in x)
        {
            big = Math.Max(big, Math.Abs(v));
        }

        if (big == 0)
        {
            x[0] = 1.0;
            return;
        }

        var sum = 0.0;
        for (var i = 0; i < x.Length; i++)
        {
            x[i] /= big;
            sum += x[i] * x[i];
        }

        var s = 1.0 / Math.Sqrt(sum);
        for (var i = 0; i < x.Length; i++)
        {
            x[i] *= s;
        }
    }

    /// <summary>Uniform in [-1, 1) from a SplitMix64 step: the start vectors are the same on every run.</summary>
    private static double NextUniform(ref ulong state)
    {
        state += 0x9E3779B97F4A7C15UL;
        var z = state;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        z ^= z >> 31;
        return ((z >> 11) * (1.0 / (1UL << 53)) * 2.0) - 1.0;
    }
}
