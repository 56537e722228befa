using System.Collections.Immutable;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Units;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Sound speeds averaged over directions, for the channels and estimates that need one speed per
/// branch or one Debye speed. Along each direction u the acoustic slopes come from two small wave
/// vectors with Richardson extrapolation, v^2 = (4 l(e) - l(2e)/4) / (3 e^2) (as in the engine's
/// sound-speed finder; common practice, no source). Directions: 3D, 8 Gauss-Legendre cosines on
/// the upper hemisphere x 16 uniform azimuths (omega(-q) = omega(q) covers the lower one); 2D, 16
/// azimuths on a half circle; 1D, the chain axis. Speeds are sorted slowest first per direction.
/// The rule is doubled in every direction count while a doubling moves v_D or a branch mean by more
/// than <see cref="Tolerance"/>: the sorted slow branch of an anisotropic crystal has kinks the fixed
/// rule missed (v_D 1.4 % high for a simple cubic model with speeds 4.7 : 1; docs/outside-checks.md,
/// Round 12). A model the first rule already meets keeps that rule's numbers.
/// </summary>
internal sealed record AcousticAverages
{
    /// <summary>Direction average of each acoustic branch's speed, slowest first (m/s).</summary>
    public required ImmutableArray<double> MeanSpeedsMPerS { get; init; }

    /// <summary>v_D with v_D^-d = mean over branches and directions of v^-d (m/s).</summary>
    public required double DebyeSpeedMPerS { get; init; }

    /// <summary>theta_a = hbar v_D k_D / kB with k_D from one acoustic set per primitive cell (K).</summary>
    public required double AcousticDebyeTemperatureK { get; init; }

    /// <summary>False when a slope squared is not positive (unstable or floppy long waves); a q^2 branch counts as stable, speed 0.</summary>
    public required bool Stable { get; init; }

    /// <summary>Largest change of v_D or of a branch mean (relative to the fastest) a doubling may make.</summary>
    internal const double Tolerance = 5e-5;

    /// <summary>Doublings at most: 3D 64 cosines x 128 azimuths, 2D 128 azimuths.</summary>
    internal const int MostDoublings = 3;

    public static AcousticAverages Measure(ModeSolver solver)
    {
        var crystal = solver.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var d = lattice.Dimension;
        var branches = crystal.Components;
        var (sums, inverseSum, stable) = Sweep(solver, 0);
        for (var level = 1; stable && d > 1 && level <= MostDoublings; level++)
        {
            var finer = Sweep(solver, level);
            var settled = finer.Stable && Agrees(sums, inverseSum, finer.Sums, finer.InverseSum, branches, d);
            if (settled && level == 1)
            {
                break; // the first rule was good enough: keep its numbers
            }

            (sums, inverseSum, stable) = finer;
            if (settled)
            {
                break;
            }
        }

        if (!stable)
        {
            return new AcousticAverages
            {
                MeanSpeedsMPerS = [.. Enumerable.Repeat(double.NaN, branches)],
                DebyeSpeedMPerS = double.NaN,
                AcousticDebyeTemperatureK = double.NaN,
                Stable = false,
            };
        }

        var debye = Math.Pow(inverseSum / branches, -1.0 / d);
        return new AcousticAverages
        {
            MeanSpeedsMPerS = [.. sums],
            DebyeSpeedMPerS = debye,
            AcousticDebyeTemperatureK = PhysicalConstants.HbarJS * debye * DebyeWaveNumber(lattice) / PhysicalConstants.BoltzmannJPerK,
            Stable = true,
        };
    }

    /// <summary>
    /// Directions <see cref="Measure"/> will solve (two eigenvalue solves each), for the run-time forecast: the first two
    /// rules are swept as Measure sweeps them, so the count is exact where they settle; beyond, each doubling is taken to
    /// shrink their disagreement fourfold (second order: the sorted branches' speeds have kinks where they cross), up to
    /// the last doubling. Costs the first two rules' solves (640 directions in 3D).
    /// </summary>
    internal static int ForecastDirections(ModeSolver solver)
    {
        var d = solver.Matrix.Crystal.Lattice.Dimension;
        var count = DirectionCount(d, 0);
        var (sums, inverseSum, stable) = Sweep(solver, 0);
        if (!stable || d == 1)
        {
            return count;
        }

        var finer = Sweep(solver, 1);
        count += DirectionCount(d, 1);
        if (!finer.Stable)
        {
            return count;
        }

        var disagreement = Disagreement(sums, inverseSum, finer.Sums, finer.InverseSum, solver.Matrix.Crystal.Components, d);
        for (var level = 2; level <= MostDoublings && !(disagreement <= 1); level++)
        {
            count += DirectionCount(d, level);
            disagreement /= 4;
        }

        return count;
    }

    /// <summary>Directions of the rule doubled <paramref name="level"/> times (<see cref="Directions"/>).</summary>
    internal static int DirectionCount(int dimension, int level) => dimension switch
    {
        1 => 1,
        2 => 16 << level,
        _ => (8 << level) * (16 << level),
    };

    /// <summary>The largest change a doubling made, in units of its tolerance: at most 1 exactly when <see cref="Agrees"/> (infinite where undefined).</summary>
    private static double Disagreement(double[] sums, double inverseSum, double[] finerSums, double finerInverseSum, int branches, int d)
    {
        var debye = Math.Pow(inverseSum / branches, -1.0 / d);
        var finerDebye = Math.Pow(finerInverseSum / branches, -1.0 / d);
        var worst = Relative(Math.Abs(finerDebye - debye), Tolerance * finerDebye);
        var fastest = finerSums.Max();
        for (var k = 0; k < branches; k++)
        {
            worst = Math.Max(worst, Relative(Math.Abs(finerSums[k] - sums[k]), Tolerance * fastest));
        }

        return worst;

        // As the test change <= tolerance reads: a change past the tolerance stays past 1 where the division rounds to 1,
        // a zero tolerance holds only a zero change, and NaN (an unstable sweep) never agrees.
        static double Relative(double change, double tolerance) =>
            change <= tolerance ? (tolerance > 0 ? change / tolerance : 0)
            : tolerance > 0 && double.IsFinite(change / tolerance) ? Math.Max(change / tolerance, Math.BitIncrement(1.0)) : double.PositiveInfinity;
    }

    /// <summary>Direction sums of each sorted branch's speed and of v^-d on the rule doubled <paramref name="level"/> times.</summary>
    private static (double[] Sums, double InverseSum, bool Stable) Sweep(ModeSolver solver, int level)
    {
        var crystal = solver.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var d = lattice.Dimension;
        var branches = crystal.Components;
        var epsilon = 1e-3 * SmallestReciprocal(lattice);
        var sums = new double[branches];
        var inverseSum = 0.0;
        var stable = true;
        var speeds = new double[branches];
        foreach (var (u, w) in Directions(d, level))
        {
            solver.SolveValues(epsilon * u);
            var near = solver.Values.AsSpan(0, branches).ToArray();
            solver.SolveValues(2 * epsilon * u);
            for (var k = 0; k < branches; k++)
            {
                // A branch with omega ~ q^2 (a sheet's flexural branch) has no slope but is stable: speed 0,
                // left out of the Debye speed's sum like any zero speed; the kinetic sum follows it on its rays.
                if (LongWaveSlope.IsQuadratic(near[k], solver.Values[k]))
                {
                    speeds[k] = 0;
                    continue;
                }

                var v2 = LongWaveSlope.SpeedSquared(near[k], solver.Values[k], epsilon);
                stable &= v2 > 0;
                speeds[k] = v2 > 0 ? Math.Sqrt(v2) : 0;
            }

            Array.Sort(speeds);
            for (var k = 0; k < branches; k++)
            {
                sums[k] += w * speeds[k];
                inverseSum += speeds[k] > 0 ? w * Math.Pow(speeds[k], -d) : 0;
            }
        }

        return (sums, inverseSum, stable);
    }

    private static bool Agrees(double[] sums, double inverseSum, double[] finerSums, double finerInverseSum, int branches, int d) =>
        Disagreement(sums, inverseSum, finerSums, finerInverseSum, branches, d) <= 1;

    /// <summary>
    /// k_D of a d-dimensional Debye sphere holding one state per primitive cell: 1D pi / a,
    /// 2D sqrt(4 pi / A), 3D (6 pi^2 / V)^(1/3) (Kittel, Introduction to Solid State Physics, ch. 5).
    /// </summary>
    public static double DebyeWaveNumber(Lattice lattice) => lattice.Dimension switch
    {
        1 => Math.PI / lattice.CellMeasure,
        2 => Math.Sqrt(4 * Math.PI / lattice.CellMeasure),
        _ => Math.Cbrt(6 * Math.PI * Math.PI / lattice.CellMeasure),
    };

    public static double SmallestReciprocal(Lattice lattice)
    {
        var b = double.PositiveInfinity;
        for (var k = 0; k < lattice.Dimension; k++)
        {
            b = Math.Min(b, lattice.ReciprocalVector(k).Length);
        }

        return b;
    }

    /// <summary>Unit directions with weights summing to 1, covering the directions up to u -> -u; each level doubles both counts.</summary>
    private static IEnumerable<(Vec3 Direction, double Weight)> Directions(int dimension, int level)
    {
        var azimuths = 16 << level;
        if (dimension == 1)
        {
            yield return (new Vec3(1, 0, 0), 1.0);
            yield break;
        }

        if (dimension == 2)
        {
            for (var j = 0; j < azimuths; j++)
            {
                var phi = Math.PI * (j + 0.5) / azimuths;
                yield return (new Vec3(Math.Cos(phi), Math.Sin(phi), 0), 1.0 / azimuths);
            }

            yield break;
        }

        var rule = new GaussLegendreRule(0.0, 1.0, 8 << level);
        for (var i = 0; i < rule.Abscissas.Length; i++)
        {
            var mu = rule.Abscissas[i];
            var s = Math.Sqrt(1 - mu * mu);
            for (var j = 0; j < azimuths; j++)
            {
                var phi = 2 * Math.PI * (j + 0.5) / azimuths;
                yield return (new Vec3(s * Math.Cos(phi), s * Math.Sin(phi), mu), rule.Weights[i] / azimuths);
            }
        }
    }
}
