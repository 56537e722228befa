using System.Globalization;
using LatticeSweep.Worker.Queue;
using Microsoft.AspNetCore.Http;

namespace LatticeSweep.Dashboard.Diagnostics;

/// <summary>
/// With <c>LATSWEEP_TIMINGS=1</c> (as for the <c>latsweep</c> commands), each request's wall time
/// and the process's CPU over it are written to stderr, followed by the stage totals so far
/// (<see cref="StageTimings"/>: the sweep page's parts, the columns read from points/), so a slow
/// first load can be taken apart without a profiler. Off (the default) it is one flag test per request.
/// </summary>
internal static class RequestTimings
{
    public static async Task Measure(HttpContext context, RequestDelegate next)
    {
        if (!StageTimings.Enabled)
        {
            await next(context).ConfigureAwait(false);
            return;
        }

        var started = System.Diagnostics.Stopwatch.GetTimestamp();
        var cpu = Environment.CpuUsage.TotalTime;
        await next(context).ConfigureAwait(false);
        var line = string.Create(CultureInfo.InvariantCulture,
            $"timings: request {context.Request.Path}{context.Request.QueryString} {System.Diagnostics.Stopwatch.GetElapsedTime(started).TotalSeconds:F3} s wall, {(Environment.CpuUsage.TotalTime - cpu).TotalSeconds:F3} s process CPU");
        lock (Console.Error)
        {
            Console.Error.WriteLine(line);
            StageTimings.WriteIfEnabled(Console.Error);
        }
    }
}
