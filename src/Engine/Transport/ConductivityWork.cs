using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;

namespace LatticeSweep.Engine.Transport;

/// <summary>A rough count of the floating-point work the conductivity pass adds to a point, for sizing work before it starts.</summary>
public static class ConductivityWork
{
    /// <summary>
    /// Eigen-solves with vectors over half the wave vectors (plus 1/2^d more for the convergence
    /// mesh), each ~36 n^3 (Householder and QL with vectors in complex arithmetic, and three
    /// derivative expectations), ~100 operations per mode and temperature (two exponentials), and
    /// for a bulk mesh the q = 0 cell: seven solves per ray (the optical branches, the long-wave slope
    /// and five nodes of the acoustic dispersion) and 240 radial nodes per acoustic branch and
    /// temperature. 0 when not asked.
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
        var solves = points / 2 * (passes == 2 ? 1 + Math.Pow(2, -d) : 1);
        var temperatures = options.TemperaturesK.Length + 1;
        var rays = bulk ? passes * d * Math.Pow(GammaCellIntegrator.FaceNodes(d), d - 1) : 0;
        return (solves + (7 * rays)) * 36 * n * n * n
            + solves * n * temperatures * 100
            + rays * model.ComponentsPerSite * 240 * temperatures * 100
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

        var rays = 3 * Math.Pow(GammaCellIntegrator.FaceNodes(3), 2);
        var total = 0.0;
        int[][] meshes = c.CheckMeshConvergence ? [[b.M1, b.M2, b.M3], [b.M1 / 2, b.M2 / 2, b.M3 / 2]] : [[b.M1, b.M2, b.M3]];
        foreach (var mesh in meshes)
        {
            if (mesh.Min() >= 1 && LongWaveHandover.RayNodes3D(model.Lattice, mesh) is { } nodes)
            {
                total += rays * nodes * ((36 * n * n * n) + (n * temperatures * 100));
            }
        }

        return total;
    }
}
