using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// Sound speeds from the slopes of the acoustic branches at q -> 0 along principal directions:
/// [100], [110], [111] (3D), [10], [11] (2D), the chain axis (1D), in Cartesian axes. The slope
/// uses two small wave vectors and Richardson extrapolation, v^2 = (4 l(d) - l(2d)/4) / (3 d^2),
/// which cancels the q^4 term of omega^2 (common practice, no source).
/// </summary>
internal static class SoundSpeedFinder
{
    /// <summary>The directions of the sound speeds, by label, in Cartesian axes.</summary>
    public static (string Label, Vec3 Direction)[] Directions(int dimension) => dimension switch
    {
        1 => [("[1]", new Vec3(1, 0, 0))],
        2 => [("[10]", new Vec3(1, 0, 0)), ("[11]", new Vec3(1, 1, 0))],
        _ => [("[100]", new Vec3(1, 0, 0)), ("[110]", new Vec3(1, 1, 0)), ("[111]", new Vec3(1, 1, 1))],
    };

    public static List<SoundSpeed> Find(ModeSolver solver)
    {
        var crystal = solver.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var directions = Directions(lattice.Dimension);

        var bMin = double.PositiveInfinity;
        for (var k = 0; k < lattice.Dimension; k++)
        {
            bMin = Math.Min(bMin, lattice.ReciprocalVector(k).Length);
        }

        var delta = 1e-3 * bMin;
        var acoustic = crystal.Components;
        var result = new List<SoundSpeed>(directions.Length);
        foreach (var (label, direction) in directions)
        {
            var u = direction.Unit();
            solver.SolveValues(delta * u);
            var small = solver.Values.Take(acoustic).ToArray();
            solver.SolveValues(2 * delta * u);
            var twice = solver.Values.Take(acoustic).ToArray();
            var largest = solver.Values[^1];
            var speeds = new double[acoustic];
            for (var k = 0; k < acoustic; k++)
            {
                // A slope below round-off is 0: a q^2 branch (a sheet's flexural branch) cancels exactly and left
                // noise of either sign (-0.02 m/s beside 10^4 m/s), read as an unstable slope. A q^2 branch bent by
                // its own dispersion leaves more than round-off (-12 kappa^2 eps e^6: 0.07-3 m/s in the audit's
                // sheets) and is told apart by its growth, as the acoustic averages and long-wave rays do.
                var flat = LongWaveSlope.IsRoundOff(small[k], twice[k], largest) || LongWaveSlope.IsQuadratic(small[k], twice[k]);
                var v2 = flat ? 0 : LongWaveSlope.SpeedSquared(small[k], twice[k], delta);
                speeds[k] = v2 > 0 ? Math.Sqrt(v2) : (v2 < 0 ? -Math.Sqrt(-v2) : 0);
            }

            Array.Sort(speeds);
            result.Add(new SoundSpeed(label, speeds));
        }

        return result;
    }
}
