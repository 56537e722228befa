namespace LatticeSweep.Worker.Cli;

/// <summary>The text of <c>latsweep --help</c> and <c>latsweep --version</c>.</summary>
internal static class Usage
{
    /// <summary>
    /// One line: the program's and the engine's version, the engine image a published x86-64 build loaded
    /// (<see cref="EngineImages"/>) and the runtime.
    /// </summary>
    public static string Version
    {
        get
        {
            var engine = Engine.Solving.PhononSolver.EngineVersion; // loads the Engine, so the image is known after it
            var image = EngineImages.LoadedFolder is { } folder ? $", {folder} image" : "";
            return $"latsweep {typeof(Usage).Assembly.GetName().Version?.ToString(3) ?? "0.0.0"} (engine {engine}{image}, .NET {Environment.Version})";
        }
    }

    // The raw literal drops its last line break; the help ends with one like every other output.
    public const string Text = """
        latsweep: batch lattice-vibration sweeps on a durable queue, results as Parquet datasets.

        Usage:
          latsweep run FILE [--out DIR] [--store STORE] [--workers N] [--reclaim-after SECONDS]
                plan the job file, queue it and work it on this machine until done
          latsweep init FILE           write a commented starter job file (never overwrites)
          latsweep check FILE          validate a job file and print the plan
          latsweep solve FILE [--full-precision]
                solve the job file's model once and print its summary
          latsweep submit FILE [--out DIR] [--store STORE]
                plan and queue a sweep for workers (does not work on it)
          latsweep work [--store STORE] [--workers N] [--reclaim-after SECONDS] [--stay]
                work queued chunks until the queue is empty (--stay: keep waiting for more)
          latsweep status [SWEEP] [--store STORE]
                list sweeps, or show one sweep's counts, failures, floppy models and coverage
          latsweep cancel SWEEP [--store STORE]
                stop a sweep: waiting points are not run
          latsweep resume SWEEP [--store STORE] [--workers N] [--reclaim-after SECONDS] [--queue-only]
                queue again every point without results and work them (--queue-only: just queue)
          latsweep merge SWEEP [--store STORE]
                merge each table's part files into large files sorted by point (done at the
                end of run, resume and work; safe to repeat or to interrupt)

        Options:
          --out DIR       output root; each sweep gets a folder DIR/<sweep id> (default ./results)
          --store STORE   queue and catalog: a file path for the embedded SQLite store
                          (default ./.latsweep/store.db; one worker process at a time), or a
                          PostgreSQL connection string (Host=...;Database=... or postgres://...)
                          for workers on several machines; its Search Path (?schema= in the
                          postgres:// form) names the schema of the store (default latsweep)
          --workers N     worker threads, one point at a time each (default: the number of cores)
          --reclaim-after SECONDS
                          PostgreSQL: a chunk whose worker stopped answering goes to another
                          worker this long after its last sign of life (default 60, 5 to 86400;
                          or the environment variable LATSWEEP_RECLAIM_AFTER); use one value
                          on every machine

        latsweep COMMAND --help (or latsweep help COMMAND) shows one command's options and an
        example; latsweep --version prints the version.
        SWEEP is a sweep id (as printed by run, submit and status) or a sweep name.
        status, cancel and resume need an existing store; run, submit and work create one.
        Exit codes: 0 all points done, 2 bad input, 3 some points failed, 4 every point finished but
        some models are unstable (no thermal numbers for them), 130 interrupted.
        Results are model estimates: check them against measurements before design decisions.
        """ + "\n";
}
