using System.Collections.Immutable;
using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Progress;

/// <summary>Points of one sweep that a worker holds (running), with their chunks.</summary>
public sealed record HeldPoints(string SweepId, string SweepName, string Url, long Points, ImmutableArray<string> Chunks);

/// <summary>
/// A worker process: its name (machine:process), threads, when it last told the queue it is alive,
/// whether it still answers, and the points it holds. <see cref="Status"/> is <c>answering</c>,
/// <c>silent</c> (listed, but not heard from for a while) or <c>gone</c> (holds points in the
/// catalog but is not in the queue's list: it stopped or died).
/// </summary>
public sealed record WorkerLine(
    string Name,
    int? Threads,
    DateTimeOffset? LastHeardAt,
    double? SilentForS,
    string Status,
    string StatusText,
    long PointsHeld,
    ImmutableArray<HeldPoints> Holds);

/// <summary>The worker processes of the store and what they hold; <see cref="Problem"/> when the queue's list could not be read.</summary>
public sealed record WorkerList(DateTimeOffset GeneratedAt, ImmutableArray<WorkerLine> Workers, string? Problem);

/// <summary>Builds <see cref="WorkerList"/> from the queue's server list (heartbeats) and the catalog's running points.</summary>
public static class WorkerBoard
{
    public const string Answering = "answering";
    public const string Silent = "silent";
    public const string Gone = "gone";

    public static WorkerList Of(QueueStore store, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(store);
        IReadOnlyList<WorkerProcess> processes;
        string? problem = null;
        try
        {
            processes = store.WorkerProcesses();
        }
        catch (Exception ex) when (ex is not OutOfMemoryException)
        {
            processes = [];
            problem = $"the queue's list of worker processes could not be read: {ex.Message}";
        }

        // What each worker holds: the running points of every active sweep, by the worker the catalog names.
        var held = new Dictionary<string, List<HeldPoints>>(StringComparer.OrdinalIgnoreCase);
        foreach (var sweep in store.Catalog.ListSweeps().Where(s => s.Counts.Running > 0))
        {
            foreach (var byWorker in store.Catalog.GetPoints(sweep.SweepId, new PointQuery(PointState.Running, 0, int.MaxValue)).GroupBy(p => p.Worker ?? "?", StringComparer.OrdinalIgnoreCase))
            {
                if (!held.TryGetValue(byWorker.Key, out var list))
                {
                    held[byWorker.Key] = list = [];
                }

                list.Add(new HeldPoints(sweep.SweepId, sweep.Name, Links.Sweep(sweep.SweepId), byWorker.LongCount(),
                    [.. byWorker.Select(p => p.ChunkId).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal)]));
            }
        }

        var lines = new List<WorkerLine>();
        var matched = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        foreach (var process in processes.OrderBy(p => p.Name, StringComparer.Ordinal))
        {
            // The queue names a process "machine:pid:pid:<guid>" (its server name, then its own parts), the catalog "machine:pid".
            var name = held.Keys.FirstOrDefault(w => process.Name.StartsWith(w + ":", StringComparison.OrdinalIgnoreCase)) ?? Trim(process.Name);
            matched.Add(name);
            var silent = process.LastHeartbeat is { } beat ? Math.Max(0, (now - beat).TotalSeconds) : (double?)null;
            var answering = silent is { } s && s <= QueueTimings.ServerSilentAfter.TotalSeconds;
            var holds = held.GetValueOrDefault(name) ?? [];
            lines.Add(new WorkerLine(name, process.Threads, process.LastHeartbeat, silent, answering ? Answering : Silent,
                answering ? $"answering (last heard {Seconds(silent)} ago)" : $"silent: not heard from for {Seconds(silent)}; probably stopped",
                holds.Sum(h => h.Points), [.. holds]));
        }

        foreach (var (name, holds) in held.Where(h => !matched.Contains(h.Key)).OrderBy(h => h.Key, StringComparer.Ordinal))
        {
            var text = store.Location.Kind == StoreKind.Sqlite
                ? "gone: not in the queue's list; its points stay running until resume queues them again"
                : "gone: not in the queue's list; its chunks go back to the queue after the reclaim time";
            lines.Add(new WorkerLine(name, null, null, null, Gone, text, holds.Sum(h => h.Points), [.. holds]));
        }

        return new WorkerList(now, [.. lines], problem);
    }

    /// <summary>"machine:pid" from the queue's "machine:pid:pid:guid" (a machine name has no colon).</summary>
    private static string Trim(string queueName)
    {
        var parts = queueName.Split(':');
        return parts.Length >= 2 ? $"{parts[0]}:{parts[1]}" : queueName;
    }

    private static string Seconds(double? s) => s is { } v ? $"{v:F0} s" : "—";
}
