using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Numerics.Simd;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Thermal;

/// <summary>
/// Exact mode sums without one exp() per mode and temperature. Modes are streamed into narrow
/// frequency bins; each bin keeps the Chebyshev moments mu_k = sum_i w_i T_k(t_i) (k = 0..Order) of
/// its modes' positions t_i in [-1, 1]. A sum of any smooth g over the bin's modes is then replaced
/// by the interpolatory quadrature sum_j W_j g(tau_j) at the Order + 1 Chebyshev points tau_j, with
/// W_j = (mu_0 + 2 sum_k mu_k T_k(tau_j)) / (Order + 1) (discrete orthogonality of T_k at those
/// points). The quadrature is exact for every polynomial of degree &lt;= Order over the bin's own
/// modes, so sum_j W_j g(tau_j) = sum_i w_i p(t_i) with p the Chebyshev interpolant of g, and the
/// error is at most sum_i |w_i| max |g - p| over the bin (Trefethen, Approximation Theory and
/// Approximation Practice, ch. 7-8, from memory: |g - p| &lt;= 4 M rho^-n / (rho - 1) for g analytic
/// in the Bernstein ellipse rho with |g| &lt;= M).
/// <para>
/// Bins: uniform in omega above <see cref="LinearStartBins"/> widths (width chosen so that
/// x = hbar omega / kB T changes by at most <see cref="MaxStepX"/> across a bin at the lowest
/// temperature: the thermal functions have their nearest complex singularities at x = 2 pi i m, so
/// rho >= 50); geometric below, uniform in ln omega with step <see cref="LogStep"/>, where the
/// ln x singularity of F and S at omega = 0 sits (in s = ln omega those functions are analytic in a
/// strip of half-width pi / 2: rho >= 2 pi / LogStep). With Order = 9 both bounds are below 1e-12
/// relative per bin; the tests compare with the plain sum.
/// </para>
/// </summary>
internal sealed class ChebyshevModeBins
{
    /// <summary>Degree of the moments kept (Order + 1 moments and quadrature points per bin).</summary>
    public const int Order = 9; // Add writes T_0..T_9 out by hand: change both together

    /// <summary>Largest change of x = hbar omega / kB T across a uniform bin at the lowest temperature.</summary>
    public const double MaxStepX = 0.5;

    /// <summary>Width of a geometric bin in ln omega.</summary>
    public const double LogStep = 0.25;

    /// <summary>Uniform bins start at this many bin widths; below is the geometric range.</summary>
    public const int LinearStartBins = 8;

    /// <summary>Lowest frequency binned, relative to the top: the eigen-solver's zero threshold is 1e-7 in omega.</summary>
    public const double FloorRelative = 1e-9;

    private const int Points = Order + 1;

    private static readonly double[] Nodes = BuildNodes();
    private static readonly double[] NodeChebyshev = BuildNodeChebyshev(); // [j * Points + k] = T_k(tau_j)

    private readonly double _width;        // uniform bin width (rad/s)
    private readonly int _linearBins;      // uniform bins, index LinearStartBins .. LinearStartBins + _linearBins - 1
    private readonly double _logTop;       // ln(LinearStartBins * width): top of the geometric range
    private readonly int _logBins;
    private readonly double _floor;        // below this, modes are summed one by one
    private readonly int _channels;
    private readonly double[] _moments;    // [bin * Points + k]
    private readonly double[]? _channelMoments; // [(bin * channels + c) * Points + k]

    private ChebyshevModeBins(double width, int linearBins, int logBins, double floor, int channels)
    {
        _width = width;
        _linearBins = linearBins;
        _logTop = Math.Log(LinearStartBins * width);
        _logBins = logBins;
        _floor = floor;
        _channels = channels;
        var bins = linearBins + logBins;
        _moments = new double[bins * Points];
        _channelMoments = channels > 0 ? new double[bins * channels * Points] : null;
    }

    public int BinCount => _linearBins + _logBins;

    /// <summary>
    /// Bins for modes up to <paramref name="omegaTop"/> (rad/s) and the given temperatures, or null when
    /// the plain per-mode sum would be as cheap (few modes, or a lowest temperature so low that the
    /// bins would outnumber the modes).
    /// </summary>
    /// <param name="channels">Channels whose fraction-weighted moments are kept as well (0 for none).</param>
    public static ChebyshevModeBins? TryCreate(double omegaTop, ReadOnlySpan<double> temperaturesK, long expectedModes, int channels)
    {
        var lowest = double.PositiveInfinity;
        foreach (var t in temperaturesK)
        {
            if (t > 0)
            {
                lowest = Math.Min(lowest, t);
            }
        }

        if (!(omegaTop > 0) || !double.IsFinite(omegaTop))
        {
            return null;
        }

        var xTop = double.IsFinite(lowest) ? PhysicalConstants.HbarJS * omegaTop / (PhysicalConstants.BoltzmannJPerK * lowest) : 0.0;
        var uniform = Math.Max(64.0, Math.Ceiling(xTop / MaxStepX));
        if (uniform > 1 << 22)
        {
            return null;
        }

        var width = omegaTop * (1 + 1e-12) / uniform;
        var linearBins = (int)uniform - LinearStartBins + 1; // one spare bin above the top for round-off
        var floor = omegaTop * FloorRelative;
        var logBins = (int)Math.Ceiling((Math.Log(LinearStartBins * width) - Math.Log(floor)) / LogStep);
        var work = (long)(linearBins + logBins) * Points * (1 + channels);
        if (work * 4 > expectedModes)
        {
            return null;
        }

        return new ChebyshevModeBins(width, linearBins, logBins, floor, channels);
    }

    /// <summary>
    /// Adds a mode (omega > 0) with its weight and, when channels are kept, its channel fractions.
    /// Returns false for a mode below the binned range: the caller sums it directly.
    /// </summary>
    public bool Add(double omega, double weight, ReadOnlySpan<double> channelFractions)
    {
        int bin;
        double t;
        var u = omega / _width;
        if (u >= LinearStartBins)
        {
            var j = Math.Min((int)u, LinearStartBins + _linearBins - 1);
            bin = _logBins + j - LinearStartBins;
            t = 2.0 * (u - j) - 1.0;
        }
        else if (omega >= _floor)
        {
            var s = _logTop - Math.Log(omega);
            var g = Math.Min((int)(s / LogStep), _logBins - 1);
            bin = g;
            t = 1.0 - 2.0 * (s / LogStep - g); // t grows with omega
        }
        else
        {
            return false;
        }

        // T_0..T_9 by the three-term recurrence, written out (this runs once per mode).
        var twoT = 2.0 * t;
        var t2 = (twoT * t) - 1.0;
        var t3 = (twoT * t2) - t;
        var t4 = (twoT * t3) - t2;
        var t5 = (twoT * t4) - t3;
        var t6 = (twoT * t5) - t4;
        var t7 = (twoT * t6) - t5;
        var t8 = (twoT * t7) - t6;
        var t9 = (twoT * t8) - t7;
        var m = _moments.AsSpan(bin * Points, Points);
        m[9] += weight * t9;
        m[0] += weight;
        m[1] += weight * t;
        m[2] += weight * t2;
        m[3] += weight * t3;
        m[4] += weight * t4;
        m[5] += weight * t5;
        m[6] += weight * t6;
        m[7] += weight * t7;
        m[8] += weight * t8;

        if (_channelMoments is not null && !channelFractions.IsEmpty)
        {
            var row = _channelMoments.AsSpan(bin * _channels * Points, _channels * Points);
            for (var c = 0; c < _channels; c++)
            {
                var f = weight * channelFractions[c];
                if (f == 0)
                {
                    continue;
                }

                var mc = row.Slice(c * Points, Points);
                mc[9] += f * t9;
                mc[0] += f;
                mc[1] += f * t;
                mc[2] += f * t2;
                mc[3] += f * t3;
                mc[4] += f * t4;
                mc[5] += f * t5;
                mc[6] += f * t6;
                mc[7] += f * t7;
                mc[8] += f * t8;
            }
        }

        return true;
    }

    /// <summary>
    /// Adds many modes (each omega &gt; 0) with their weights and no channel fractions, the same sums as
    /// <see cref="Add"/> one by one up to round-off (each bin's run of consecutive modes is summed on
    /// its own and then added to the bin). Modes below the binned range are not added: their indexes
    /// go to <paramref name="unbinned"/> in order, and the count is returned, for the caller to sum
    /// directly. A chain's or a crystal's consecutive wave vectors put long runs of modes into one
    /// bin, so the moments stay in registers through a run instead of going through memory per mode;
    /// with 256-bit vectors (<see cref="SimdWidths"/>) four modes of a run are taken per step.
    /// </summary>
    public int AddMany(ReadOnlySpan<double> omegas, ReadOnlySpan<double> weights, Span<int> unbinned)
    {
        var rejected = 0;
        var i = 0;
        if (_channelMoments is null && Vector256.IsHardwareAccelerated && SimdWidths.Active != SimdWidth.Scalar)
        {
            i = AddRunsOfFour(omegas, weights, unbinned, ref rejected);
        }

        // The rest one at a time, a bin's run kept in locals.
        var runBin = -1;
        double a0 = 0, a1 = 0, a2 = 0, a3 = 0, a4 = 0, a5 = 0, a6 = 0, a7 = 0, a8 = 0, a9 = 0;
        for (; i < omegas.Length; i++)
        {
            var omega = omegas[i];
            var weight = weights[i];
            int bin;
            double t;
            var u = omega / _width;
            if (u >= LinearStartBins)
            {
                var j = Math.Min((int)u, LinearStartBins + _linearBins - 1);
                bin = _logBins + j - LinearStartBins;
                t = 2.0 * (u - j) - 1.0;
            }
            else if (omega >= _floor)
            {
                var sLog = _logTop - Math.Log(omega);
                var g = Math.Min((int)(sLog / LogStep), _logBins - 1);
                bin = g;
                t = 1.0 - 2.0 * (sLog / LogStep - g);
            }
            else
            {
                unbinned[rejected++] = i;
                continue;
            }

            if (bin != runBin)
            {
                FlushRun(runBin, a0, a1, a2, a3, a4, a5, a6, a7, a8, a9);
                runBin = bin;
                a0 = a1 = a2 = a3 = a4 = a5 = a6 = a7 = a8 = a9 = 0;
            }

            var twoT = 2.0 * t;
            var t2 = (twoT * t) - 1.0;
            var t3 = (twoT * t2) - t;
            var t4 = (twoT * t3) - t2;
            var t5 = (twoT * t4) - t3;
            var t6 = (twoT * t5) - t4;
            var t7 = (twoT * t6) - t5;
            var t8 = (twoT * t7) - t6;
            var t9 = (twoT * t8) - t7;
            a0 += weight;
            a1 += weight * t;
            a2 += weight * t2;
            a3 += weight * t3;
            a4 += weight * t4;
            a5 += weight * t5;
            a6 += weight * t6;
            a7 += weight * t7;
            a8 += weight * t8;
            a9 += weight * t9;
        }

        FlushRun(runBin, a0, a1, a2, a3, a4, a5, a6, a7, a8, a9);
        return rejected;
    }

    /// <summary>
    /// Four modes per step where all four fall into one uniform bin; four that do not are added one by
    /// one (<see cref="Add"/>). Returns the index past the last whole four.
    /// </summary>
    private int AddRunsOfFour(ReadOnlySpan<double> omegas, ReadOnlySpan<double> weights, Span<int> unbinned, ref int rejected)
    {
        var i = 0;
        var runBin = -1;
        var zero = Vector256<double>.Zero;
        Vector256<double> a0 = zero, a1 = zero, a2 = zero, a3 = zero, a4 = zero, a5 = zero, a6 = zero, a7 = zero, a8 = zero, a9 = zero;
        var width = Vector256.Create(_width);
        var firstUniform = Vector256.Create((double)LinearStartBins);
        var lastUniform = (double)(LinearStartBins + _linearBins - 1);
        var one = Vector256<double>.One;
        for (; i + 4 <= omegas.Length; i += 4)
        {
            // As Add: u = omega / width, j = min((int)u, last) (u >= 8 > 0, so (int)u = floor(u)),
            // t = 2 (u - j) - 1, the same operations lane by lane.
            var u = Vector256.Create(omegas.Slice(i, 4)) / width;
            var j = Vector256.Min(Vector256.Floor(u), Vector256.Create(lastUniform));
            if (!Vector256.GreaterThanOrEqualAll(u, firstUniform) || !Vector256.EqualsAll(j, Vector256.Create(j.GetElement(0))))
            {
                FlushRun(runBin, a0, a1, a2, a3, a4, a5, a6, a7, a8, a9);
                runBin = -1;
                a0 = a1 = a2 = a3 = a4 = a5 = a6 = a7 = a8 = a9 = zero;
                for (var k = i; k < i + 4; k++)
                {
                    if (!Add(omegas[k], weights[k], default))
                    {
                        unbinned[rejected++] = k;
                    }
                }

                continue;
            }

            var bin = _logBins + (int)j.GetElement(0) - LinearStartBins;
            if (bin != runBin)
            {
                FlushRun(runBin, a0, a1, a2, a3, a4, a5, a6, a7, a8, a9);
                runBin = bin;
                a0 = a1 = a2 = a3 = a4 = a5 = a6 = a7 = a8 = a9 = zero;
            }

            var w = Vector256.Create(weights.Slice(i, 4));
            var t = (2.0 * (u - j)) - one;
            var twoT = 2.0 * t;
            var t2 = (twoT * t) - one;
            var t3 = (twoT * t2) - t;
            var t4 = (twoT * t3) - t2;
            var t5 = (twoT * t4) - t3;
            var t6 = (twoT * t5) - t4;
            var t7 = (twoT * t6) - t5;
            var t8 = (twoT * t7) - t6;
            var t9 = (twoT * t8) - t7;
            a0 += w;
            a1 += w * t;
            a2 += w * t2;
            a3 += w * t3;
            a4 += w * t4;
            a5 += w * t5;
            a6 += w * t6;
            a7 += w * t7;
            a8 += w * t8;
            a9 += w * t9;
        }

        FlushRun(runBin, a0, a1, a2, a3, a4, a5, a6, a7, a8, a9);
        return i;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private void FlushRun(int bin, Vector256<double> a0, Vector256<double> a1, Vector256<double> a2, Vector256<double> a3, Vector256<double> a4,
        Vector256<double> a5, Vector256<double> a6, Vector256<double> a7, Vector256<double> a8, Vector256<double> a9) =>
        FlushRun(bin, LaneSums.Pairwise(a0), LaneSums.Pairwise(a1), LaneSums.Pairwise(a2), LaneSums.Pairwise(a3), LaneSums.Pairwise(a4),
            LaneSums.Pairwise(a5), LaneSums.Pairwise(a6), LaneSums.Pairwise(a7), LaneSums.Pairwise(a8), LaneSums.Pairwise(a9));

    private void FlushRun(int bin, double a0, double a1, double a2, double a3, double a4, double a5, double a6, double a7, double a8, double a9)
    {
        if (bin < 0)
        {
            return;
        }

        var m = _moments.AsSpan(bin * Points, Points);
        m[9] += a9;
        m[0] += a0;
        m[1] += a1;
        m[2] += a2;
        m[3] += a3;
        m[4] += a4;
        m[5] += a5;
        m[6] += a6;
        m[7] += a7;
        m[8] += a8;
    }

    /// <summary>
    /// Visits every quadrature point of every non-empty bin: (omega, weight, channel weights or empty).
    /// The weights reproduce the sums of every smooth function of omega over the binned modes.
    /// </summary>
    public void ForEachPoint(PointVisitor visit)
    {
        Span<double> w = stackalloc double[Points];
        var channelWeights = _channelMoments is null ? [] : new double[_channels * Points];
        Span<double> cw = stackalloc double[_channels];
        for (var bin = 0; bin < BinCount; bin++)
        {
            var m = _moments.AsSpan(bin * Points, Points);
            if (m[0] == 0 && IsZero(m))
            {
                continue;
            }

            Weights(m, w);
            if (_channelMoments is not null)
            {
                for (var c = 0; c < _channels; c++)
                {
                    Weights(_channelMoments.AsSpan(((bin * _channels) + c) * Points, Points), channelWeights.AsSpan(c * Points, Points));
                }
            }

            for (var j = 0; j < Points; j++)
            {
                var omega = NodeOmega(bin, Nodes[j]);
                if (_channelMoments is not null)
                {
                    for (var c = 0; c < _channels; c++)
                    {
                        cw[c] = channelWeights[(c * Points) + j];
                    }
                }

                visit(omega, w[j], _channelMoments is null ? [] : cw);
            }
        }
    }

    public delegate void PointVisitor(double omega, double weight, ReadOnlySpan<double> channelWeights);

    private double NodeOmega(int bin, double tau)
    {
        if (bin >= _logBins)
        {
            var j = bin - _logBins + LinearStartBins;
            return (j + (0.5 * (tau + 1.0))) * _width;
        }

        var s = _logTop - ((bin + (0.5 * (1.0 - tau))) * LogStep);
        return Math.Exp(s);
    }

    private static void Weights(ReadOnlySpan<double> moments, Span<double> weights)
    {
        for (var j = 0; j < Points; j++)
        {
            var row = NodeChebyshev.AsSpan(j * Points, Points);
            var sum = moments[0];
            for (var k = 1; k < Points; k++)
            {
                sum += 2.0 * moments[k] * row[k];
            }

            weights[j] = sum / Points;
        }
    }

    private static bool IsZero(ReadOnlySpan<double> m)
    {
        foreach (var v in m)
        {
            if (v != 0)
            {
                return false;
            }
        }

        return true;
    }

    private static double[] BuildNodes()
    {
        var nodes = new double[Points];
        for (var j = 0; j < Points; j++)
        {
            nodes[j] = Math.Cos(Math.PI * (j + 0.5) / Points);
        }

        return nodes;
    }

    private static double[] BuildNodeChebyshev()
    {
        var table = new double[Points * Points];
        for (var j = 0; j < Points; j++)
        {
            var theta = Math.PI * (j + 0.5) / Points;
            for (var k = 0; k < Points; k++)
            {
                table[(j * Points) + k] = Math.Cos(k * theta); // T_k(cos theta) = cos(k theta)
            }
        }

        return table;
    }
}
