namespace LatticeSweep.Worker.Catalog;

/// <summary>Why a point failed; decides whether <c>resume</c> runs it again.</summary>
public enum FailureKind
{
    /// <summary>The model cannot be solved as given (a model reason). Has a row in <c>points/</c>; never retried.</summary>
    Model,

    /// <summary>The Engine failed in an unexpected way (a defect, not the user's input). Has a row in <c>points/</c>; not retried.</summary>
    Engine,

    /// <summary>Results could not be written (disk full, read-only folder) after the bounded retries. No row; <c>resume</c> runs it again.</summary>
    Io,

    /// <summary>The sweep's job file could not be loaded by this worker (moved or changed). No row; <c>resume</c> runs it again.</summary>
    Input,
}

/// <summary>Helpers for the failure kinds.</summary>
public static class FailureKinds
{
    /// <summary>True when a failed point of this kind has its row in the results (so it is not re-queued).</summary>
    public static bool HasResult(this FailureKind kind) => kind is FailureKind.Model or FailureKind.Engine;
}
