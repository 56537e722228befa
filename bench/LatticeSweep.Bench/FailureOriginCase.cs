using System.Diagnostics;
using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Bench;

/// <summary>
/// Case "failure-origin": what tracing a failed point to the job file costs (<see cref="FailureLocator"/>,
/// which <c>ChunkRunner</c> calls for each failed point). Per job: plan it, then per point the solve timed,
/// and for a refused point the trace timed the same way; each round plans the job afresh, so the trace's
/// memos start empty as in a new worker. Prints per round the median solve of the points that solve, of
/// the refusals, and the mean trace per failed point (the memo's first trace included).
/// </summary>
internal static class FailureOriginCase
{
    public static Dictionary<string, object> Run(IEnumerable<string> jobFiles, int rounds)
    {
        var jobs = new List<Dictionary<string, object>>();
        foreach (var jobFile in jobFiles)
        {
            var perRound = new List<Dictionary<string, object>>();
            for (var round = 0; round < rounds; round++)
            {
                var plan = JobFileLoader.Load(jobFile);
                var solved = new List<double>();
                var refused = new List<double>();
                var traced = new List<double>();
                var texts = new HashSet<string>(StringComparer.Ordinal);
                foreach (var point in plan.Points)
                {
                    var clock = Stopwatch.StartNew();
                    try
                    {
                        EnginePointSolver.Instance.Solve(plan, point, default);
                        solved.Add(clock.Elapsed.TotalMilliseconds);
                    }
                    catch (ModelException ex)
                    {
                        refused.Add(clock.Elapsed.TotalMilliseconds);
                        clock.Restart();
                        texts.Add(FailureLocator.Describe(plan, point, ex));
                        traced.Add(clock.Elapsed.TotalMilliseconds);
                    }
                }

                var row = new Dictionary<string, object>
                {
                    ["solved_points"] = solved.Count,
                    ["failed_points"] = refused.Count,
                    ["solve_median_ms"] = Median(solved),
                    ["refusal_median_ms"] = Median(refused),
                    ["trace_mean_ms"] = traced.Count == 0 ? 0.0 : traced.Average(),
                    ["trace_total_ms"] = traced.Sum(),
                    ["distinct_texts"] = texts.Count,
                };
                perRound.Add(row);
                Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
                    $"  {Path.GetFileName(jobFile),-26} round {round + 1}: {solved.Count} solved (median {Median(solved):F3} ms), {refused.Count} refused (median {Median(refused):F3} ms), trace {row["trace_mean_ms"]:F4} ms per failed point ({traced.Sum():F0} ms in all), {texts.Count} distinct texts (load {File.ReadAllText("/proc/loadavg").Split(' ')[0]})"));
            }

            jobs.Add(new() { ["job"] = jobFile, ["rounds"] = perRound });
        }

        return new() { ["jobs"] = jobs };
    }

    private static double Median(List<double> xs)
    {
        if (xs.Count == 0)
        {
            return 0.0;
        }

        var sorted = xs.Order().ToArray();
        return sorted[sorted.Length / 2];
    }
}
