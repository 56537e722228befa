using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// A bulk mesh's vibrational free energy as the plain sum over its modes (every mesh point and branch with
/// the same weight, 1 / mesh points; J per cell, one value per temperature of the solve), asked for by the
/// quasi-harmonic loop. Less accurate than the density-of-states integral (the q = 0 cell and the long
/// waves are left to the mesh), but smooth in the volume: every volume sums the same q points with the same
/// weights, where the DOS integral's simplices, bins and long-wave boxes change with the frequencies and
/// leave a jitter of 1e-7 to 1e-6 of F_vib from volume to volume that V F'' amplifies (docs/outside-checks.md,
/// Round 29). The loop takes the volume dependence (F'') from these sums and the DOS integral's difference
/// from them as a straight line.
/// </summary>
/// <param name="FreeEnergyJ">F_vib per cell (J) at each temperature.</param>
internal sealed record MeshModeSums(double[] FreeEnergyJ)
{
    /// <summary>
    /// exp(mean of ln |q| over a mesh cell centred on q = 0, minus the mean of ln |q| over its 3^d - 1
    /// neighbouring points), |q| in mesh steps: d = 1 exactly (ln(1/2) - 1), d = 2 and 3 by Monte Carlo
    /// over 8e6 and 4e6 points. The q = 0 cell's acoustic modes are counted at this fraction of their
    /// neighbours' geometric mean frequency, as a linear branch gives; only how that frequency moves with
    /// the volume matters here (the level is absorbed in the DOS integral's straight-line difference).
    /// </summary>
    private static readonly double[] GammaCellFraction = [0, 0.18394, 0.29102, 0.32766];

    /// <summary>
    /// The sums over every mode of the mesh, the zero modes left out (the rigid ones at q = 0 and any of zero
    /// frequency elsewhere, such as a zero valley's floor, 1e-7 of the top frequency as the solver counts
    /// them); the q = 0 cell's acoustic share is filled from its neighbours (<see cref="GammaCellFraction"/>),
    /// which takes the cell's volume dependence (d ln c / dV of the long waves) that leaving it out would lose:
    /// on an 8^3 mesh of an fcc Morse crystal the B_T of the sums is 1.1e-4 off the 32^3 sums' at 800 K with
    /// the fill and 4.9e-4 without (docs/bulk-expansion-check). Null for an unstable mesh (no thermal numbers).
    /// </summary>
    public static MeshModeSums? Of(double[] frequencyThz, PeriodicGrid grid, int branches, int rigid, ReadOnlySpan<double> temperaturesK)
    {
        var zero = 1e-7 * frequencyThz.Max();
        var fill = GammaFill(frequencyThz, grid, branches, rigid, zero);
        if (fill is null)
        {
            return null;
        }

        // F = sum of hbar omega / 2 + kB T ln(1 - e^-x), x = hbar omega / kB T (Ashcroft and Mermin, ch. 23): the half
        // set with its weights (-q has q's frequencies), the zero-point part once, the thermal part per temperature.
        var n = temperaturesK.Length;
        var free = new double[n];
        var zeroPoint = 0.0;
        var hbarOverKb = PhysicalConstants.HbarJS / PhysicalConstants.BoltzmannJPerK;
        var beta = temperaturesK.ToArray().Select(t => t > 0 ? hbarOverKb / t : double.PositiveInfinity).ToArray();
        void Add(double omega, double weight)
        {
            zeroPoint += weight * 0.5 * PhysicalConstants.HbarJS * omega;
            for (var t = 0; t < n; t++)
            {
                var x = beta[t] * omega;
                if (x < 40) // beyond, e^-x < 5e-18: nothing left to add
                {
                    var em1 = SmallFunctions.ExpM1(x);
                    free[t] += weight * Math.Log(em1 / (em1 + 1.0)) / beta[t] * PhysicalConstants.HbarJS;
                }
            }
        }

        const double radPerThz = 2 * Math.PI * 1e12;
        foreach (var point in grid.HalfSet())
        {
            for (var k = point.IsGamma ? rigid : 0; k < branches; k++)
            {
                var f = frequencyThz[point.Index * branches + k];
                if (f < -zero)
                {
                    return null;
                }

                if (f > zero)
                {
                    Add(radPerThz * f, point.Weight);
                }
            }
        }

        Add(radPerThz * fill.Value, rigid);
        var cells = (double)grid.Count;
        return new MeshModeSums([.. free.Select(f => (zeroPoint + f) / cells)]);
    }

    /// <summary>The frequency (THz) the q = 0 cell's rigid branches are counted at, or null when a neighbour's is not positive.</summary>
    private static double? GammaFill(double[] frequencyThz, PeriodicGrid grid, int branches, int rigid, double zero)
    {
        int[] axes = [grid.N1, grid.N2, grid.N3];
        var dimension = axes.Count(m => m > 1);
        var (sumLog, count) = (0.0, 0);
        var lowest = new double[branches];
        for (var d1 = -1; d1 <= 1; d1++)
        {
            for (var d2 = -1; d2 <= 1; d2++)
            {
                for (var d3 = -1; d3 <= 1; d3++)
                {
                    int[] step = [d1, d2, d3];
                    if ((d1, d2, d3) == (0, 0, 0) || Enumerable.Range(0, 3).Any(a => axes[a] == 1 && step[a] != 0))
                    {
                        continue;
                    }

                    var p = grid.Index(Wrap(grid.N1 / 2 + d1, grid.N1), Wrap(grid.N2 / 2 + d2, grid.N2), Wrap(grid.N3 / 2 + d3, grid.N3));
                    Array.Copy(frequencyThz, p * branches, lowest, 0, branches);
                    Array.Sort(lowest);
                    for (var k = 0; k < rigid; k++)
                    {
                        if (lowest[k] <= zero)
                        {
                            return null;
                        }

                        sumLog += Math.Log(lowest[k]);
                        count++;
                    }
                }
            }
        }

        return count == 0 ? null : GammaCellFraction[dimension] * Math.Exp(sumLog / count);
    }

    private static int Wrap(int i, int n) => ((i % n) + n) % n;
}
