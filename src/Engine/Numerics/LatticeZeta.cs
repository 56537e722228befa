namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// The lattice (Epstein) zeta function Z(s) = sum over the lattice's nonzero vectors x of |x|^-s, continued analytically,
/// at the two points a plain mesh sum of a cone and of a logarithm needs: Z(-1) and Z'(0).
/// <para>
/// Why: for a function singular only at q = 0, homogeneous of degree alpha there (|q|, or ln |q| as the derivative at
/// alpha = 0), the plain sum over a mesh lattice L with the q = 0 term left out differs from (1 / cell volume) times its
/// integral by Z_L(-alpha) plus terms of higher order (the generalised Euler-Maclaurin formula for lattice sums; common
/// practice, from memory). So the value the q = 0 point must carry is -Z_L(-1) |q|'s coefficient for a cone, and Z_L'(0)
/// for ln |q|. Checked: a chain's Z(-1) = 2 zeta(-1) = -1/6 and Z'(0) = 2 zeta'(0) = -ln 2 pi (Riemann zeta; Abramowitz
/// and Stegun 23.2), and in tests against NumPy sums of periodic cones (docs/coarse-mesh-check/gamma_cell_sums.py).
/// </para>
/// <para>
/// Evaluated by Ewald's split of the theta function at t = 1 for the lattice scaled to unit cell volume, with Poisson
/// summation over the dual lattice (common practice, from memory):
/// pi^(-s/2) Gamma(s/2) Z(s) = sum_x Gamma(s/2, pi x^2) (pi x^2)^(-s/2) + sum_y Gamma((d-s)/2, pi y^2) (pi y^2)^((s-d)/2)
/// + 2 / (s - d) - 2 / s, both sums over nonzero vectors, y of the dual lattice (x . y integer); terms beyond
/// pi x^2 = 50 are below 1e-20.
/// </para>
/// </summary>
internal static class LatticeZeta
{
    private const double EulerGamma = 0.57721566490153286;
    private const double CutoffRadius = 4.0; // pi r^2 = 50

    /// <summary>Z(-1) and Z'(0) of the lattice whose basis has the Gram matrix <paramref name="gram"/> (d x d, row-major, d = 1..3).</summary>
    public static (double AtMinusOne, double SlopeAtZero) Of(double[,] gram)
    {
        var d = gram.GetLength(0);
        var volume = Math.Sqrt(Determinant(gram));
        if (!(volume > 0))
        {
            throw new ArgumentException("the lattice basis is degenerate", nameof(gram));
        }

        // Scaled to unit cell volume: Z_{lambda L}(s) = lambda^-s Z_L(s).
        var scale = Math.Pow(volume, 1.0 / d);
        var unit = new double[d, d];
        for (var i = 0; i < d; i++)
        {
            for (var j = 0; j < d; j++)
            {
                unit[i, j] = gram[i, j] / (scale * scale);
            }
        }

        var dual = Inverse(unit);
        var direct = SquaredLengths(unit, dual);
        var reciprocal = SquaredLengths(dual, unit);

        // s = -1: pi^(1/2) Gamma(-1/2) = -2 pi.
        var atMinusOne = (2.0 / (-1 - d)) + 2.0;
        foreach (var r in direct)
        {
            atMinusOne += Math.Sqrt(Math.PI * r) * UpperGamma(-0.5, Math.PI * r);
        }

        foreach (var r in reciprocal)
        {
            atMinusOne += Math.Pow(Math.PI * r, -(d + 1) / 2.0) * UpperGamma((d + 1) / 2.0, Math.PI * r);
        }

        // s = 0: Z(0) = -1, and 2 Z'(0) + gamma + ln pi equals the sums' value.
        var twiceSlope = (-2.0 / d) - EulerGamma - Math.Log(Math.PI);
        foreach (var r in direct)
        {
            twiceSlope += UpperGamma(0, Math.PI * r);
        }

        foreach (var r in reciprocal)
        {
            twiceSlope += Math.Pow(Math.PI * r, -d / 2.0) * UpperGamma(d / 2.0, Math.PI * r);
        }

        return (scale * atMinusOne / (-2 * Math.PI), Math.Log(scale) + (twiceSlope / 2));
    }

    /// <summary>Z(-3) of the lattice with Gram matrix <paramref name="gram"/>: the |q|^3 term of a cone's dispersion needs it (pi^(3/2) Gamma(-3/2) = 4 pi^2 / 3).</summary>
    public static double AtMinusThree(double[,] gram)
    {
        var d = gram.GetLength(0);
        var scale = Math.Pow(Math.Sqrt(Determinant(gram)), 1.0 / d);
        var unit = new double[d, d];
        for (var i = 0; i < d; i++)
        {
            for (var j = 0; j < d; j++)
            {
                unit[i, j] = gram[i, j] / (scale * scale);
            }
        }

        var dual = Inverse(unit);
        var value = (2.0 / (-3 - d)) + (2.0 / 3);
        foreach (var r in SquaredLengths(unit, dual))
        {
            value += Math.Pow(Math.PI * r, 1.5) * UpperGamma(-1.5, Math.PI * r);
        }

        foreach (var r in SquaredLengths(dual, unit))
        {
            value += Math.Pow(Math.PI * r, -(d + 3) / 2.0) * UpperGamma((d + 3) / 2.0, Math.PI * r);
        }

        return Math.Pow(scale, 3) * value / (4 * Math.PI * Math.PI / 3);
    }

    /// <summary>Squared lengths (up to the cutoff) of the nonzero vectors n of the lattice with Gram matrix g; the dual's Gram bounds each |n_i|.</summary>
    private static List<double> SquaredLengths(double[,] g, double[,] dual) => [.. Vectors(g, dual).Select(v => v.SquaredLength)];

    /// <summary>The nonzero lattice vectors n (integer coordinates) up to the cutoff, with their squared lengths.</summary>
    private static IEnumerable<(int[] N, double SquaredLength)> Vectors(double[,] g, double[,] dual)
    {
        var d = g.GetLength(0);
        var range = new int[3];
        for (var i = 0; i < d; i++)
        {
            range[i] = (int)Math.Ceiling(CutoffRadius * Math.Sqrt(dual[i, i]));
        }

        for (var n0 = -range[0]; n0 <= range[0]; n0++)
        {
            for (var n1 = -range[1]; n1 <= range[1]; n1++)
            {
                for (var n2 = -range[2]; n2 <= range[2]; n2++)
                {
                    if (n0 == 0 && n1 == 0 && n2 == 0)
                    {
                        continue;
                    }

                    int[] n = [n0, n1, n2];
                    var r = 0.0;
                    for (var i = 0; i < d; i++)
                    {
                        for (var j = 0; j < d; j++)
                        {
                            r += n[i] * g[i, j] * n[j];
                        }
                    }

                    if (r <= CutoffRadius * CutoffRadius)
                    {
                        yield return (n, r);
                    }
                }
            }
        }
    }

    /// <summary>
    /// Z_P(s) at each given s: the sum over the nonzero vectors x of the lattice with basis rows <paramref name="basis"/> (d x d, Cartesian) of
    /// P(x) |x|^-2s, for P a harmonic polynomial of even degree l >= 2 and s not zero or a negative whole number (<paramref name="harmonic"/>, given Cartesian
    /// coordinates), continued analytically. Hecke's identity (the Fourier transform of P(x) e^(-pi x^2) is (-i)^l P(y)
    /// e^(-pi y^2); common practice, from memory) turns Ewald's split into: pi^-s Gamma(s) Z_P(s) = sum_x P(x) (pi x^2)^-s
    /// Gamma(s, pi x^2) + (-1)^(l/2) sum_y P(y) (pi y^2)^(s - d/2 - l) Gamma(d/2 + l - s, pi y^2), at unit cell volume
    /// (Z_P of lambda L is lambda^(l - 2 s) times L's). No constant terms: P(0) = 0 and P averages to zero on a sphere.
    /// </summary>
    public static double[] HarmonicSum(double[,] basis, Func<double[], double> harmonic, int degree, params double[] s)
    {
        var d = basis.GetLength(0);
        var gram = new double[d, d];
        for (var i = 0; i < d; i++)
        {
            for (var j = 0; j < d; j++)
            {
                for (var k = 0; k < d; k++)
                {
                    gram[i, j] += basis[i, k] * basis[j, k];
                }
            }
        }

        var scale = Math.Pow(Math.Sqrt(Determinant(gram)), 1.0 / d);
        var unitBasis = new double[d, d];
        var unitGram = new double[d, d];
        for (var i = 0; i < d; i++)
        {
            for (var j = 0; j < d; j++)
            {
                unitBasis[i, j] = basis[i, j] / scale;
                unitGram[i, j] = gram[i, j] / (scale * scale);
            }
        }

        // The dual basis (x_i . y_j = delta_ij): the rows of the inverse transpose.
        var inverse = Inverse(unitBasis);
        var dualBasis = new double[d, d];
        for (var i = 0; i < d; i++)
        {
            for (var j = 0; j < d; j++)
            {
                dualBasis[i, j] = inverse[j, i];
            }
        }

        var dualGram = Inverse(unitGram);
        var sums = new double[s.Length];
        foreach (var (n, r) in Vectors(unitGram, dualGram))
        {
            var p = harmonic(Cartesian(unitBasis, n));
            for (var k = 0; k < s.Length; k++)
            {
                sums[k] += p * Math.Pow(Math.PI * r, -s[k]) * UpperGamma(s[k], Math.PI * r);
            }
        }

        var sign = (degree / 2) % 2 == 0 ? 1.0 : -1.0;
        foreach (var (n, r) in Vectors(dualGram, unitGram))
        {
            var p = sign * harmonic(Cartesian(dualBasis, n));
            for (var k = 0; k < s.Length; k++)
            {
                sums[k] += p * Math.Pow(Math.PI * r, s[k] - (d / 2.0) - degree) * UpperGamma((d / 2.0) + degree - s[k], Math.PI * r);
            }
        }

        for (var k = 0; k < s.Length; k++)
        {
            sums[k] *= Math.Pow(scale, degree - (2 * s[k])) * Math.Pow(Math.PI, s[k]) / CompleteGamma(s[k]);
        }

        return sums;
    }

    private static double[] Cartesian(double[,] basis, int[] n)
    {
        var d = basis.GetLength(0);
        var x = new double[d];
        for (var i = 0; i < d; i++)
        {
            for (var k = 0; k < d; k++)
            {
                x[k] += n[i] * basis[i, k];
            }
        }

        return x;
    }

    /// <summary>
    /// The upper incomplete gamma function Gamma(a, u) for a multiple of 1/2, and u > 0: the series of the
    /// lower one below u = 1 + a, a continued fraction above (Press et al., Numerical Recipes, 3rd ed., section 6.2);
    /// a = 0 below 1 by the series of E1 (Abramowitz and Stegun 5.1.11), negative a by the recurrence
    /// Gamma(a + 1, u) = a Gamma(a, u) + u^a e^-u (A and S 6.5.22).
    /// </summary>
    public static double UpperGamma(double a, double u)
    {
        if (a < 0)
        {
            // Gamma(a, u) = (Gamma(a + 1, u) - u^a e^-u) / a.
            return (UpperGamma(a + 1, u) - Math.Exp(-u + (a * Math.Log(u)))) / a;
        }

        if (u < 1 + a)
        {
            if (a == 0)
            {
                var sum = -EulerGamma - Math.Log(u);
                var term = 1.0;
                for (var k = 1; k < 100; k++)
                {
                    term *= -u / k;
                    sum -= term / k;
                    if (Math.Abs(term) < 1e-18)
                    {
                        break;
                    }
                }

                return sum;
            }

            // gamma(a, u) = e^-u u^a sum_k u^k / (a (a + 1) ... (a + k)).
            var t = 1.0 / a;
            var lower = t;
            for (var k = 1; k < 200; k++)
            {
                t *= u / (a + k);
                lower += t;
                if (t < 1e-18 * lower)
                {
                    break;
                }
            }

            return CompleteGamma(a) - (lower * Math.Exp(-u + (a * Math.Log(u))));
        }

        // Modified Lentz's method.
        const double tiny = 1e-300;
        var b = u + 1 - a;
        var c = 1 / tiny;
        var dd = 1 / b;
        var h = dd;
        for (var i = 1; i < 300; i++)
        {
            var an = -i * (i - a);
            b += 2;
            dd = (an * dd) + b;
            dd = Math.Abs(dd) < tiny ? tiny : dd;
            c = b + (an / c);
            c = Math.Abs(c) < tiny ? tiny : c;
            dd = 1 / dd;
            var delta = dd * c;
            h *= delta;
            if (Math.Abs(delta - 1) < 1e-16)
            {
                break;
            }
        }

        return Math.Exp(-u + (a * Math.Log(u))) * h;
    }

    /// <summary>Gamma(a) for a multiple of 1/2 (negative ones not whole), from Gamma(1/2) = sqrt(pi) and Gamma(1) = 1 by Gamma(a + 1) = a Gamma(a).</summary>
    private static double CompleteGamma(double a)
    {
        if (a < 0 && Math.Abs(a - Math.Round(a)) > 1e-12)
        {
            return CompleteGamma(a + 1) / a;
        }

        if (!(a > 0) || Math.Abs((2 * a) - Math.Round(2 * a)) > 1e-12)
        {
            throw new ArgumentOutOfRangeException(nameof(a), a, "only multiples of 1/2 that are not zero or negative whole numbers");
        }

        var value = Math.Abs(a - Math.Round(a)) < 1e-12 ? 1.0 : Math.Sqrt(Math.PI);
        for (var x = Math.Abs(a - Math.Round(a)) < 1e-12 ? 1.0 : 0.5; x < a - 1e-12; x++)
        {
            value *= x;
        }

        return value;
    }

    private static double Determinant(double[,] m) => m.GetLength(0) switch
    {
        1 => m[0, 0],
        2 => (m[0, 0] * m[1, 1]) - (m[0, 1] * m[1, 0]),
        _ => (m[0, 0] * ((m[1, 1] * m[2, 2]) - (m[1, 2] * m[2, 1])))
            - (m[0, 1] * ((m[1, 0] * m[2, 2]) - (m[1, 2] * m[2, 0])))
            + (m[0, 2] * ((m[1, 0] * m[2, 1]) - (m[1, 1] * m[2, 0]))),
    };

    private static double[,] Inverse(double[,] m)
    {
        var d = m.GetLength(0);
        var det = Determinant(m);
        var inv = new double[d, d];
        if (d == 1)
        {
            inv[0, 0] = 1 / det;
        }
        else if (d == 2)
        {
            inv[0, 0] = m[1, 1] / det;
            inv[1, 1] = m[0, 0] / det;
            inv[0, 1] = -m[0, 1] / det;
            inv[1, 0] = -m[1, 0] / det;
        }
        else
        {
            for (var i = 0; i < 3; i++)
            {
                for (var j = 0; j < 3; j++)
                {
                    // Cofactor of (j, i) over the determinant.
                    int r0 = (j + 1) % 3, r1 = (j + 2) % 3, c0 = (i + 1) % 3, c1 = (i + 2) % 3;
                    inv[i, j] = ((m[r0, c0] * m[r1, c1]) - (m[r0, c1] * m[r1, c0])) / det;
                }
            }
        }

        return inv;
    }
}
