using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Numerics.Simd;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Large real-space blocks (10^5 to 10^6 atoms) by the kernel polynomial method on the sparse
/// operator (<see cref="RealSpaceOperator.Apply"/>; memory grows linearly with the atoms):
/// <list type="number">
/// <item>rigid-body modes projected out (P D P), the spectral range from 200 Lanczos steps with a
/// margin (Gershgorin's bounds if the moments then grow, which only happens when the range was wrong);</item>
/// <item>for each of R random vectors r (entries +-1, projected), the Chebyshev vectors
/// a_{k+1} = P (2 X a_k) - a_{k-1} with X = (D - b) / a, and the moments by the doubling identities
/// mu_2k = 2 a_k.a_k - mu_0, mu_2k+1 = 2 a_k+1.a_k - mu_1 (Weisse et al. 2006, sec. II.B), weighted
/// per group of degrees of freedom in the same pass, so one set of vectors gives the total, per-site,
/// per-layer and displacement densities at once (E[r^T W T r] = Tr(W T) for any diagonal W);</item>
/// <item>the Jackson-smoothed densities integrated exactly over a fine frequency grid for the thermal
/// sums and the displacements (<see cref="KernelPolynomialDensity"/>).</item>
/// </list>
/// Single-threaded like every point; one large point runs on one worker's core.
/// </summary>
internal static class RealSpaceKpmSolver
{
    /// <summary>Bins of the fine frequency grid the thermal sums are taken on.</summary>
    public const int FineBins = 4096;

    /// <summary>Lanczos steps for the spectral range.</summary>
    public const int LanczosSteps = 200;

    /// <summary>
    /// Bytes per atom (3D motion): the block's indices and tensors per site, six vectors of the
    /// recursion, four more of four lanes each when it runs in blocks (<paramref name="blocked"/>), the groups.
    /// </summary>
    public static long BytesPerAtom(int springsPerSite, bool blocked) => (8L * springsPerSite) + (3 * 8 * 8) + (blocked ? 4 * RealSpaceOperator.BlockLanes * 3 * 8 : 0) + 72 + 100;

    /// <summary>
    /// How much less time the blocked recursion takes than one vector at a time, as measured on a free
    /// 10^5-atom fcc sphere with the defaults (bench case surfaces-kpm: 79.0 s of CPU before, 17.2 s
    /// after): the work estimate divides its flop-equivalents by it so forecasts keep the calibration.
    /// </summary>
    public const double MeasuredBlockSpeedup = 4.6;

    /// <summary>
    /// Whether the recursion runs in blocks for a sample of <paramref name="atoms"/> atoms, and the working
    /// memory it then needs (the block's springs, the recursion's vectors, the site tables): four vectors
    /// at once is faster but holds four more vectors of four lanes, so blocks only where the processor
    /// runs them and their memory fits the limit.
    /// </summary>
    public static (bool Blocked, long Bytes) MemoryPlan(long atoms, int springsPerSite, long memoryLimitBytes)
    {
        var blockedBytes = atoms * BytesPerAtom(springsPerSite, blocked: true);
        return BlocksByDefault && blockedBytes <= memoryLimitBytes
            ? (true, blockedBytes)
            : (false, atoms * BytesPerAtom(springsPerSite, blocked: false));
    }

    /// <summary>True when the recursion runs four random vectors at once in 256-bit lanes (AVX2, and no <c>LATSWEEP_SIMD_WIDTH=scalar</c>).</summary>
    public static bool BlocksByDefault => Vector256.IsHardwareAccelerated && SimdWidths.Active != SimdWidth.Scalar;

    public static RealSpaceRun Solve(
        RealSpaceLattice lattice, SiteProperties properties, double[] temperatures, SolveOptions options,
        KpmSettings settings, int configuration, CancellationToken ct, bool? blocked = null)
    {
        var op = new RealSpaceOperator(lattice, properties);
        var n = op.Size;
        var rigid = RigidBodyModes.Of(lattice, properties.MassKg);
        void ApplyProjected(double[] x, double[] y)
        {
            op.Apply(x, y);
            rigid.ProjectOutOfVector(y);
        }

        // D of each rigid-body mode, made once: the rotation stiffness and the choice below both read it.
        var dOfRigid = new Dictionary<double[], double[]>();
        double[] ApplyToRigid(double[] v)
        {
            if (!dOfRigid.TryGetValue(v, out var y))
            {
                y = new double[n];
                op.Apply(v, y);
                dOfRigid[v] = y;
            }

            return y;
        }

        var rotation = rigid.RotationStiffness(ApplyToRigid);

        // The recursion's vectors start orthogonal to every rigid-body mode. D keeps a vector orthogonal
        // to each rigid mode it annihilates (D symmetric: <v, D x> = <D v, x> = 0): the translations
        // always (the acoustic sum rule), the rotations for rotationally invariant springs. Only the
        // others need projecting out at every step, a pass over all of them (often none).
        var gershgorin = op.GershgorinBounds();
        var resisted = rigid.ResistedBy(ApplyToRigid, 1e-10 * Math.Max(Math.Abs(gershgorin.Upper), Math.Abs(gershgorin.Lower)));
        void ApplyInRigidFreeSpace(double[] x, double[] y)
        {
            op.Apply(x, y);
            resisted.ProjectOutOfVector(y);
        }

        // Spectral range of P D P on the space the random vectors live in. Round-off brings the rigid
        // directions (eigenvalue 0 of P D P) into the Krylov space, where Lanczos would find them as
        // the lowest Ritz value: they are moved to the middle of the spectrum, P D P + s (1 - P).
        var middle = 0.25 * gershgorin.Upper;
        var start = RandomVector(n, settings.Seed, configuration, -1);
        rigid.ProjectOutOfVector(start);
        var rigidPart = new double[n];
        var (ritzLow, ritzHigh) = LanczosBounds.Estimate((x, y) =>
        {
            ApplyProjected(x, y);
            Array.Copy(x, rigidPart, n);
            rigid.ProjectOutOfVector(rigidPart);
            for (var i = 0; i < n; i++)
            {
                y[i] += middle * (x[i] - rigidPart[i]);
            }
        }, start, Math.Min(LanczosSteps, n));
        var unstable = ritzLow < -1e-8 * ritzHigh;
        var high = Math.Min(gershgorin.Upper, ritzHigh + (0.01 * Math.Abs(ritzHigh)));
        var low = unstable ? ritzLow - (0.05 * Math.Abs(ritzLow)) - (0.01 * high) : -0.01 * high;

        var moments = settings.Moments + (settings.Moments % 2);
        var groups = new GroupLayout(lattice, properties);
        double[] perVector;
        double scale, centre;
        while (true)
        {
            // A margin of 1% keeps the operator's spectrum strictly inside [-1, 1] (Weisse et al. 2006).
            scale = (high - low) / (2 - 0.02);
            centre = (high + low) / 2;
            perVector = blocked ?? BlocksByDefault
                ? MomentsInBlocks(op, rigid, resisted, scale, centre, moments, settings, configuration, groups, ct)
                : Moments(ApplyInRigidFreeSpace, rigid, n, scale, centre, moments, settings, configuration, groups, ct);
            if (Bounded(perVector, groups.Count, moments, settings.RandomVectors) || (low <= gershgorin.Lower && high >= gershgorin.Upper))
            {
                break;
            }

            // Growing moments: part of the spectrum lay outside the range; Gershgorin's bounds are safe.
            (low, high) = (Math.Min(low, gershgorin.Lower), Math.Max(high, gershgorin.Upper));
        }

        var kpm = new KpmSpectrum(lattice, moments, settings.RandomVectors, scale, centre, perVector);
        var sink = RealSpaceDenseSolver.NewSink(lattice, temperatures, options with { MeanSquareDisplacement = false });
        var weightPerState = (double)lattice.Crystal.Sites / lattice.AtomCount;
        var fine = FineGrid(kpm.Centre + kpm.Scale);
        var masses = kpm.Between(KpmSpectrum.Edges(fine), kpm.Mean, kpm.Groups);
        for (var b = 0; b < fine.Bins; b++)
        {
            var omega = 2 * Math.PI * 1e12 * fine.Centre(b);
            sink.Add(omega, masses[b * kpm.Groups] * weightPerState, default);
        }

        var stats = new SpectrumStatistics(2);
        var lowest = unstable ? ritzLow : Math.Max(ritzLow, 0);
        stats.Observe([lowest, ritzHigh], Vec3.Zero, 0);
        var displacements = options.MeanSquareDisplacement && ritzLow > 1e-10 * ritzHigh
            ? Displacements(kpm, masses, fine, temperatures, Math.Sqrt(ritzLow))
            : null;
        return new RealSpaceRun
        {
            Lattice = lattice,
            Properties = properties,
            Statistics = stats,
            Kpm = kpm,
            KpmDisplacements = displacements,
            KpmLowestRitz = ritzLow,
            Sink = sink,
            RigidModes = rigid.Count,
            RigidRotations = rigid.Rotations,
            RotationDefectLambda = rotation,
            Method = "kernel polynomial",
            QPointsSolved = 1,
            ModeCount = (long)n * lattice.ImagesPerSite,
            SortedThz = [],
        };
    }

    /// <summary>Uniform fine bins in omega from 0 to the top of the range.</summary>
    public static FrequencyGrid FineGrid(double highLambda) =>
        new(0, ModeSolver.SignedThz(highLambda) / FineBins, FineBins);

    /// <summary>
    /// Mean-square displacement of every displacement channel at every temperature (m^2): the
    /// channel's density integrated against hbar coth(x/2) / (2 omega). Weight that the kernel smears
    /// below the lowest mode is counted at the lowest mode (the Lanczos estimate), where 1/omega stays finite.
    /// </summary>
    private static double[] Displacements(KpmSpectrum kpm, double[] masses, FrequencyGrid fine, double[] temperatures, double floorOmega)
    {
        var channels = (kpm.Lattice.Crystal.Sites + kpm.Lattice.LayerCount) * kpm.Lattice.Components;
        var msd = new double[temperatures.Length * channels];
        for (var b = 0; b < fine.Bins; b++)
        {
            var omega = Math.Max(2 * Math.PI * 1e12 * fine.Centre(b), floorOmega);
            for (var t = 0; t < temperatures.Length; t++)
            {
                var factor = PhysicalConstants.HbarJS / (2 * omega) * CothHalf(omega, temperatures[t]);
                for (var c = 0; c < channels; c++)
                {
                    msd[(t * channels) + c] += factor * masses[(b * kpm.Groups) + kpm.DisplacementGroup(c)];
                }
            }
        }

        return msd;
    }

    internal static double CothHalf(double omega, double temperatureK)
    {
        if (temperatureK <= 0)
        {
            return 1.0;
        }

        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * temperatureK);
        return x > 40 ? 1.0 : 1.0 + (2.0 / SmallFunctions.ExpM1(x));
    }

    /// <summary>|mu_n| &lt;= mu_0 for every vector's total moments, as for any spectrum inside [-1, 1].</summary>
    private static bool Bounded(double[] perVector, int groups, int moments, int vectors)
    {
        for (var v = 0; v < vectors; v++)
        {
            var m = perVector.AsSpan(v * groups * moments, moments);
            for (var k = 1; k < moments; k++)
            {
                if (!(Math.Abs(m[k]) <= (1 + 1e-6) * m[0]))
                {
                    return false;
                }
            }
        }

        return true;
    }

    private static double[] Moments(
        Action<double[], double[]> applyProjected, RigidBodyModes rigid, int n, double scale, double centre, int moments,
        KpmSettings settings, int configuration, GroupLayout groups, CancellationToken ct)
    {
        var g = groups.Count;
        var result = new double[settings.RandomVectors * g * moments];
        var half = moments / 2;
        var previous = new double[n];
        var current = new double[n];
        var next = new double[n];
        var dd = new double[g];
        var dn = new double[g];
        for (var v = 0; v < settings.RandomVectors; v++)
        {
            ct.ThrowIfCancellationRequested();
            var mu = result.AsSpan(v * g * moments, g * moments);
            var r = RandomVector(n, settings.Seed, configuration, v);
            rigid.ProjectOutOfVector(r);
            Array.Copy(r, current, n);

            // a_1 = X a_0
            applyProjected(current, next);
            for (var i = 0; i < n; i++)
            {
                next[i] = (next[i] - (centre * current[i])) / scale;
            }

            groups.Accumulate(current, next, dd, dn);
            var mu0 = dd.ToArray();
            var mu1 = dn.ToArray();
            for (var k = 0; k < g; k++)
            {
                mu[k * moments] = mu0[k];
                mu[(k * moments) + 1] = mu1[k];
            }

            for (var step = 1; step < half; step++)
            {
                ct.ThrowIfCancellationRequested();
                (previous, current, next) = (current, next, previous);

                // a_{step+1} = 2 X a_step - a_{step-1}
                applyProjected(current, next);
                var twoOverScale = 2 / scale;
                for (var i = 0; i < n; i++)
                {
                    next[i] = (twoOverScale * (next[i] - (centre * current[i]))) - previous[i];
                }

                groups.Accumulate(current, next, dd, dn);
                for (var k = 0; k < g; k++)
                {
                    mu[(k * moments) + (2 * step)] = (2 * dd[k]) - mu0[k];
                    mu[(k * moments) + (2 * step) + 1] = (2 * dn[k]) - mu1[k];
                }
            }
        }

        return result;
    }

    /// <summary>
    /// The same moments as <see cref="Moments"/>, bit for bit, four random vectors at a time: the block's
    /// vectors interleaved (element i of vector l at 4 i + l), so the sparse product reads each spring's
    /// index and tensor once for four vectors and works in 256-bit lanes. Every lane does the same
    /// operations in the same order as the one-vector recursion; lanes past the last vector hold zeros.
    /// </summary>
    private static double[] MomentsInBlocks(
        RealSpaceOperator op, RigidBodyModes rigid, RigidBodyModes resisted, double scale, double centre, int moments,
        KpmSettings settings, int configuration, GroupLayout groups, CancellationToken ct)
    {
        const int L = RealSpaceOperator.BlockLanes;
        var n = op.Size;
        var g = groups.Count;
        var result = new double[settings.RandomVectors * g * moments];
        var half = moments / 2;
        var previous = new double[n * L];
        var current = new double[n * L];
        var next = new double[n * L];
        var dd = new double[g * L];
        var dn = new double[g * L];
        var mu0 = new double[g * L];
        var mu1 = new double[g * L];
        for (var v0 = 0; v0 < settings.RandomVectors; v0 += L)
        {
            ct.ThrowIfCancellationRequested();
            var lanes = Math.Min(L, settings.RandomVectors - v0);
            Array.Clear(current);
            for (var lane = 0; lane < lanes; lane++)
            {
                var r = RandomVector(n, settings.Seed, configuration, v0 + lane);
                rigid.ProjectOutOfVector(r);
                for (var i = 0; i < n; i++)
                {
                    current[(i * L) + lane] = r[i];
                }
            }

            // a_1 = X a_0
            op.ApplyBlock(current, next);
            resisted.ProjectOutOfBlock(next);
            for (var i = 0; i < next.Length; i++)
            {
                next[i] = (next[i] - (centre * current[i])) / scale;
            }

            groups.AccumulateBlock(current, next, mu0, mu1);
            for (var lane = 0; lane < lanes; lane++)
            {
                var mu = result.AsSpan((v0 + lane) * g * moments, g * moments);
                for (var k = 0; k < g; k++)
                {
                    mu[k * moments] = mu0[(k * L) + lane];
                    mu[(k * moments) + 1] = mu1[(k * L) + lane];
                }
            }

            var twoOverScale = 2 / scale;
            for (var step = 1; step < half; step++)
            {
                ct.ThrowIfCancellationRequested();
                (previous, current, next) = (current, next, previous);

                // a_{step+1} = 2 X a_step - a_{step-1}
                op.ApplyBlock(current, next);
                resisted.ProjectOutOfBlock(next);
                for (var i = 0; i < next.Length; i++)
                {
                    next[i] = (twoOverScale * (next[i] - (centre * current[i]))) - previous[i];
                }

                groups.AccumulateBlock(current, next, dd, dn);
                for (var lane = 0; lane < lanes; lane++)
                {
                    var mu = result.AsSpan((v0 + lane) * g * moments, g * moments);
                    for (var k = 0; k < g; k++)
                    {
                        var at = (k * L) + lane;
                        mu[(k * moments) + (2 * step)] = (2 * dd[at]) - mu0[at];
                        mu[(k * moments) + (2 * step) + 1] = (2 * dn[at]) - mu1[at];
                    }
                }
            }
        }

        return result;
    }

    /// <summary>Entries +-1 from SplitMix64 seeded by (seed, configuration, vector): the same numbers on every run.</summary>
    private static double[] RandomVector(int n, long seed, int configuration, int vector)
    {
        var state = ((ulong)seed * 0x9E3779B97F4A7C15UL) ^ ((ulong)(configuration + 1) * 0xD1B54A32D192ED03UL) ^ ((ulong)(vector + 2) * 0xAEF17502108EF2D9UL);
        var r = new double[n];
        for (var i = 0; i < n; i += 64)
        {
            state += 0x9E3779B97F4A7C15UL;
            var z = state;
            z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
            z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
            z ^= z >> 31;
            for (var j = 0; j < 64 && i + j < n; j++)
            {
                r[i + j] = ((z >> j) & 1) == 0 ? 1.0 : -1.0;
            }
        }

        return r;
    }

    /// <summary>Which groups each site belongs to, and its displacement weights there.</summary>
    private sealed class GroupLayout
    {
        private readonly int _components;
        private readonly int[] _basis;
        private readonly int[] _layer;
        private readonly int[] _msdBasis;
        private readonly int[] _msdLayer;
        private readonly double[] _msdBasisWeight;
        private readonly double[] _msdLayerWeight;

        public GroupLayout(RealSpaceLattice lattice, SiteProperties properties)
        {
            var r = lattice.Crystal.Sites;
            var layers = lattice.LayerCount;
            var c = lattice.Components;
            _components = c;
            Count = 1 + r + layers + ((r + layers) * c);
            var sites = lattice.Sites;
            _basis = new int[sites];
            _layer = new int[sites];
            _msdBasis = new int[sites];
            _msdLayer = new int[sites];
            _msdBasisWeight = new double[sites];
            _msdLayerWeight = new double[sites];
            for (var s = 0; s < sites; s++)
            {
                var b = lattice.BasisOf[s];
                var l = layers > 0 ? lattice.Layer[s] : -1;
                _basis[s] = 1 + b;
                _layer[s] = l >= 0 ? 1 + r + l : -1;
                _msdBasis[s] = 1 + r + layers + (b * c);
                _msdBasisWeight[s] = 1.0 / (properties.MassKg[s] * lattice.BasisSites[b]);
                _msdLayer[s] = l >= 0 ? 1 + r + layers + ((r + l) * c) : -1;
                _msdLayerWeight[s] = l >= 0 ? 1.0 / (properties.MassKg[s] * lattice.LayerSites[l]) : 0;
            }
        }

        public int Count { get; }

        /// <summary>
        /// In one pass over the vectors: same[g] = sum over the group's degrees of freedom of weight a_i a_i,
        /// and cross[g] of weight b_i a_i (the two products each Chebyshev step needs).
        /// </summary>
        public void Accumulate(double[] a, double[] b, double[] same, double[] cross)
        {
            Array.Clear(same);
            Array.Clear(cross);
            var c = _components;
            var totalSame = 0.0;
            var totalCross = 0.0;
            for (var s = 0; s < _basis.Length; s++)
            {
                var i = s * c;
                var mb = _msdBasis[s];
                var wb = _msdBasisWeight[s];
                var ml = _msdLayer[s];
                var wl = _msdLayerWeight[s];
                var siteSame = 0.0;
                var siteCross = 0.0;
                for (var k = 0; k < c; k++)
                {
                    var ak = a[i + k];
                    var p = ak * ak;
                    var q = b[i + k] * ak;
                    siteSame += p;
                    siteCross += q;
                    same[mb + k] += p * wb;
                    cross[mb + k] += q * wb;
                    if (ml >= 0)
                    {
                        same[ml + k] += p * wl;
                        cross[ml + k] += q * wl;
                    }
                }

                totalSame += siteSame;
                totalCross += siteCross;
                same[_basis[s]] += siteSame;
                cross[_basis[s]] += siteCross;
                var l = _layer[s];
                if (l >= 0)
                {
                    same[l] += siteSame;
                    cross[l] += siteCross;
                }
            }

            same[0] = totalSame;
            cross[0] = totalCross;
        }

        /// <summary><see cref="Accumulate"/> for a block of interleaved vectors: sums[4 g + lane], each lane as the one-vector sums.</summary>
        public void AccumulateBlock(double[] a, double[] b, double[] same, double[] cross)
        {
            const int L = RealSpaceOperator.BlockLanes;
            Array.Clear(same);
            Array.Clear(cross);
            var c = _components;
            var totalSame = Vector256<double>.Zero;
            var totalCross = Vector256<double>.Zero;
            for (var s = 0; s < _basis.Length; s++)
            {
                var i = s * c;
                var mb = _msdBasis[s];
                var wb = _msdBasisWeight[s];
                var ml = _msdLayer[s];
                var wl = _msdLayerWeight[s];
                var siteSame = Vector256<double>.Zero;
                var siteCross = Vector256<double>.Zero;
                for (var k = 0; k < c; k++)
                {
                    var ak = Vector256.Create(a.AsSpan((i + k) * L, L));
                    var p = ak * ak;
                    var q = Vector256.Create(b.AsSpan((i + k) * L, L)) * ak;
                    siteSame += p;
                    siteCross += q;
                    AddTo(same, mb + k, p * wb);
                    AddTo(cross, mb + k, q * wb);
                    if (ml >= 0)
                    {
                        AddTo(same, ml + k, p * wl);
                        AddTo(cross, ml + k, q * wl);
                    }
                }

                totalSame += siteSame;
                totalCross += siteCross;
                AddTo(same, _basis[s], siteSame);
                AddTo(cross, _basis[s], siteCross);
                var l = _layer[s];
                if (l >= 0)
                {
                    AddTo(same, l, siteSame);
                    AddTo(cross, l, siteCross);
                }
            }

            totalSame.CopyTo(same.AsSpan(0, L));
            totalCross.CopyTo(cross.AsSpan(0, L));
        }

        private static void AddTo(double[] sums, int group, Vector256<double> value)
        {
            var at = sums.AsSpan(group * RealSpaceOperator.BlockLanes, RealSpaceOperator.BlockLanes);
            (Vector256.Create((ReadOnlySpan<double>)at) + value).CopyTo(at);
        }
    }
}
