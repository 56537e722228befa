using System.Diagnostics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Bench;

/// <summary>
/// Free nanocrystals (issue 11): the dense real-space solver on about 2,000 atoms, the kernel
/// polynomial method on about 10^5 atoms against a denser run, and the memory of about 10^6 atoms.
/// Ours alone (no peer). Each part runs in its own process so its peak working set is its own. The
/// model is an invented fcc crystal with central nearest-neighbour springs (as in the tests).
/// </summary>
internal static class SurfaceCase
{
    private static readonly SolveOptions Options = new() { TemperaturesK = [10, 50, 100, 300], ReferenceTemperatureK = 300 };

    private static CrystalModel Model() =>
        CrystalModel.Create(Lattice.FaceCentredCubic(0.40), [new Site("M", "M", Vec3.Zero, 50.0)], [new ShellSpring("M", "M", 1, 15.0)]);

    /// <summary>The blocked dense solver against the small-matrix solver (Householder + QL) on random symmetric matrices, then a 2,000-atom sphere.</summary>
    public static Dictionary<string, object> Dense(int[] eigenSizes, double radiusNm)
    {
        var report = new Dictionary<string, object>();
        var sizes = new List<object>();
        foreach (var n in eigenSizes)
        {
            var rng = new Random(n);
            var a = new double[n * n];
            for (var i = 0; i < n; i++)
            {
                for (var j = 0; j <= i; j++)
                {
                    a[(i * n) + j] = a[(j * n) + i] = rng.NextDouble() - 0.5;
                }
            }

            var values = new double[n];
            var blocked = Time(() => SymmetricEigenSolver.Solve((double[])a.Clone(), n, values, (_, _, _) => { }));
            var vectors = new double[n * n];
            var small = Time(() => HermitianEigenSolver.EigenSystem(a, n, values, vectors));
            sizes.Add(new Dictionary<string, object> { ["n"] = n, ["blocked_s"] = blocked.Wall, ["blocked_cpu_s"] = blocked.Cpu, ["householder_ql_s"] = small.Wall, ["householder_ql_cpu_s"] = small.Cpu });
            Console.Error.WriteLine($"  eigen n = {n}: blocked {blocked.Wall:F2} s (cpu {blocked.Cpu:F2}), Householder + QL {small.Wall:F2} s (cpu {small.Cpu:F2}): {small.Cpu / blocked.Cpu:F1}x");
        }

        report["eigen_with_vectors"] = sizes;
        var sample = RealSpaceSample.Sphere(radiusNm) with { Method = RealSpaceMethod.Dense, DenseMaxAtoms = RealSpaceSample.HardDenseMaxAtoms };
        Engine.Results.PointResult? result = null;
        var t = Time(() => result = PhononSolver.Solve(Model(), sample, Options));
        report["sphere"] = Describe(result!, t);
        Console.Error.WriteLine($"  dense sphere: {result!.Surface!.AtomCount} atoms, {t.Wall:F1} s (cpu {t.Cpu:F1} s), peak {Peak() >> 20} MiB");
        return report;
    }

    /// <summary>
    /// The kernel polynomial method with the default settings, or (<paramref name="denser"/>) twice the
    /// moments and twice the vectors with other random vectors, or given <paramref name="settings"/>
    /// (the memory case: the memory does not depend on the moment and vector counts, the time does linearly).
    /// </summary>
    public static Dictionary<string, object> Kpm(double radiusNm, bool denser, KpmSettings? settings = null)
    {
        var sample = RealSpaceSample.Sphere(radiusNm) with { Method = RealSpaceMethod.KernelPolynomial };
        if (denser)
        {
            sample = sample with { Kpm = new KpmSettings { Moments = 2 * sample.Kpm.Moments, RandomVectors = 2 * sample.Kpm.RandomVectors, Seed = 97 } };
        }

        if (settings is not null)
        {
            sample = sample with { Kpm = settings };
        }

        Engine.Results.PointResult? result = null;
        var t = Time(() => result = PhononSolver.Solve(Model(), sample, Options));
        Console.Error.WriteLine($"  kpm sphere ({sample.Kpm.Moments} moments, {sample.Kpm.RandomVectors} vectors): {result!.Surface!.AtomCount} atoms, {t.Wall:F1} s (cpu {t.Cpu:F1} s), peak {Peak() >> 20} MiB");
        Console.Error.WriteLine($"    Cv(300 K) {result.Summary.HeatCapacityJPerMolK:F5} +- {result.Errors?.HeatCapacityJPerMolK:G3}, DOS integral {DosIntegral(result):F6}");
        return Describe(result, t);
    }

    private static double DosIntegral(Engine.Results.PointResult r) => r.Dos.Total.Sum() * (r.Dos.FrequencyThz[1] - r.Dos.FrequencyThz[0]);

    private static Dictionary<string, object> Describe(Engine.Results.PointResult r, (double Wall, double Cpu) t)
    {
        var d = new Dictionary<string, object>
        {
            ["atoms"] = r.Surface!.AtomCount,
            ["method"] = r.Surface.Method,
            ["wall_s"] = t.Wall,
            ["cpu_s"] = t.Cpu,
            ["peak_working_set_bytes"] = Peak(),
            ["dos_integral"] = DosIntegral(r),
            ["cv_300k"] = r.Summary.HeatCapacityJPerMolK ?? double.NaN,
            ["cv_by_temperature"] = r.Thermal.Select(x => new[] { x.TemperatureK, x.HeatCapacityJPerMolK }).ToList(),
        };
        if (r.Errors is { } e)
        {
            d["cv_300k_stderr"] = e.HeatCapacityJPerMolK ?? double.NaN;
            d["cv_stderr_by_temperature"] = e.Thermal.Select(x => x.HeatCapacityJPerMolK).ToList();
            d["moments"] = r.Surface.KpmMoments ?? 0;
            d["random_vectors"] = r.Surface.KpmRandomVectors ?? 0;
        }

        return d;
    }

    private static long Peak()
    {
        var p = Process.GetCurrentProcess();
        p.Refresh();
        return p.PeakWorkingSet64;
    }

    private static (double Wall, double Cpu) Time(Action run)
    {
        var cpu0 = Environment.CpuUsage.TotalTime;
        var sw = Stopwatch.StartNew();
        run();
        return (sw.Elapsed.TotalSeconds, (Environment.CpuUsage.TotalTime - cpu0).TotalSeconds);
    }
}
