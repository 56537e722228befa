using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>What a bulk point's work depends on beyond its sizes, found before it is solved (<see cref="PhononSolver.PlanBulkPoint"/>).</summary>
/// <param name="RegionSolves">Long-wave solves of the rays of the boxes the point keeps (each box's face rule times the solves per ray).</param>
/// <param name="TrialSolves">Long-wave solves of the probe samples of the wider boxes tried for the slower cones (3D).</param>
/// <param name="ChosenRays">Rays of every face rule chosen on the way (choosing one tries the smaller candidates against twice
/// their nodes, so its cost grows with the rule it ends at).</param>
/// <param name="PanelledRules">Face rules chosen on the way that are panelled (each choice costs tens of milliseconds: the
/// panels are refined on the long-wave form's direction average).</param>
/// <param name="HighestThz">The highest frequency on a coarse mesh of at most 4 points per direction (with Gaussian broadening
/// the fine grid spans the spectrum, so the bins one mode's Gaussian covers fall as it widens).</param>
public sealed record BulkPointPlan(int RegionSolves, int TrialSolves, int ChosenRays, int PanelledRules, double HighestThz)
{
    public int LongWaveSolves => RegionSolves + TrialSolves;
}

public static partial class PhononSolver
{
    /// <summary>Eigen-solves per long-wave ray: its nodes and the two small steps of its slope.</summary>
    public static int LongWaveSolvesPerRay => Dos.LongWavePlan.SolvesPerRay;

    /// <summary>Points per direction of the coarse mesh <see cref="BulkPointPlan.HighestThz"/> is read from.</summary>
    private const int CoarsePointsPerAxis = 4;

    /// <summary>
    /// The long-wave solves of a bulk point, found by the choices the solver makes (box, groups of branches,
    /// face rules, wider-box trials) from the mesh frequencies near q = 0 alone, and the spectrum's top on a coarse
    /// mesh: a few hundred to a few thousand small solves, meant to be made once per distinct model and mesh (the
    /// run-time forecast caches it). What cannot be known before the rays are measured (a slower cone's box given
    /// up when its rays flatten, a trial that passes its probe and is then built whole) is left out. No long waves
    /// with Gaussian broadening.
    /// </summary>
    public static BulkPointPlan PlanBulkPoint(CrystalModel model, BulkSample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        var solver = new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model)));
        var counts = options.DosMethod == DosMethod.Gaussian ? default : Dos.LongWavePlan.Count(solver, sample);
        return new BulkPointPlan(counts.RegionSolves, counts.TrialSolves, counts.ChosenRays, counts.PanelledRules, CoarseHighestThz(solver, sample));
    }

    private static double CoarseHighestThz(ModeSolver solver, BulkSample sample)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        int Count(int axis) => Math.Min(sample[axis], CoarsePointsPerAxis);
        var highest = 0.0;
        for (var i1 = 0; i1 < Count(0); i1++)
        {
            for (var i2 = 0; i2 < Count(1); i2++)
            {
                for (var i3 = 0; i3 < Count(2); i3++)
                {
                    var reduced = new Vec3(PeriodicGrid.Reduced(i1, Count(0)), PeriodicGrid.Reduced(i2, Count(1)), PeriodicGrid.Reduced(i3, Count(2)));
                    solver.SolveValues(lattice.ToCartesianQ(reduced));
                    highest = Math.Max(highest, ModeSolver.SignedThz(solver.Values[solver.Size - 1]));
                }
            }
        }

        return highest;
    }
}
