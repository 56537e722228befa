namespace LatticeSweep.Worker.Cli;

/// <summary>
/// <c>latsweep COMMAND --help</c> (or <c>latsweep help COMMAND</c>): what one command does, its own
/// options and an example. The option lines are shared so each option reads the same everywhere.
/// </summary>
internal static class CommandHelp
{
    private const string Out = """
          --out DIR       output root; the sweep's results go to DIR/<sweep id> (default ./results)
        """;

    private const string Store = """
          --store STORE   queue and catalog: a file path for the embedded SQLite store (default
                          ./.latsweep/store.db; one worker process at a time), or a PostgreSQL
                          connection string (Host=...;Database=... or postgres://...) whose Search
                          Path (?schema= in the postgres:// form) names the store's schema
                          (default latsweep)
        """;

    private const string ExistingStore = """
          --store STORE   the store to read (default ./.latsweep/store.db), a file path or a
                          PostgreSQL connection string; a store that does not exist is an error
                          (nothing is created)
        """;

    private const string Workers = """
          --workers N     worker threads, one point at a time each (default: the number of cores)
        """;

    private const string ReclaimAfter = """
          --reclaim-after SECONDS
                          PostgreSQL only: a chunk whose worker stopped answering goes to another
                          worker this long after its last sign of life (default 60, 5 to 86400, or
                          the environment variable LATSWEEP_RECLAIM_AFTER); one value on every machine
        """;

    private static readonly Dictionary<string, string> Texts = new(StringComparer.Ordinal)
    {
        ["run"] = $"""
            latsweep run FILE [--out DIR] [--store STORE] [--workers N] [--reclaim-after SECONDS]

            Plans the job file, queues its points and works them on this machine until every point
            has finished, with a progress line; ends with where the results are. Running the same
            file again continues the same sweep (finished points are not computed again).
            Creates the store when it does not exist.

            Options:
            {Out}
            {Store}
            {Workers}
            {ReclaimAfter}

            Example:
              latsweep run jobs/quickstart.toml --workers 2

            Exit codes: 0 every point done, 2 bad input (nothing queued), 3 some points failed,
            4 every point finished but some models are unstable, 130 interrupted (continue with
            latsweep resume SWEEP).
            """,
        ["check"] = """
            latsweep check FILE

            Validates a job file and prints its plan: sweep name and id hash, number of points, how
            the axes combine, each axis with its column, unit and range, the tables a run writes, and
            a rough estimate of compute time, memory and disk from a few sampled points. Every
            problem is listed with file, line, column and key. Writes nothing.

            Example:
              latsweep check jobs/screening.toml

            Exit codes: 0 the file is valid, 2 it is not (each problem on its own line) or every point
            checked will fail.
            """,
        ["solve"] = """
            latsweep solve FILE [--full-precision]

            Solves one model at once (the first point of the sweep, which is the unswept model when
            there are no axes) and prints its summary with units. Queues and writes nothing.

            Options:
              --full-precision  print every number with all its digits (the shortest text that
                                reads back as the same double) instead of 6 significant digits

            Example:
              latsweep solve jobs/quickstart.toml --full-precision

            Exit codes: 0 solved, 2 bad input, 3 the model cannot be solved (with the reason), 4 the
            model is unstable.
            """,
        ["submit"] = $"""
            latsweep submit FILE [--out DIR] [--store STORE]

            Plans the job file and queues its points for workers (latsweep work, on this or other
            machines), then returns. Submitting the same file again continues that sweep: points
            without results are queued again. Creates the store when it does not exist.

            Options:
            {Out}
            {Store}

            Example:
              latsweep submit jobs/screening.toml --store "Host=dbhost;Database=latsweep;Username=sweeper" --out /mnt/latsweep/results

            Exit codes: 0 queued, 2 bad input (nothing queued).
            """,
        ["work"] = $"""
            latsweep work [--store STORE] [--workers N] [--reclaim-after SECONDS] [--stay]

            Works queued chunks of every sweep in the store until none is left (with --stay: keeps
            waiting for new ones until Ctrl+C or SIGTERM). Creates the store when it does not exist.

            Options:
            {Store}
            {Workers}
            {ReclaimAfter}
              --stay          do not leave when the queue is empty; wait for more work

            Example:
              latsweep work --store "Host=dbhost;Database=latsweep;Username=sweeper" --stay

            Exit codes: 0 every point worked here done, 2 bad input, 3 some points failed,
            4 every point finished but some models are unstable, 130 interrupted.
            """,
        ["status"] = $"""
            latsweep status [SWEEP] [--store STORE]

            Without SWEEP: every sweep in the store with its counts. With SWEEP (an id, as run and
            submit print it, or a sweep name): its counts, who holds its running points, its
            failures grouped by reason and, per swept parameter, how many points are done per value.
            Reads only: writes no log and creates nothing.

            Options:
            {ExistingStore}

            Example:
              latsweep status quickstart-a3cd356f

            Exit codes: 0 shown, 2 no such store or sweep.
            """,
        ["cancel"] = $"""
            latsweep cancel SWEEP [--store STORE]

            Stops a sweep: its waiting points are not run; chunks already running finish.
            latsweep resume SWEEP continues it later.

            Options:
            {ExistingStore}

            Example:
              latsweep cancel quickstart-a3cd356f

            Exit codes: 0 cancelled, 2 no such store or sweep.
            """,
        ["resume"] = $"""
            latsweep resume SWEEP [--store STORE] [--workers N] [--reclaim-after SECONDS] [--queue-only]

            Queues again every point of the sweep that has no result (waiting, cancelled, left
            running by a crash, or failed for an I/O or input reason) and works them here until done.

            Options:
            {ExistingStore}
            {Workers}
            {ReclaimAfter}
              --queue-only    only queue them; running workers (latsweep work) pick them up

            Example:
              latsweep resume quickstart-a3cd356f --workers 2

            Exit codes: 0 every point done, 2 no such store or sweep, 3 some points failed,
            4 every point finished but some models are unstable, 130 interrupted.
            """,
        ["merge"] = $"""
            latsweep merge SWEEP [--store STORE]

            Merges each result table's part files of a sweep into large files sorted by point
            (merged-*.parquet, at least ~64 MiB each, or one per table when smaller), as run, work
            and resume do by themselves when a sweep finishes. Safe to repeat and safe to stop:
            readers see either the parts or the merged files, never both, and every point once.

            Options:
            {ExistingStore}

            Example:
              latsweep merge quickstart-a3cd356f

            Exit codes: 0 merged, 2 no such store, sweep or results folder, 3 the merge failed
            (the tables are as they were; run it again).
            """,
        ["init"] = """
            latsweep init FILE

            Writes a commented starter job file (a two-site cubic crystal swept over one mass and
            the sample kind: 8 points, seconds of work) to FILE, which must end in .toml. It never
            overwrites: an existing FILE is an error. latsweep check FILE accepts it as it is.

            Example:
              latsweep init my-first-sweep.toml

            Exit codes: 0 written, 2 FILE exists or cannot be written.
            """,
    };

    /// <summary>The commands that have a help text, in the order the global help lists them.</summary>
    public static IReadOnlyCollection<string> Commands => Texts.Keys;

    /// <summary>The help of <paramref name="command"/>, or null when there is no such command.</summary>
    public static string? For(string command) =>
        Texts.TryGetValue(command, out var text) ? Tidy(text) : null;

    private static string Tidy(string text) =>
        string.Join('\n', text.ReplaceLineEndings("\n").Split('\n').Select(l => l.TrimEnd())) + "\n";
}
