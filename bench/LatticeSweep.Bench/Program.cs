using System.Diagnostics;
using System.Runtime.Intrinsics.X86;
using System.Text.Json;
using LatticeSweep.Bench;

// Usage: LatticeSweep.Bench CASE --cases FILE --out DIR [--repeats K] [--check-temperatures EVERY]
// CASE: eigen | eigen-paths | bulk | forecast | failure-origin | bulk-defaults | finite-chain | finite-3d | queue | cost | expansion | surfaces-dense | surfaces-kpm |
// surfaces-kpm-denser | surfaces-memory (the surfaces-* cases take only --out). Each case runs in its own process so that its
// peak memory is its own; bench/run.sh runs them all and compares with the NumPy peer.
var argList = args.ToList();
string Option(string name, string fallback)
{
    var i = argList.IndexOf(name);
    return i >= 0 && i + 1 < argList.Count ? argList[i + 1] : fallback;
}

if (argList.Count == 0 || argList[0].StartsWith("--", StringComparison.Ordinal))
{
    Console.Error.WriteLine("usage: LatticeSweep.Bench eigen|bulk|finite-chain|finite-3d --cases bench/cases.json --out DIR [--repeats K]");
    return 2;
}

var caseName = argList[0];
var cases = CaseFile.Load(Option("--cases", "bench/cases.json"));
var outDir = Option("--out", "bench/results");
var repeats = int.Parse(Option("--repeats", "5"), System.Globalization.CultureInfo.InvariantCulture);

// Warm-up solves before the timed ones (cases bulk and bulk-defaults; bench/run.sh gives the peer the same
// number). A solve calls much of its code once, and the runtime re-compiles a method at tier 1 only after
// 30 calls (with dynamic PGO, through an instrumented tier first), so until ~35 solves have run each timed
// solve still runs some tier-0 code and the JIT compiles on the second core, in the timed process CPU.
// 40 measures the steady state a sweep's points run in; the first solve's time is reported beside it.
var bulkWarmups = int.Parse(Option("--warmups", "40"), System.Globalization.CultureInfo.InvariantCulture);
var checkEvery = int.Parse(Option("--check-temperatures", "1"), System.Globalization.CultureInfo.InvariantCulture);
Directory.CreateDirectory(outDir);

var report = new Dictionary<string, object>
{
    ["case"] = caseName,
    ["runtime"] = System.Runtime.InteropServices.RuntimeInformation.FrameworkDescription,
    ["avx2"] = Avx2.IsSupported,
    ["avx512f"] = Avx512F.IsSupported,
    ["vector512_accelerated"] = System.Runtime.Intrinsics.Vector512.IsHardwareAccelerated,
    ["simd_width"] = LatticeSweep.Engine.Numerics.Simd.SimdWidths.Describe(LatticeSweep.Engine.Numerics.Simd.SimdWidths.Active),
};
Console.Error.WriteLine($"  batched kernels: {report["simd_width"]} (AVX2 {Avx2.IsSupported}, AVX-512F {Avx512F.IsSupported})");

switch (caseName)
{
    case "eigen":
        report["peak_gflops_one_core"] = PeakFlops.GflopsPerCore();
        Console.Error.WriteLine($"  measured peak: {(double)report["peak_gflops_one_core"]:F1} Gflop/s on one core ({(System.Runtime.Intrinsics.Vector512.IsHardwareAccelerated ? 512 : 256)}-bit FMA)");
        report["sizes"] = EigenCase.Run(cases, outDir, repeats);
        break;
    case "eigen-paths":
    {
        var sizes = Option("--sizes", "2,3,4,6,9,12,15,18,24,32,48").Split(',').Select(x => int.Parse(x, System.Globalization.CultureInfo.InvariantCulture)).ToArray();
        report["simd_width"] = LatticeSweep.Engine.Numerics.Simd.SimdWidths.Describe(LatticeSweep.Engine.Numerics.Simd.SimdWidths.Active);
        report["sizes"] = EigenPathsCase.Run(Math.Max(3, repeats), sizes);
        break;
    }

    case "cost":
        report["cost"] = CostCase.Run(repeats);
        break;
    case "bulk":
    {
        var (result, time) = SolveCase.Run(cases, "bulk", finite: false, warmups: bulkWarmups, repeats);
        report["result"] = SolveCase.Describe(result, time);
        Console.Error.WriteLine($"  bulk: {time.MedianSeconds:F3} s median of {time.Samples.Length} (cpu {time.MedianCpuSeconds:F3} s); {SolveCase.WarmupNote(time)}");
        break;
    }

    case "bulk-defaults":
    {
        // Case (b)'s point with the job file's defaults for what is kept: partial DOS and displacements
        // on (channel weights through the tetrahedra). Ours alone, no peer.
        var (result, time) = SolveCase.Run(cases, "bulk", finite: false, warmups: bulkWarmups, repeats, jobDefaults: true);
        report["result"] = SolveCase.Describe(result, time);
        Console.Error.WriteLine($"  bulk with partial DOS and displacements: {time.MedianSeconds:F3} s median of {time.Samples.Length} (cpu {time.MedianCpuSeconds:F3} s); {SolveCase.WarmupNote(time)}");
        break;
    }

    case "finite-chain":
    case "finite-3d":
    {
        var section = caseName == "finite-chain" ? "finite_chain" : "finite_3d";
        var (result, time) = SolveCase.Run(cases, section, finite: true, warmups: 1, repeats);
        var peak = Process.GetCurrentProcess().PeakWorkingSet64;
        var described = SolveCase.Describe(result, time);
        described["peak_working_set_bytes"] = peak;
        Console.Error.WriteLine($"  {caseName}: {time.MedianSeconds:F3} s median of {time.Samples.Length} (cpu {time.MedianCpuSeconds:F3} s), peak working set {peak / (1 << 20)} MiB");

        // The plain exact sum over the same eigenvalues (untimed): the 1e-9 contract.
        var s = cases.Section(section);
        var cells = CaseFile.Ints(s.GetProperty("cells"));
        var allT = result.Thermal.Select(r => r.TemperatureK).ToArray();
        var picked = Enumerable.Range(0, allT.Length).Where(i => i % checkEvery == 0 || i == allT.Length - 1).ToArray();
        var sw = Stopwatch.StartNew();
        var plain = PlainModeSum.Compute(cases.Model(s.GetProperty("model").GetString()!), cells[0], cells[1], cells[2], [.. picked.Select(i => allT[i])]);
        var worst = new Dictionary<string, object>();
        double Worst(Func<int, double> ours, double[] reference, Func<int, double> scale) =>
            picked.Select((i, k) => Math.Abs(ours(i) - reference[k]) / scale(k)).Max();
        var zp = result.Summary.ZeroPointEnergyJPerMol ?? throw new InvalidOperationException("the bench model is unstable");
        worst["internal"] = Worst(i => result.Thermal[i].InternalEnergyJPerMol, plain.Internal, k => Math.Abs(plain.Internal[k]));
        // F = ZPE + kT sum ln(1 - e^-x) can pass through zero: its error is taken relative to ZPE + |F - ZPE|.
        worst["free"] = Worst(i => result.Thermal[i].FreeEnergyJPerMol, plain.Free, k => zp + Math.Abs(plain.Free[k] - zp));
        worst["entropy"] = Worst(i => result.Thermal[i].EntropyJPerMolK, plain.Entropy, k => Math.Abs(plain.Entropy[k]));
        worst["heat_capacity"] = Worst(i => result.Thermal[i].HeatCapacityJPerMolK, plain.HeatCapacity, k => Math.Abs(plain.HeatCapacity[k]));
        described["plain_sum_check"] = new Dictionary<string, object>
        {
            ["temperatures_checked"] = picked.Length,
            ["worst_relative_error"] = worst,
            ["seconds"] = sw.Elapsed.TotalSeconds,
        };
        Console.Error.WriteLine($"  {caseName}: plain exact sum at {picked.Length} temperatures, worst relative error " +
            string.Join(", ", worst.Select(kv => $"{kv.Key} {(double)kv.Value:E2}")) + $" ({sw.Elapsed.TotalSeconds:F1} s)");
        report["result"] = described;
        break;
    }

    case "surfaces-dense":
        report["dense"] = SurfaceCase.Dense([1000, 2000, 3000], radiusNm: 1.97);
        break;
    case "surfaces-kpm":
        report["kpm"] = SurfaceCase.Kpm(radiusNm: 7.26, denser: false);
        break;
    case "surfaces-kpm-denser":
        report["kpm"] = SurfaceCase.Kpm(radiusNm: 7.26, denser: true);
        break;
    case "surfaces-memory":
        // About 10^6 atoms; 128 moments and 2 vectors, since the memory does not depend on them (the
        // time grows linearly with moments x vectors from this figure).
        report["kpm"] = SurfaceCase.Kpm(radiusNm: 15.64, denser: false, new LatticeSweep.Engine.Samples.KpmSettings { Moments = 128, RandomVectors = 2 });
        break;
    case "expansion":
        report["result"] = ExpansionCase.Run(
            mesh: int.Parse(Option("--mesh", "16"), System.Globalization.CultureInfo.InvariantCulture),
            temperatures: 50,
            repeats);
        break;

    case "queue":
    {
        var latsweep = Option("--latsweep", "src/Worker/bin/Release/net10.0/latsweep");
        var jobs = Option("--jobs", "bench/queue");
        // The issue's own range for the <= 3 % target is points of ~30-80 ms: 60ms-points (40ms-points'
        // points take ~25 ms since the Engine's speed work); the 20 ms and 40 ms jobs stay for comparison
        // with earlier rounds. --only small-points.toml[,...] runs just those jobs.
        var only = Option("--only", "small-points.toml,20ms-points.toml,40ms-points.toml,60ms-points.toml").Split(',', StringSplitOptions.RemoveEmptyEntries);
        report["runs"] = only
            .Select(job => (object)QueueCase.Run(latsweep, Path.Combine(jobs, job), Path.Combine(jobs, "one-point.toml"), workers: 1, repeats))
            .ToList();
        break;
    }

    case "forecast":
        // --job FILE[,FILE...]: each point's run-time forecast against its measured CPU (no fit).
        report["result"] = ForecastCase.Run(Option("--job", "jobs/quickstart.toml").Split(','), repeats);
        break;

    case "failure-origin":
        // --job FILE[,FILE...]: the cost of tracing each failed point to the job file, per round a fresh plan.
        report["result"] = FailureOriginCase.Run(Option("--job", "bench/failures/sizes-one-bad-model.toml,bench/failures/many-bad-models.toml,bench/failures/sample-too-large.toml").Split(','), repeats);
        break;

    case "queue-rows":
        report["result"] = RowsCase.Run(Option("--job", "bench/queue/small-points.toml"),
            int.Parse(Option("--points", "2000"), System.Globalization.CultureInfo.InvariantCulture), repeats, outDir);
        break;

    case "queue-merge":
        report["result"] = MergeCase.Run(Option("--job", "bench/queue/40ms-points.toml"),
            int.Parse(Option("--points", "300"), System.Globalization.CultureInfo.InvariantCulture),
            int.Parse(Option("--chunks", "7"), System.Globalization.CultureInfo.InvariantCulture), repeats, outDir);
        break;

    case "queue-engine-warm":
        report["result"] = QueueCase.EngineWarm(Option("--job", "bench/queue/40ms-points.toml"), repeats);
        break;

    case "queue-engine-cold":
        report["result"] = QueueCase.EngineCold(Option("--job", "bench/queue/20ms-points.toml"));
        break;

    default:
        Console.Error.WriteLine($"unknown case '{caseName}': use eigen, eigen-paths, bulk, finite-chain, finite-3d, queue, cost, expansion or surfaces-dense|kpm|kpm-denser|memory");
        return 2;
}

var path = Path.Combine(outDir, $"ours_{caseName}.json");
File.WriteAllText(path, JsonSerializer.Serialize(report, new JsonSerializerOptions { WriteIndented = false }));
return 0;
