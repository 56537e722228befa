using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Thermal;

/// <summary>
/// Plain sums over a bulk point's Gamma-centred mesh of the thermal functions that are analytic in omega^2, for the
/// temperatures where such a sum has converged: U and Cv (S and F take the same weight through <see cref="GammaCellSums"/>,
/// which gives the q = 0 point the lattice zeta values of the singular ln omega and omega; F = U - T S holds).
/// <para>
/// Why: Cv per mode, c(x) = x^2 e^x / (e^x - 1)^2, and U per mode, (kT) (x/2) coth(x/2), are even in x = hbar omega / kT,
/// so sum_b c(x_b(q)) = tr c(D(q)) is an analytic periodic function of q, the cone at q = 0 and branch crossings
/// included. The trapezoid (plain periodic) sum of such a function converges exponentially with the mesh (common
/// practice, no source: the Poisson summation formula), at a rate set by its poles at omega^2 = -(2 pi n kT / hbar)^2,
/// which the acoustic cones bring nearest to the real q at i 2 pi kT / (hbar c). Linear simplices converge as h^2 and
/// left Cv 3e-4 low at 60 K on a simple cubic 8^3 mesh where the plain sum is within 5e-7 (docs/outside-checks.md,
/// Round 29 (coarse meshes)). S and F contain ln x, singular at q = 0; splitting it off as the log moment put the
/// simplices' error of ln omega of frozen modes into S (a sheet on 10 x 10: 2.6e-2 high at 500 K), so S takes the plain
/// sum of ln omega with the q = 0 point filled instead (Round 30).
/// </para>
/// </summary>
internal static class PeriodicMeshSums
{
    private const double Hbar = PhysicalConstants.HbarJS;
    private const double Kb = PhysicalConstants.BoltzmannJPerK;

    /// <summary>
    /// Relative error of the plain sum of an isotropic cone's Cv on a cubic (d = 3) or square (d = 2) lattice of wave
    /// vectors, against its integral, at mesh steps dy = hbar c dq / kT (the larger of the 2D and 3D errors at each step;
    /// docs/coarse-mesh-check/cone_table.py recomputes both, the NumPy sum
    /// over |n| dy up to y = 80 against the radial integral).
    /// </summary>
    private static readonly (double StepY, double Error)[] ConeErrorTable =
    [
        (1.5, 1.1e-9), (2.0, 5.7e-7), (2.25, 4.7e-6), (2.5, 2.5e-5), (2.75, 9.9e-5), (3.0, 3.1e-4),
        (3.25, 8.0e-4), (3.5, 1.8e-3), (3.75, 3.7e-3), (4.0, 6.7e-3), (4.5, 2.0e-2), (5.0, 4.6e-2), (6.0, 0.163),
    ];

    /// <summary>
    /// Estimated relative error at or below which the plain sum is taken alone.
    /// </summary>
    public const double PlainAloneError = 1e-4;

    /// <summary>Estimated relative error at or above which the plain sum is not used (the density of states' sums stay).</summary>
    public const double PlainUnusedError = 1e-3;

    /// <summary>Fewest mesh points per periodic direction (the mesh check's smallest mesh): coarser meshes keep the density of states' sums.</summary>
    public const int MinimumMeshCount = 4;

    /// <summary>
    /// The weight of the plain sum at each temperature (<see cref="Weight"/> of <see cref="EstimatedError"/>; 0 where it is not
    /// to be used), the estimate from the acoustic branches at the short vectors R = sum_i n_i M_i a_i (n_i in {-1, 0, 1}, one
    /// of each pair +-R) of the mesh's superlattice, whose Fourier terms are the plain sum's error (Poisson summation): each
    /// branch's omega at q_R = 2 pi R / |R|^2, the mesh step along R, and at 2 q_R. Null where the mesh is too small, a branch
    /// is not positive there, or one rises as q^2 (omega(2 q_R) above 3 omega(q_R): a sheet's flexural branch, whose poles the
    /// cone table does not describe): such points keep the density of states' sums, and their zero-point energy, S and F too
    /// (<see cref="GammaCellSums"/> is used only where the probes succeed). The probes run also where no temperature is
    /// positive, since the zero-point energy's plain sum depends on them.
    /// </summary>
    public static double[]? PlainWeights(ModeSolver solver, PeriodicGrid grid, ReadOnlySpan<double> temperaturesK, double[] plainHeatCapacityJPerK)
    {
        var weights = new double[temperaturesK.Length];
        var crystal = solver.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var dimension = lattice.Dimension;
        var acoustic = crystal.Components;
        int[] counts = [grid.N1, grid.N2, grid.N3];
        for (var a = 0; a < dimension; a++)
        {
            if (counts[a] < MinimumMeshCount)
            {
                return null;
            }
        }

        var vectors = new List<Vec3>();
        var span = (int)Math.Pow(3, dimension);
        for (var code = (span / 2) + 1; code < span; code++)
        {
            // Codes above the middle: one of each pair +-R (the middle code is R = 0).
            var c = code;
            var r = new Vec3(0, 0, 0);
            for (var a = 0; a < dimension; a++)
            {
                r += ((c % 3) - 1) * counts[a] * lattice.Vector(a);
                c /= 3;
            }

            vectors.Add(r);
        }

        var probes = new List<LongWaveProbe>(vectors.Count);
        foreach (var r in vectors)
        {
            var q = 2 * Math.PI / r.Dot(r) * r;
            var one = LowestOmegas(solver, q, acoustic);
            var two = LowestOmegas(solver, 2 * q, acoustic);
            for (var b = 0; b < acoustic; b++)
            {
                if (!(one[b] > 0) || two[b] > 3 * one[b])
                {
                    return null;
                }
            }

            probes.Add(new LongWaveProbe(q.Length, r.Unit(), one));
        }

        var cellMeasure = lattice.CellMeasure;
        for (var t = 0; t < temperaturesK.Length; t++)
        {
            weights[t] = temperaturesK[t] > 0 ? Weight(EstimatedError(probes, cellMeasure, dimension, temperaturesK[t], plainHeatCapacityJPerK[t])) : 0;
        }

        return weights;
    }

    /// <summary>
    /// The estimated relative error of the plain sum's Cv at temperature T (infinite where it is not to be used). For each
    /// probed R and acoustic branch b: the cone table's error at dy = hbar c_eff q_R / kT (a d-th of it: the calibration
    /// lattice has d pairs alike) times the branch's long-wave Cv, (2 pi^2 / 15) kB (kT / hbar)^3 V &lt;c_b^-3&gt; in 3D,
    /// (3 zeta(3) / pi) kB (kT / hbar)^2 A &lt;c_b^-2&gt; in 2D (Ashcroft and Mermin eq. 23.30 with the direction mean of
    /// c^-d, here over the probed directions; the 2D one derived the same way), at most the plain sum's Cv, over the plain
    /// sum's Cv. c_eff sets how far the poles lie from the real wave vectors along R: shifting q by i eta keeps tr c(D)
    /// analytic while hbar c_b(eta) |eta| &lt; 2 pi kT in every direction of eta, so the Fourier term at R falls as
    /// exp(-(2 pi kT / hbar) |R| max_u (u . R^) / c_b(u)) (common practice, no source; for omega^2 = q A q it is
    /// exp(-(2 pi kT / hbar) sqrt(R A^-1 R)), the isotropic cone's after q -> A^-1/2 q), so 1 / c_eff = max over the probed
    /// directions u of |u . R^| / c_b(u) (a maximum over fewer directions, so c_eff errs high): a branch fast along R and slow
    /// in a direction with a part along R has its term at R fall faster than its speed along R says. Measured: hexagonal
    /// 11^3 at 26.4 K, 3.9e-4 against an error of 3.6e-4 (Round 29's c_min^(d-1) c_R weights read 9.3e-2). It under-reads a
    /// simple cubic crystal 2.4-13 fold (Round 29's: 1.5-5 fold; the sorted top branch's mean misses that the x-polarised
    /// branch is slow across x, and neither sees the branch's bending), and it sees the cones only, not an optical branch's
    /// poles: docs/outside-checks.md, Round 30 (low-temperature coarse meshes).
    /// </summary>
    public static double EstimatedError(IReadOnlyList<LongWaveProbe>? probes, double cellMeasure, int dimension, double temperatureK, double plainHeatCapacityJPerK)
    {
        if (probes is null || probes.Count == 0 || !(temperatureK > 0) || !(plainHeatCapacityJPerK > 0))
        {
            return double.PositiveInfinity;
        }

        var thermalOmega = Kb * temperatureK / Hbar;
        var prefactor = dimension == 3 ? 2 * Math.PI * Math.PI / 15 : 3 * 1.2020569031595942 / Math.PI;
        var branches = probes[0].OmegaRadPerS.Length;
        var error = 0.0;
        for (var b = 0; b < branches; b++)
        {
            var inverseMean = 0.0;
            foreach (var probe in probes)
            {
                inverseMean += Math.Pow(probe.QPerM / probe.OmegaRadPerS[b], dimension);
            }

            inverseMean /= probes.Count;
            var branchHeatCapacity = Math.Min(prefactor * Kb * Math.Pow(thermalOmega, dimension) * inverseMean * cellMeasure, plainHeatCapacityJPerK);
            foreach (var probe in probes)
            {
                var slowness = 0.0;
                foreach (var other in probes)
                {
                    slowness = Math.Max(slowness, Math.Abs(probe.Direction.Dot(other.Direction)) * other.QPerM / other.OmegaRadPerS[b]);
                }

                error += ConeError(probe.QPerM / slowness / thermalOmega) / dimension * branchHeatCapacity;
            }
        }

        var relative = error / plainHeatCapacityJPerK;
        return relative >= 0 ? relative : double.PositiveInfinity;
    }

    /// <summary>
    /// The weight of the plain sum (0: the density of states' sums alone, 1: the plain sum alone) for an estimated relative
    /// error (<see cref="EstimatedError"/>), log-linear in it between <see cref="PlainAloneError"/> and <see cref="PlainUnusedError"/>.
    /// Not widened where the two sums disagree by far more than the estimate: the estimate sees the acoustic cones only, and
    /// a hexagonal sheet on 15 x 15 at 9.4 K read 1.4e-3 with the two sums 1.5e-2 apart, where the plain sum was the one
    /// 1.4e-2 off (docs/outside-checks.md, Round 30 (low-temperature coarse meshes)).
    /// </summary>
    public static double Weight(double error)
    {
        if (error <= PlainAloneError)
        {
            return 1;
        }

        if (error >= PlainUnusedError)
        {
            return 0;
        }

        return Math.Log(PlainUnusedError / error) / Math.Log(PlainUnusedError / PlainAloneError);
    }

    /// <summary>The cone table read log-linearly in the error; below its first step the error is taken as its first value.</summary>
    public static double ConeError(double stepY)
    {
        var table = ConeErrorTable;
        if (stepY <= table[0].StepY)
        {
            return table[0].Error;
        }

        for (var i = 1; i < table.Length; i++)
        {
            // Past the table: its last segment extended (the plain sum then holds little more than q = 0's modes).
            if (stepY <= table[i].StepY || i == table.Length - 1)
            {
                var (x0, e0) = table[i - 1];
                var (x1, e1) = table[i];
                var f = (stepY - x0) / (x1 - x0);
                return Math.Exp(Math.Log(e0) + (f * (Math.Log(e1) - Math.Log(e0))));
            }
        }

        return double.PositiveInfinity;
    }

    /// <summary>
    /// The plain sums' U (J per cell) and Cv (J/K per cell) at T over every mode of the mesh (q = 0's rigid modes count
    /// kT and kB, their limit), and, in the same pass, the sum of ln(2 sinh(x/2)) = x/2 + ln(1 - e^-x) over every mode but the
    /// <paramref name="rigid"/> lowest at q = 0 (whose modes start at <paramref name="gammaStart"/>), for
    /// <see cref="GammaCellSums.FreeJ"/>: ln(1 - e^-x) = -ln(1 + n) from the occupation n this pass has already, where a pass of
    /// its own cost an exp and two logs a mode at every temperature (9.5 ms a temperature on a 40^3 two-site mesh,
    /// bench/README.md Round 30 (lead)).
    /// </summary>
    public static (double InternalJ, double HeatCapacityJPerK, double FreeLogSum) SumsWithFree(double[] frequencyThz, int branches, double temperatureK, long gammaStart, int rigid)
    {
        var kt = Kb * temperatureK;
        double u = 0, cv = 0, free = 0;
        for (long i = 0; i < frequencyThz.Length; i++)
        {
            var f = frequencyThz[i];
            var atGamma = i >= gammaStart && i < gammaStart + branches;
            var x = Hbar * 2 * Math.PI * 1e12 * Math.Max(0, f) / kt;
            if (x < 1e-4)
            {
                // Series: (x/2) coth(x/2) = 1 + x^2/12, c = 1 - x^2/12 (x^4 terms below 1e-17).
                u += 1 + (x * x / 12);
                cv += 1 - (x * x / 12);
                if (!atGamma)
                {
                    free += FreeTerm(Hbar * 2 * Math.PI * 1e12 * f / kt);
                }

                continue;
            }

            if (x > 700)
            {
                u += x / 2;
                if (!atGamma)
                {
                    free += x / 2;
                }

                continue;
            }

            var em1 = Numerics.SmallFunctions.ExpM1(x);
            var occupation = 1.0 / em1;
            u += (x / 2) + (x * occupation);
            cv += x * x * occupation * (1.0 + occupation); // n (n + 1) = e^x / (e^x - 1)^2, without e^x's overflow near x = 700
            if (!atGamma)
            {
                // ln(1 - e^-x) = -ln(1 + n); below 1e-8, n itself (n^2 / 2 is under 1e-16 of it).
                free += (x / 2) - (occupation < 1e-8 ? occupation : Math.Log(1 + occupation));
            }
        }

        // q = 0's modes but its rigid translations, lowest first.
        var at = frequencyThz.AsSpan((int)gammaStart, branches).ToArray();
        Array.Sort(at);
        for (var k = rigid; k < branches; k++)
        {
            free += FreeTerm(Hbar * 2 * Math.PI * 1e12 * at[k] / kt);
        }

        var points = (double)frequencyThz.Length / branches;
        return (kt * u / points, Kb * cv / points, free);
    }

    /// <summary>ln(2 sinh(x/2)) = x/2 + ln(1 - e^-x), for the few modes the pass above does not reach by its occupation.</summary>
    private static double FreeTerm(double x) => x > 40 ? x / 2 : (x / 2) + Math.Log(-Numerics.SmallFunctions.ExpM1(-x));

    private static double[] LowestOmegas(ModeSolver solver, Vec3 qPerM, int count)
    {
        solver.SolveValues(qPerM);
        var sorted = solver.Values.Order().Take(count).ToArray();
        return [.. sorted.Select(v => Math.Sqrt(Math.Max(0, v)))];
    }

}

/// <summary>The acoustic branches' angular frequencies (rad/s, ascending) at q_R, the mesh step 2 pi / |R| along a superlattice vector R (Direction: R's unit vector).</summary>
internal sealed record LongWaveProbe(double QPerM, Vec3 Direction, double[] OmegaRadPerS);
