using System.Diagnostics;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Bench;

/// <summary>
/// Case (e): a sweep through the real queue (`latsweep run` on the embedded SQLite store, its own
/// process, as a user runs it) against solving the same planned points with the Engine in this
/// process, one after another. Overhead = queue wall time / engine time - 1: everything the batch
/// side adds (process start, planning, enqueueing, dispatch, catalog updates, Parquet writes).
/// </summary>
internal static class QueueCase
{
    public static Dictionary<string, object> Run(string latsweep, string jobFile, int workers, int repeats)
    {
        var plan = JobFileLoader.Load(jobFile);
        var points = plan.Points;

        // Engine alone: bind and solve every point (the Worker's own EnginePointSolver), warmed up first.
        for (var i = 0; i < Math.Min(20, points.Length); i++)
        {
            EnginePointSolver.Instance.Solve(plan, points[i], default);
        }

        var direct = Timing.Measure(
            () =>
            {
                foreach (var p in points)
                {
                    EnginePointSolver.Instance.Solve(plan, p, default);
                }
            },
            warmups: 0, repeats: Math.Max(1, repeats / 2));

        var queueSamples = new List<double>();
        for (var r = 0; r < repeats; r++)
        {
            var folder = Directory.CreateTempSubdirectory("latsweep-bench-");
            try
            {
                var start = new ProcessStartInfo(latsweep)
                {
                    RedirectStandardOutput = true,
                    RedirectStandardError = true,
                    WorkingDirectory = folder.FullName,
                };
                foreach (var a in new[] { "run", Path.GetFullPath(jobFile), "--out", Path.Combine(folder.FullName, "out"), "--store", Path.Combine(folder.FullName, "store.db"), "--workers", workers.ToString(System.Globalization.CultureInfo.InvariantCulture) })
                {
                    start.ArgumentList.Add(a);
                }

                var sw = Stopwatch.StartNew();
                using var process = Process.Start(start)!;
                var stdout = process.StandardOutput.ReadToEndAsync();
                var stderr = process.StandardError.ReadToEndAsync();
                process.WaitForExit();
                var seconds = sw.Elapsed.TotalSeconds;
                if (process.ExitCode != 0)
                {
                    throw new InvalidOperationException($"latsweep run {jobFile} exited with {process.ExitCode}: {stderr.Result}{stdout.Result}");
                }

                var parts = Directory.GetFiles(Path.Combine(folder.FullName, "out"), "*.parquet", SearchOption.AllDirectories).Length;
                if (parts == 0)
                {
                    throw new InvalidOperationException($"latsweep run {jobFile} wrote no Parquet files");
                }

                queueSamples.Add(seconds);
            }
            finally
            {
                folder.Delete(recursive: true);
            }
        }

        var queue = queueSamples.Order().ToArray()[queueSamples.Count / 2];
        var result = new Dictionary<string, object>
        {
            ["job"] = Path.GetFileName(jobFile),
            ["points"] = points.Length,
            ["workers"] = workers,
            ["engine_s"] = direct.MedianSeconds,
            ["engine_ms_per_point"] = direct.MedianSeconds / points.Length * 1e3,
            ["queue_s"] = queue,
            ["queue_runs"] = queueSamples.Count,
            ["engine_points_per_s"] = points.Length / direct.MedianSeconds,
            ["queue_points_per_s"] = points.Length / queue,
            ["overhead_fraction"] = (queue * workers / direct.MedianSeconds) - 1,
            ["overhead_ms_per_point"] = ((queue * workers) - direct.MedianSeconds) / points.Length * 1e3,
        };
        Console.Error.WriteLine($"  queue {Path.GetFileName(jobFile)}: {points.Length} points, engine {direct.MedianSeconds:F2} s " +
            $"({direct.MedianSeconds / points.Length * 1e3:F2} ms/point), latsweep run --workers {workers} {queue:F2} s " +
            $"({points.Length / queue:F0} points/s), overhead {(double)result["overhead_fraction"] * 100:F1}%");
        return result;
    }
}
