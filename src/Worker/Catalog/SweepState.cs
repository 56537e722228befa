namespace LatticeSweep.Worker.Catalog;

/// <summary>Where a sweep is in its life. Stored as the lower-case name.</summary>
public enum SweepState
{
    /// <summary>Planned and queued; no chunk has started yet (also after <c>resume</c>).</summary>
    Queued,

    /// <summary>At least one chunk has started and points are still waiting or running.</summary>
    Running,

    /// <summary>Every point finished and none failed.</summary>
    Done,

    /// <summary>Every point finished (nothing waiting or running) and at least one failed.</summary>
    Failed,

    /// <summary>Stopped by <c>cancel</c>: waiting points were not run.</summary>
    Cancelled,
}
