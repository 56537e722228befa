namespace LatticeSweep.Worker.Queue;

/// <summary>A worker process as the queue knows it: its server name, last sign of life (UTC) and thread count.</summary>
public sealed record WorkerProcess(string Name, DateTimeOffset? LastHeartbeat, int Threads);
