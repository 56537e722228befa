namespace LatticeSweep.Worker.Planning;

/// <summary>
/// The parsed, validated job file (model, sample and outputs) that each point's parameters are
/// applied to. Owned by the job-file code; opaque to the queue and writers.
/// </summary>
public sealed record JobTemplate
{
    // Filled in by the job-file work.
}
