using System.Globalization;
using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.Planning.Cost;

namespace LatticeSweep.Bench;

/// <summary>
/// Case "cost": calibrates the Worker's <see cref="PointCost"/> on this engine. Times whole solves
/// (<see cref="PhononSolver.Solve"/>, one core) chosen so that each work term dominates somewhere:
/// finite crystals and bulk meshes, eigenvalues alone and with eigenvectors, 1 to 48 branches,
/// conductivity on and off. Then fits the seconds per unit of every term by non-negative least
/// squares on the relative error, and prints the coefficients and each case's estimate / measured.
/// </summary>
internal static class CostCase
{
    private sealed record Case(string Name, CrystalModel Model, Sample Sample, SolveOptions Options);

    public static Dictionary<string, object> Run(int repeats)
    {
        var cases = Cases();
        var rows = new List<(Case Case, double[] X, double Seconds)>();
        foreach (var c in cases)
        {
            var time = Timing.Measure(() => PhononSolver.Solve(c.Model, c.Sample, c.Options), warmups: 1, repeats, minSeconds: 0.3);
            var x = PointCost.WorkOf(c.Model, c.Sample, c.Options).AsArray();
            // Process CPU time: the engine is single-threaded, and other work on a shared machine
            // disturbs it far less than wall-clock time.
            rows.Add((c, x, time.MedianCpuSeconds));
            Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  {c.Name,-34} {time.MinSeconds * 1e3,10:F2} ms (median {time.MedianSeconds * 1e3:F2}, cpu {time.MedianCpuSeconds * 1e3:F2})"));
        }

        var k = FitNonNegative([.. rows.Select(r => r.X)], [.. rows.Select(r => r.Seconds)]);
        Console.Error.WriteLine("  seconds per unit: " + string.Join(", ", k.Select(v => v.ToString("G3", CultureInfo.InvariantCulture))));
        var ratios = new List<Dictionary<string, object>>();
        foreach (var (c, x, seconds) in rows)
        {
            var estimate = x.Zip(k, (a, b) => a * b).Sum();
            var current = PointCost.Seconds(PointCost.WorkOf(c.Model, c.Sample, c.Options));
            Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  {c.Name,-34} fit/measured {estimate / seconds,6:F2}   in-code/measured {current / seconds,6:F2}"));
            ratios.Add(new() { ["case"] = c.Name, ["measured_s"] = seconds, ["fit_s"] = estimate, ["in_code_s"] = current, ["work"] = x });
        }

        return new() { ["seconds_per_unit"] = k, ["cases"] = ratios };
    }

    private static List<Case> Cases()
    {
        var fcc1 = CrystalModel.Create(Lattice.FaceCentredCubic(0.4), [new Site("A", "A", Vec3.Zero, 30)], [new ShellSpring("A", "A", 1, 20, 3), new ShellSpring("A", "A", 2, 4, 0)]);
        var fcc2 = CrystalModel.Create(Lattice.FaceCentredCubic(0.56),
            [new Site("P", "P", Vec3.Zero, 23), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35)],
            [new ShellSpring("P", "Q", 1, 15, 3), new ShellSpring("P", "P", 1, 3, 0), new ShellSpring("Q", "Q", 1, 3, 0)]);
        var chain = CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10)], degreesOfFreedom: DegreesOfFreedom.Scalar);
        CrystalModel Stack(int r) => LayeredModelBuilder.Build(new LayeredModelSpec(LayeredHost.CubicStack, 0.3, r, MassPattern.TwoBlocks(r / 2, 28, 72), 40, 10));

        var plain = new SolveOptions { TemperaturesK = [10, 50, 100, 200, 300, 500], ReferenceTemperatureK = 300, PartialDos = false, MeanSquareDisplacement = false, ModeListMaxModes = 0 };
        var full = plain with { PartialDos = true, MeanSquareDisplacement = true };
        var manyT = plain with { TemperaturesK = [.. Enumerable.Range(1, 200).Select(i => i * 5.0)] };
        var fullManyT = manyT with { PartialDos = true, MeanSquareDisplacement = true };
        var kappa = plain with { Conductivity = new ConductivityOptions { Constant = new ConstantScattering(1) } };
        return
        [
            new("finite chain 2e6 cells", chain, FiniteSample.Create(2_000_000), plain),
            new("finite chain 2e6 cells, 200 T", chain, FiniteSample.Create(2_000_000), manyT),
            new("finite fcc n=3 48^3", fcc1, FiniteSample.Create(48, 48, 48), plain),
            new("finite fcc n=3 32^3 vectors", fcc1, FiniteSample.Create(32, 32, 32), full),
            new("finite fcc n=6 40^3", fcc2, FiniteSample.Create(40, 40, 40), plain),
            new("finite fcc n=6 24^3 vectors", fcc2, FiniteSample.Create(24, 24, 24), full),
            new("finite stack n=12 24^3", Stack(4), FiniteSample.Create(24, 24, 6), plain),
            new("finite stack n=24 12^3", Stack(8), FiniteSample.Create(12, 12, 3), plain),
            new("finite stack n=24 10^3 vectors", Stack(8), FiniteSample.Create(10, 10, 3), full),
            new("finite stack n=48 8x8x2", Stack(16), FiniteSample.Create(8, 8, 2), plain),
            new("finite stack n=96 4x4x1", Stack(32), FiniteSample.Create(4, 4, 1), plain),
            new("bulk chain mesh 20000", chain, BulkSample.Create(20000), plain),
            new("bulk fcc n=3 mesh 40^3", fcc1, BulkSample.Create(40, 40, 40), plain),
            new("bulk fcc n=3 mesh 32^3 vectors", fcc1, BulkSample.Create(32, 32, 32), full),
            new("bulk fcc n=6 mesh 32^3", fcc2, BulkSample.Create(32, 32, 32), plain),
            new("bulk fcc n=6 mesh 24^3, 200 T", fcc2, BulkSample.Create(24, 24, 24), manyT),
            new("bulk fcc n=6 mesh 24^3 vectors", fcc2, BulkSample.Create(24, 24, 24), full),
            new("bulk fcc n=6 mesh 48^3 vectors", fcc2, BulkSample.Create(48, 48, 48), full), // bench case (b)'s mesh with the job file's defaults
            new("bulk fcc n=6 mesh 48^3 vectors, 200 T", fcc2, BulkSample.Create(48, 48, 48), fullManyT), // as bench case bulk-defaults
            new("bulk fcc n=6 mesh 24x23x22 vectors", fcc2, BulkSample.Create(24, 23, 22), full), // no two counts alike: every tetrahedron
            new("bulk fcc n=6 mesh 40^3 vectors, 7 T", fcc2, BulkSample.Create(40, 40, 40), full with { TemperaturesK = [10, 50, 100, 200, 300, 500, 1000] }), // bench/queue/60ms-points.toml's point
            new("bulk fcc n=6 mesh 24^3 gaussian", fcc2, BulkSample.Create(24, 24, 24), plain with { DosMethod = DosMethod.Gaussian }),
            new("bulk fcc n=6 mesh 40^3 gaussian", fcc2, BulkSample.Create(40, 40, 40), plain with { DosMethod = DosMethod.Gaussian }),
            new("bulk fcc n=6 mesh 24^3 gaussian vectors", fcc2, BulkSample.Create(24, 24, 24), full with { DosMethod = DosMethod.Gaussian }),
            new("bulk fcc n=3 mesh 32^3 gaussian 0.2 THz", fcc1, BulkSample.Create(32, 32, 32), plain with { DosMethod = DosMethod.Gaussian, GaussianSigmaThz = 0.2 }),
            new("bulk stack n=12 mesh 16x16x4", Stack(4), BulkSample.Create(16, 16, 4), plain),
            new("bulk stack n=24 mesh 12x12x3", Stack(8), BulkSample.Create(12, 12, 3), plain),
            new("bulk stack n=48 mesh 8x8x2", Stack(16), BulkSample.Create(8, 8, 2), plain),
            new("finite fcc n=6 12^3 conductivity", fcc2, FiniteSample.Create(12, 12, 12), kappa),
            new("bulk fcc n=6 mesh 12^3 conductivity", fcc2, BulkSample.Create(12, 12, 12), kappa),
            new("finite stack n=24 6x6x2 conductivity", Stack(8), FiniteSample.Create(6, 6, 2), kappa),
            new("finite fcc n=3 4^3 (fixed cost)", fcc1, FiniteSample.Create(4, 4, 4), plain),
        ];
    }

    /// <summary>
    /// Minimises sum_i ((x_i . k - t_i) / t_i)^2 over k >= 0 by projected coordinate descent on the
    /// normal equations of the scaled problem (9 unknowns: converges in a few thousand sweeps).
    /// </summary>
    private static double[] FitNonNegative(double[][] x, double[] t)
    {
        var m = x[0].Length;
        var scale = new double[m];
        for (var j = 0; j < m; j++)
        {
            scale[j] = Math.Max(1e-300, x.Select((row, i) => row[j] / t[i]).Max());
        }

        var h = new double[m, m];
        var g = new double[m];
        for (var i = 0; i < x.Length; i++)
        {
            for (var a = 0; a < m; a++)
            {
                var xa = x[i][a] / t[i] / scale[a];
                g[a] += xa;
                for (var b = 0; b < m; b++)
                {
                    h[a, b] += xa * x[i][b] / t[i] / scale[b];
                }
            }
        }

        var k = new double[m];
        for (var sweep = 0; sweep < 200_000; sweep++)
        {
            for (var a = 0; a < m; a++)
            {
                if (h[a, a] <= 0)
                {
                    continue;
                }

                var grad = -g[a];
                for (var b = 0; b < m; b++)
                {
                    grad += h[a, b] * k[b];
                }

                k[a] = Math.Max(0, k[a] - grad / h[a, a]);
            }
        }

        return [.. k.Select((v, j) => v / scale[j])];
    }
}
