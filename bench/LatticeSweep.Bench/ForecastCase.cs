using System.Globalization;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Cost;

namespace LatticeSweep.Bench;

/// <summary>
/// Case "forecast": the run-time forecast (<see cref="PointCost.Seconds(LatticeSweep.Engine.Models.CrystalModel, LatticeSweep.Engine.Samples.Sample, SolveOptions)"/>)
/// against the measured CPU of each point of job files, one core, no fit. Prints forecast / measured per point
/// and per job (sums), so a term the forecast leaves out shows as a ratio below 1 where it applies.
/// </summary>
internal static class ForecastCase
{
    /// <param name="repeats">timed solves per point after one warm-up; 0 prints the forecasts alone (they do not depend on the load).</param>
    public static Dictionary<string, object> Run(IEnumerable<string> jobFiles, int repeats)
    {
        var jobs = new List<Dictionary<string, object>>();
        foreach (var jobFile in jobFiles)
        {
            var plan = JobFileLoader.Load(jobFile);
            double forecastSum = 0, measuredSum = 0;
            var points = new List<Dictionary<string, object>>();
            foreach (var point in plan.Points)
            {
                var request = PointBinder.Bind(plan, point);
                var forecast = PointCost.Seconds(request.Model, request.Sample, request.Options);
                var measured = repeats > 0
                    ? Timing.Measure(() => PhononSolver.Solve(request.Model, request.Sample, request.Options), warmups: 1, repeats).MedianCpuSeconds
                    : double.NaN;
                forecastSum += forecast;
                measuredSum += measured;
                points.Add(new() { ["point"] = point.PointId, ["forecast_s"] = forecast, ["measured_cpu_s"] = repeats > 0 ? (object)measured : "not measured" });
                Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
                    $"  {Path.GetFileName(jobFile),-28} {point.PointId} forecast {forecast * 1e3,9:F1} ms  measured {measured * 1e3,9:F1} ms  ratio {forecast / measured,5:F2}"));
            }

            Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"  {Path.GetFileName(jobFile),-28} total forecast {forecastSum:F3} s  measured {measuredSum:F3} s  ratio {forecastSum / measuredSum:F2}  (load {File.ReadAllText("/proc/loadavg").Split(' ')[0]})"));
            jobs.Add(new() { ["job"] = jobFile, ["forecast_s"] = forecastSum, ["measured_cpu_s"] = repeats > 0 ? (object)measuredSum : "not measured", ["points"] = points });
        }

        return new() { ["jobs"] = jobs };
    }
}
