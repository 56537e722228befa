namespace LatticeSweep.Worker.Cli;

/// <summary>What <c>latsweep</c> returns to the shell.</summary>
public static class ExitCodes
{
    /// <summary>Every point done (or the command did what it was asked).</summary>
    public const int Ok = 0;

    /// <summary>Unexpected failure (a defect): reported with its reason.</summary>
    public const int Internal = 1;

    /// <summary>Bad input: a job file, an option, an output folder or a sweep that is not there.</summary>
    public const int BadInput = 2;

    /// <summary>The sweep finished but some points failed.</summary>
    public const int SomeFailed = 3;

    /// <summary>
    /// Every point finished and has its results, none failed, but some models are unstable (state
    /// <c>unstable</c>: no thermal numbers). <see cref="SomeFailed"/> takes precedence.
    /// </summary>
    public const int SomeUnstable = 4;

    /// <summary>Stopped by Ctrl+C or a termination signal; <c>resume</c> continues.</summary>
    public const int Interrupted = 130;
}
