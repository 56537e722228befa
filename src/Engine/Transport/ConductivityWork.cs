using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
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
    /// solves (1D and 2D), each like a mesh point's. 0 when not asked.
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
            + raysD * model.ComponentsPerSite * 240 * temperatures * 100
            + HandoverRayFlops(model, sample, c, n, temperatures);
    }

    /// <summary>
    /// 3D hand-over (<see cref="HandoverRays"/>): where the zone holds a window, the default face rule's
    /// rays continued past the q = 0 cell, each with its radial nodes solved with vectors, and every mode
    /// at every temperature. Counted whenever a window fits (the temperatures that use it are known only
    /// after the long-wave solves), for the main mesh and the check mesh alike; panelled rules of strongly
    /// anisotropic models take up to ~30 times the rays.
    /// </summary>
    private static double HandoverRayFlops(CrystalModel model, Sample sample, ConductivityOptions c, double n, int temperatures)
    {
        if (sample is not BulkSample b || model.Lattice.Dimension != 3)
        {
            return 0;
        }

        // The check mesh gets a window only where this mesh has one, down to fewer of its spacings
        // (LongWaveHandover.OnCoarserMesh).
        var rays = 3 * Math.Pow(GammaCellIntegrator.FaceNodes(3), 2);
        var perNode = (36 * n * n * n) + (n * temperatures * 100);
        if (LongWaveHandover.RayNodes3D(model.Lattice, [b.M1, b.M2, b.M3]) is not { } nodes)
        {
            return 0;
        }

        var total = rays * nodes * perNode;
        int[] half = [b.M1 / 2, b.M2 / 2, b.M3 / 2];
        if (c.CheckMeshConvergence && half.Min() >= 1
            && LongWaveHandover.RayNodes3D(model.Lattice, half, LongWaveHandover.CheckMinimumWidthSpacings) is { } coarseNodes)
        {
            total += rays * coarseNodes * perNode;
        }

        return total;
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
        var defaultRays = passes * d * (int)Math.Pow(GammaCellIntegrator.FaceNodes(d), d - 1);
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

        var handover = LongWaveHandover.Plan(new ModeSolver(new DynamicalMatrix(crystal)), crystal.Lattice, mesh, temperatures);
        var nodes = handover?.NodeSolveCount() ?? 0;
        if (c.CheckMeshConvergence && handover?.OnCoarserMesh([mesh[0] / 2, d >= 2 ? mesh[1] / 2 : 1, d >= 3 ? mesh[2] / 2 : 1]) is { } coarse)
        {
            nodes += coarse.NodeSolveCount();
        }

        return (rays, nodes);
    }
}
