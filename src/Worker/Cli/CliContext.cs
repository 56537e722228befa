using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Cli;

/// <summary>What a command runs with: its output streams, folder, clock, solver and stop signal.</summary>
public sealed record CliContext
{
    public required TextWriter Stdout { get; init; }
    public required TextWriter Stderr { get; init; }
    public required string CurrentDirectory { get; init; }

    /// <summary>True when stderr is a terminal (the progress bar redraws in place).</summary>
    public bool StderrIsTerminal { get; init; }

    public TimeProvider Time { get; init; } = TimeProvider.System;
    public IPointSolver Solver { get; init; } = EnginePointSolver.Instance;
    public ChunkPlanner Chunks { get; init; } = ChunkPlanner.FromEnvironment();
    public RetryPolicy Retry { get; init; } = RetryPolicy.Default;

    /// <summary>Ctrl+C or a termination signal.</summary>
    public CancellationToken Stop { get; init; }

    /// <summary>How often run/work look at the catalog and queue.</summary>
    public TimeSpan PollInterval { get; init; } = TimeSpan.FromMilliseconds(250);
}
