using System.Diagnostics;
using System.Globalization;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Bench;

/// <summary>
/// Case queue-merge (ours alone): what the end-of-sweep merge costs in a process that has written
/// the chunks' parts but never merged, as a `latsweep run` meets it, and the same merge again once
/// its code is warm. The job's first <c>--points</c> points are solved once; their outcomes are
/// written as <c>--chunks</c> chunks through the Worker's own <c>ChunkOutputWriter</c>, then merged
/// with <c>TableMerger</c> (the run's merge), process CPU per merge. Repeated on fresh copies of the parts.
/// </summary>
internal static class MergeCase
{
    public static Dictionary<string, object> Run(string jobFile, int maxPoints, int chunks, int repeats, string outDir)
    {
        var plan = JobFileLoader.Load(jobFile);
        var count = Math.Min(maxPoints, plan.Points.Length);
        var start = new DateTimeOffset(2026, 1, 2, 3, 4, 5, TimeSpan.Zero);
        var perChunk = (count + chunks - 1) / chunks;
        var outcomes = BenchSweeps.SolvedOutcomes(plan, count, start, i => ChunkPlanner.ChunkId(i / perChunk));

        var root = Path.Combine(Path.GetFullPath(outDir), "queue-merge-" + Path.GetFileNameWithoutExtension(jobFile));
        var cpu = new List<double>();
        var partsCpu = new List<double>();
        for (var r = 0; r < repeats; r++)
        {
            var folder = Path.Combine(root, "r" + r.ToString(CultureInfo.InvariantCulture));
            if (Directory.Exists(folder))
            {
                Directory.Delete(folder, recursive: true);
            }

            var sweep = BenchSweeps.Record(plan, jobFile, "bench-merge", folder, start, chunks);
            var outputs = ChunkOutputWriter.OutputsOf(sweep);
            var p0 = Process.GetCurrentProcess().TotalProcessorTime;
            foreach (var chunk in outcomes.GroupBy(o => o.ChunkId))
            {
                ChunkOutputWriter.WriteAsync(sweep, outputs, chunk.Key, [.. chunk], default).GetAwaiter().GetResult();
            }

            partsCpu.Add((Process.GetCurrentProcess().TotalProcessorTime - p0).TotalSeconds);
            var schema = new ResultSchemas(sweep.Axes).ColumnsOf(TableNames.Points);
            var c0 = Process.GetCurrentProcess().TotalProcessorTime;
            TableMerger.MergeSweepAsync(folder, sweep.Tables, schema, default).GetAwaiter().GetResult();
            cpu.Add((Process.GetCurrentProcess().TotalProcessorTime - c0).TotalSeconds);
        }

        foreach (var line in StageTimings.Report())
        {
            Console.Error.WriteLine("  " + line);
        }

        var warm = cpu.Skip(1).Order().ToList();
        Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"  queue-merge {Path.GetFileName(jobFile)}: {count} points in {chunks} chunks; parts {string.Join(" ", partsCpu.Select(c => c.ToString("F3", CultureInfo.InvariantCulture)))} s CPU; " +
            $"merge {string.Join(" ", cpu.Select(c => c.ToString("F3", CultureInfo.InvariantCulture)))} s CPU (first cold, then warm)"));
        return new Dictionary<string, object>
        {
            ["job"] = Path.GetFileName(jobFile),
            ["points"] = count,
            ["chunks"] = chunks,
            ["parts_cpu_s"] = partsCpu,
            ["merge_cpu_s"] = cpu,
            // JSON has no NaN: with one repeat (no warm merge) the median is left out as null.
            ["merge_warm_cpu_s_median"] = warm.Count > 0 ? warm[warm.Count / 2] : null!,
        };
    }
}
