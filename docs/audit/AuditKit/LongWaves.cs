namespace LatticeSweep.Audit;

/// <summary>
/// The long-wave limit of the audit's D(q): sound speeds per direction and the low-temperature Debye law
/// they imply. 3D: Cv / V = (2 pi^2 / 15) kB (kB T / hbar)^3 &lt;sum_s v_s^-3&gt; over the unit sphere
/// (Ashcroft and Mermin eq. 23.30-23.31); 2D: Cv / A = (3 zeta(3) / pi) kB (kB T / hbar)^2 &lt;sum_s v_s^-2&gt;
/// over the circle; 1D: Cv / L = (pi / 3) kB (kB T / hbar) sum_s 1 / v_s (both derived the same way, from
/// int x^(d+1) e^x / (e^x - 1)^2 dx = (d + 1)! zeta(d + 1); common practice).
/// </summary>
internal sealed class LongWaves(Context x)
{
    private const double Zeta3 = 1.2020569031595942;
    private double? _average;
    private bool _averaged;
    private double _vMin = double.PositiveInfinity;
    private readonly List<double[]> _probe = [];
    private double[]? _slowest;

    private AuditModel Model => x.Case.Model;

    private double BMin
    {
        get
        {
            var b = Model.Reciprocal();
            return Enumerable.Range(0, Model.Dimension).Min(k => Math.Sqrt(b[k].Sum(v => v * v)));
        }
    }

    /// <summary>Acoustic speeds (m/s), slowest first, along a Cartesian direction: v^2 = (16 l(e) - l(2e)) / (12 e^2).</summary>
    public double[] Speeds(double[] direction)
    {
        var norm = Math.Sqrt(direction.Sum(v => v * v));
        var n = direction.Select(v => v / norm).ToArray();
        var eps = 1e-4 * BMin;
        var l1 = x.Matrix.Eigenvalues([n[0] * eps, n[1] * eps, n[2] * eps]);
        var l2 = x.Matrix.Eigenvalues([n[0] * 2 * eps, n[1] * 2 * eps, n[2] * 2 * eps]);
        var c = Model.Components;
        var speeds = new double[c];
        for (var s = 0; s < c; s++)
        {
            // a branch that grows 16-fold, not 4-fold, from e to 2e is omega ~ q^2 (a sheet's flexural branch): no
            // slope, speed 0 (README); its own dispersion would otherwise leave a residue of either sign here
            var quadratic = l1[s] > 0 && l2[s] > 10 * l1[s];
            speeds[s] = quadratic ? 0 : Math.Sqrt(Math.Max((16 * l1[s] - l2[s]) / (12 * eps * eps), 0)) * Units.Nm;
        }

        return speeds;
    }

    /// <summary>
    /// Direction average of sum_s v_s^-d (m/s)^-d, or null where the rules below do not settle it. The rule is
    /// doubled (3D: n Gauss-Legendre nodes in cos(theta) by 2n in phi, n = 16 ... 128; 2D: 128 ... 1,024 angles)
    /// until two in a row agree within 1e-5: models whose speeds differ tenfold between directions put most of
    /// the average in a narrow cone around the slowest direction, which a fixed 16 x 32 rule missed by 6 %
    /// (seed 2512, case 45: a simple cubic crystal with 0.18 N/m across its z bonds; the closed form
    /// &lt;(n^T A n)^-3/2&gt; = det(A)^-1/2 for a diagonal long-wave matrix A, common practice, from memory).
    /// </summary>
    private double? Average()
    {
        if (_averaged)
        {
            return _average;
        }

        _averaged = true;
        var d = Model.Dimension;
        if (d == 1)
        {
            _average = Rule(0);
            return _average;
        }

        var previous = Rule(0);
        for (var level = 1; level <= 3; level++)
        {
            var next = Rule(level);
            if (Math.Abs(next - previous) <= 1e-5 * Math.Abs(next))
            {
                _average = next;
                return _average;
            }

            previous = next;
        }

        _average = null;
        return _average;
    }

    /// <summary>One direction rule's average of sum_s v_s^-d: level 0 is the coarsest (and the one the probes come from).</summary>
    private double Rule(int level)
    {
        var d = Model.Dimension;
        var sum = 0.0;
        void Add(double[] dir, double weight, bool probe)
        {
            var v = Speeds(dir);
            if (v.Min() < _vMin)
            {
                _vMin = v.Min();
                _slowest = dir;
            }

            sum += weight * v.Sum(s => Math.Pow(s, -d));
            if (probe && level == 0)
            {
                _probe.Add(dir);
            }
        }

        if (d == 1)
        {
            Add([1, 0, 0], 1, true);
        }
        else if (d == 2)
        {
            var n = 128 << level;
            for (var k = 0; k < n; k++)
            {
                var phi = 2 * Math.PI * k / n;
                Add([Math.Cos(phi), Math.Sin(phi), 0], 1.0 / n, k % 8 == 0);
            }
        }
        else
        {
            var (mu, w) = GaussLegendre(16 << level);
            var nPhi = 32 << level;
            for (var i = 0; i < mu.Length; i++)
            {
                var st = Math.Sqrt(1 - mu[i] * mu[i]);
                for (var k = 0; k < nPhi; k++)
                {
                    var phi = 2 * Math.PI * k / nPhi;
                    Add([st * Math.Cos(phi), st * Math.Sin(phi), mu[i]], w[i] / 2 / nPhi, (i * nPhi + k) % 11 == 0);
                }
            }
        }

        return sum;
    }

    /// <summary>Debye-law Cv per mole of atoms at T, or null where the law is not yet exact to ~1e-3 (dispersion, optical branches).</summary>
    public double? Valid(double temperatureK)
    {
        var d = Model.Dimension;
        if (Average() is not { } average)
        {
            return null;
        }

        var c = Model.Components;
        var qStar = 8 * Units.Kb * temperatureK / (Units.Hbar * _vMin) * Units.Nm; // 1/nm
        if (qStar > 0.25 * BMin)
        {
            return null;
        }

        var gamma = x.Matrix.Eigenvalues([0, 0, 0]);
        if (gamma.Length > c && Units.Hbar * Math.Sqrt(gamma[c]) / (Units.Kb * temperatureK) < 25)
        {
            return null;
        }

        // The probes are spread over the sphere; the slowest direction found is probed too, since its branch bends first.
        foreach (var dir in _slowest is null ? _probe : _probe.Append(_slowest))
        {
            var norm = Math.Sqrt(dir.Sum(v => v * v));
            var speeds = Speeds(dir);
            var l = x.Matrix.Eigenvalues([dir[0] / norm * qStar, dir[1] / norm * qStar, dir[2] / norm * qStar]);
            for (var s = 0; s < c; s++)
            {
                var linear = speeds[s] / Units.Nm * qStar;
                if (Math.Abs(Math.Sqrt(Math.Max(l[s], 0)) / linear - 1) > 3e-4)
                {
                    return null;
                }
            }
        }

        var kt = Units.Kb * temperatureK / Units.Hbar;
        var perMeasure = d switch
        {
            3 => 2 * Math.PI * Math.PI / 15 * Units.Kb * Math.Pow(kt, 3) * average,
            2 => 3 * Zeta3 / Math.PI * Units.Kb * kt * kt * average,
            _ => Math.PI / 3 * Units.Kb * kt * average,
        };
        var measure = Model.CellMeasureNm() * Math.Pow(Units.Nm, d);
        return perMeasure * measure * Units.Na / Model.Sites.Length;
    }

    private static (double[] X, double[] W) GaussLegendre(int n)
    {
        var xs = new double[n];
        var ws = new double[n];
        for (var i = 0; i < n; i++)
        {
            var z = Math.Cos(Math.PI * (i + 0.75) / (n + 0.5));
            for (var it = 0; it < 100; it++)
            {
                double p0 = 1, p1 = z;
                for (var k = 2; k <= n; k++)
                {
                    var p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k;
                    p0 = p1;
                    p1 = p2;
                }

                var dp = n * (z * p1 - p0) / (z * z - 1);
                var dz = p1 / dp;
                z -= dz;
                if (Math.Abs(dz) < 1e-15)
                {
                    double q0 = 1, q1 = z;
                    for (var k = 2; k <= n; k++)
                    {
                        var q2 = ((2 * k - 1) * z * q1 - (k - 1) * q0) / k;
                        q0 = q1;
                        q1 = q2;
                    }

                    var dq = n * (z * q1 - q0) / (z * z - 1);
                    xs[i] = z;
                    ws[i] = 2 / ((1 - z * z) * dq * dq);
                    break;
                }
            }
        }

        return (xs, ws);
    }
}
