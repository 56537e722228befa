using Hangfire;

namespace LatticeSweep.Worker.Queue;

/// <summary>Hands the queue server chunk jobs wired to this process's runner (no global container).</summary>
internal sealed class ChunkJobActivator : JobActivator
{
    private readonly ChunkRunner _runner;

    public ChunkJobActivator(ChunkRunner runner)
    {
        _runner = runner;
    }

    public override object ActivateJob(Type jobType) =>
        jobType == typeof(ChunkJob) ? new ChunkJob(_runner) : base.ActivateJob(jobType);
}
