using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Transport;

/// <summary>A rough count of the floating-point work the conductivity pass adds to a point, for sizing work before it starts.</summary>
public static class ConductivityWork
{
    /// <summary>
    /// Eigen-solves with vectors over half the wave vectors (plus 1/2^d more for the convergence
    /// mesh), each ~36 n^3 (Householder and QL with vectors in complex arithmetic, and three
    /// derivative expectations), ~100 operations per mode and temperature (two exponentials), and
    /// for a bulk mesh the long waves (<see cref="LongWaveCounts"/>): the q = 0 cell's rays, seven
    /// solves each (the optical branches, the long-wave slope and five nodes of the acoustic
    /// dispersion) and 240 radial nodes per acoustic branch and temperature, and the hand-over's node
    /// solves (per mesh cell in 1D and 2D, along rays in 3D), each like a mesh point's. 0 when not asked.
    /// </summary>
    public static double EstimateFlops(CrystalModel model, Sample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        if (options.Conductivity is not { } c)
        {
            return 0;
        }

        var n = (double)model.BranchCount;
        var d = model.Lattice.Dimension;
        var (points, bulk) = sample switch
        {
            FiniteSample f => ((double)f.CellCount, false),
            BulkSample b => ((double)b.PointCount, true),
            _ => (0.0, false),
        };
        var passes = bulk && c.CheckMeshConvergence ? 2 : 1;
        var temperatures = options.TemperaturesK.Length + 1;
        var (rays, nodes) = sample is BulkSample mesh ? LongWaveCounts(model, mesh, options) : (0, 0);
        var raysD = (double)rays; // products below exceed int
        var solves = (points / 2 * (passes == 2 ? 1 + Math.Pow(2, -d) : 1)) + nodes;
        return (solves + (7 * raysD)) * 36 * n * n * n
            + solves * n * temperatures * 100
            + raysD * model.ComponentsPerSite * 240 * temperatures * 100;
    }

    /// <summary>
    /// Rays of the q = 0 cell (both passes) and node solves of the hand-over (both passes) a bulk point's
    /// conductivity makes, as the calculator plans them: the face rule the model's long waves ask for
    /// (adaptive panels where the default rule on whole faces is not good enough, up to ~16,000 rays
    /// instead of 192) and the hand-over where its temperatures and mesh call for it. Planning them reads
    /// the model's long waves (a few ms; up to ~0.2 s for a model whose faces need many panels), so the
    /// forecast depends on spring constants here. A model that does not build gets the default counts
    /// (its point fails anyway).
    /// </summary>
    public static (int Rays, int NodeSolves) LongWaveCounts(CrystalModel model, BulkSample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        if (options.Conductivity is not { } c)
        {
            return (0, 0);
        }

        var d = model.Lattice.Dimension;
        var passes = c.CheckMeshConvergence ? 2 : 1;
        var defaultRays = passes * CellFaceRule.Uniform(GammaCellIntegrator.FaceNodes(d)).RayCount(d);
        CompiledCrystal crystal;
        try
        {
            crystal = CompiledCrystal.From(model);
        }
        catch (ModelException)
        {
            return (defaultRays, 0);
        }

        double[] temperatures = options.TemperaturesK.Contains(options.ReferenceTemperatureK)
            ? [.. options.TemperaturesK]
            : [.. options.TemperaturesK, options.ReferenceTemperatureK];
        int[] mesh = [sample.M1, sample.M2, sample.M3];
        var lowFrequencyHeavy = c.Umklapp is not null || c.PointDefects is not null;
        var faceRule = Dos.LongWaveFaceRule.ChooseForConductivity(crystal, GammaCellIntegrator.Edges(crystal.Lattice, mesh), temperatures, lowFrequencyHeavy);
        var rays = passes * faceRule.RayCount(d);

        // The hand-over as the calculator plans it: only where some temperature uses it, on the check mesh
        // only where that mesh holds a window, and in 3D along rays on the rule the window itself asks for.
        var handover = LongWaveHandover.Plan(new ModeSolver(new DynamicalMatrix(crystal)), crystal.Lattice, mesh, temperatures);
        var nodes = NodeSolves(handover, crystal, mesh, temperatures, lowFrequencyHeavy);
        int[] half = [mesh[0] / 2, d >= 2 ? mesh[1] / 2 : 1, d >= 3 ? mesh[2] / 2 : 1];
        if (c.CheckMeshConvergence && handover?.OnCoarserMesh(half) is { } coarse)
        {
            nodes += NodeSolves(coarse, crystal, half, temperatures, lowFrequencyHeavy);
        }

        return (rays, nodes);
    }

    /// <summary>
    /// Directions the conductivity's acoustic averages (sound speeds over every direction, for the Debye speed and the
    /// scattering's inputs) solve, two eigenvalue solves each, as <see cref="AcousticAverages.ForecastDirections"/> foresees
    /// them: every conductivity point, finite or bulk, makes this sweep once, and a model whose speeds settle slowly (a
    /// layered stack) takes all three doublings, 10,880 directions in 3D, where a cubic cell settles at 640. Costs the
    /// first two rules' solves; a model that does not build gets the two rules (its point fails anyway).
    /// </summary>
    public static int AcousticDirections(CrystalModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var d = model.Lattice.Dimension;
        try
        {
            return AcousticAverages.ForecastDirections(new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model))));
        }
        catch (ModelException)
        {
            return AcousticAverages.DirectionCount(d, 0) + (d > 1 ? AcousticAverages.DirectionCount(d, 1) : 0);
        }
    }

    /// <summary>
    /// Flop-equivalents of the acoustic averages' solves: two one-matrix eigenvalue solves per direction, each
    /// <see cref="AcousticSolveFixed"/> + <see cref="AcousticSolvePerN2"/> n^2 + <see cref="AcousticSolvePerN3"/> n^3
    /// (building D(q) from the couplings and the tridiagonal reduction; fitted to measured solves, bench/README.md,
    /// Round 27 (finite-stack forecast)).
    /// </summary>
    public static double AcousticFlops(int branches, int directions)
    {
        double n = branches;
        return 2.0 * directions * (AcousticSolveFixed + (AcousticSolvePerN2 * n * n) + (AcousticSolvePerN3 * n * n * n));
    }

    /// <summary>Per acoustic solve, flop-equivalents independent of its size.</summary>
    internal const double AcousticSolveFixed = 2_000;

    /// <summary>Per acoustic solve, flop-equivalents per n^2.</summary>
    internal const double AcousticSolvePerN2 = 33;

    /// <summary>Per acoustic solve, flop-equivalents per n^3.</summary>
    internal const double AcousticSolvePerN3 = 3.0;

    /// <summary>
    /// A pass's hand-over node solves: per mesh cell in 1D and 2D where some temperature uses the window, along
    /// <see cref="HandoverRays"/> in 3D and wherever the whole zone is integrated along rays.
    /// </summary>
    private static int NodeSolves(LongWaveHandover? handover, CompiledCrystal crystal, int[] mesh, double[] temperatures, bool lowFrequencyHeavy)
    {
        if (handover is null)
        {
            return 0;
        }

        var threeD = crystal.Lattice.Dimension == 3;
        var rays = threeD || handover.AnyWholeZone ? HandoverRays.For(handover, crystal, mesh, temperatures, lowFrequencyHeavy).NodeSolveCount() : 0;
        return rays + (!threeD && handover.UsesWindow ? handover.NodeSolveCount() : 0);
    }
}
