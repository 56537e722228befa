using System.Globalization;
using System.Security.Cryptography;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Bench;

/// <summary>
/// Case queue-rows (ours alone): what one chunk's results cost to turn into Parquet parts, in process
/// and warmed up, apart from the Engine. The job's points are solved once; then the chunk's rows are
/// built (<c>ChunkTables</c>) and written (<c>ChunkOutputWriter</c>, the Worker's own path, part files
/// on disk) again and again, timed by the thread's CPU. Fixed start and end times stand in for the
/// clock, so two builds that write the same bytes give the same SHA-256 per part file (printed), which
/// is how a change to the writer is checked to keep the output bit for bit.
/// </summary>
internal static class RowsCase
{
    public static Dictionary<string, object> Run(string jobFile, int maxPoints, int repeats, string outDir)
    {
        var plan = JobFileLoader.Load(jobFile);
        var count = Math.Min(maxPoints, plan.Points.Length);
        var start = new DateTimeOffset(2026, 1, 2, 3, 4, 5, TimeSpan.Zero);
        var outcomes = BenchSweeps.SolvedOutcomes(plan, count, start, _ => "c0000");

        var folder = Path.Combine(Path.GetFullPath(outDir), "queue-rows-" + Path.GetFileNameWithoutExtension(jobFile));
        if (Directory.Exists(folder))
        {
            Directory.Delete(folder, recursive: true);
        }

        var sweep = BenchSweeps.Record(plan, jobFile, "bench-rows", folder, start, 1);
        var outputs = ChunkOutputWriter.OutputsOf(sweep);

        // Warm-up, then the timed repeats: rows and Parquet together as a chunk runs them.
        for (var r = 0; r < 2; r++)
        {
            ChunkOutputWriter.WriteAsync(sweep, outputs, "c0000", outcomes, default).GetAwaiter().GetResult();
        }

        var cpu = new List<double>();
        for (var r = 0; r < repeats; r++)
        {
            var t0 = ThreadCpuSeconds();
            ChunkOutputWriter.WriteAsync(sweep, outputs, "c0000", outcomes, default).GetAwaiter().GetResult();
            cpu.Add(ThreadCpuSeconds() - t0);
        }

        cpu.Sort();
        var median = cpu[cpu.Count / 2];
        var hashes = new SortedDictionary<string, string>(StringComparer.Ordinal);
        var rows = 0L;
        foreach (var file in Directory.GetFiles(folder, "*.parquet", SearchOption.AllDirectories))
        {
            hashes[Path.GetRelativePath(folder, file)] = Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(file)))[..16].ToLowerInvariant();
            rows += new FileInfo(file).Length;
        }

        Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"  queue-rows {Path.GetFileName(jobFile)}: {count} points, rows + Parquet {median * 1e3:F1} ms CPU per chunk (median of {repeats}, min {cpu[0] * 1e3:F1}), {median / count * 1e3:F3} ms per point, {rows / 1024.0:F0} KiB of parts"));
        foreach (var (file, hash) in hashes)
        {
            Console.Error.WriteLine($"    {file} {hash}");
        }

        return new Dictionary<string, object>
        {
            ["job"] = Path.GetFileName(jobFile),
            ["points"] = count,
            ["cpu_s_median"] = median,
            ["cpu_ms_per_point"] = median / count * 1e3,
            ["sha256_16"] = hashes,
        };
    }

    // The Worker's own per-thread clock (clock_gettime on Linux, 0 elsewhere).
    private static double ThreadCpuSeconds() => LatticeSweep.Worker.Queue.StageTimings.ThreadCpuNs() * 1e-9;
}
