using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// The displacement channels (site x component) moved by acoustic branches with no linear slope, such as
/// a sheet's flexural branch, omega ~ q^2. In an infinite 2D crystal their zero-point mean-square
/// displacement, the mesh average of hbar / (2 m omega), grows as the integral of q dq / q^2: it diverges
/// logarithmically at q = 0 (own derivation; a free membrane's known behaviour, from memory), so any
/// finite number would be set by the mesh (it grew by the same step each time the mesh doubled).
/// </summary>
internal static class QuadraticLongWaves
{
    /// <summary>Share of a zero-slope branch's weight above which a channel counts as moved by it.</summary>
    private const double MovedShare = 1e-6;

    /// <summary>
    /// Channels moved by a zero-slope acoustic branch along any of the directions of
    /// <paramref name="speeds"/> (their slowest speeds exactly 0), or null when there is none.
    /// </summary>
    public static bool[]? Channels(ModeSolver solver, IReadOnlyList<SoundSpeed> speeds)
    {
        if (!speeds.Any(s => s.SpeedsMPerS.Length > 0 && s.SpeedsMPerS[0] == 0))
        {
            return null;
        }

        var lattice = solver.Matrix.Crystal.Lattice;
        var delta = 1e-3 * Enumerable.Range(0, lattice.Dimension).Min(k => lattice.ReciprocalVector(k).Length);
        var directions = SoundSpeedFinder.Directions(lattice.Dimension).ToDictionary(d => d.Label, d => d.Direction);
        var moved = new bool[solver.Size];
        var fractions = new double[solver.Size];
        foreach (var s in speeds)
        {
            var zeroSlope = s.SpeedsMPerS.Count(v => v == 0);
            if (zeroSlope == 0)
            {
                continue;
            }

            solver.SolveWithVectors(delta * directions[s.Direction].Unit());
            for (var mode = 0; mode < zeroSlope; mode++)
            {
                solver.ChannelFractions(mode, fractions);
                for (var c = 0; c < fractions.Length; c++)
                {
                    moved[c] |= fractions[c] > MovedShare;
                }
            }
        }

        return moved;
    }
}
