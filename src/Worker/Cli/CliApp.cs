using LatticeSweep.Engine.Errors;
using LatticeSweep.Worker.Commands;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Cli;

/// <summary>
/// The <c>latsweep</c> command line: picks the command, and turns every user mistake into one
/// clear message and exit code 2 (never a stack trace).
/// </summary>
public static class CliApp
{
    public static int Run(IReadOnlyList<string> args, CliContext context)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(context);
        if (args.Count == 0 || args[0] is "--help" or "-h" or "help")
        {
            return Help(args, context);
        }

        if (args[0] is "--version" or "version")
        {
            context.Stdout.WriteLine(Usage.Version);
            return ExitCodes.Ok;
        }

        var command = args[0];
        var rest = args.Skip(1).ToList();
        if (rest.Contains("--help") || rest.Contains("-h"))
        {
            context.Stdout.Write(CommandHelp.For(command) ?? Usage.Text);
            return ExitCodes.Ok;
        }

        try
        {
            return command switch
            {
                "run" => SweepCommands.Run(CommandLine.Parse(command, rest, Options("out", "store", "workers", "reclaim-after"), 1, 1), context),
                "submit" => SweepCommands.Submit(CommandLine.Parse(command, rest, Options("out", "store"), 1, 1), context),
                "resume" => SweepCommands.Resume(CommandLine.Parse(command, rest, Options("store", "workers", "reclaim-after", "!queue-only"), 1, 1), context),
                "work" => SweepCommands.Work(CommandLine.Parse(command, rest, Options("store", "workers", "reclaim-after", "!stay"), 0, 0), context),
                "status" => StatusCommand.Run(CommandLine.Parse(command, rest, Options("store"), 0, 1), context),
                "cancel" => SweepCommands.Cancel(CommandLine.Parse(command, rest, Options("store"), 1, 1), context),
                "merge" => SweepCommands.Merge(CommandLine.Parse(command, rest, Options("store"), 1, 1), context),
                "check" => CheckCommand.Run(PathIn(context, CommandLine.Parse(command, rest, Options(), 1, 1).Arguments[0]), context.Stdout, context.Stderr),
                "solve" => Solve(CommandLine.Parse(command, rest, Options("!full-precision"), 1, 1), context),
                "init" => StarterJob.Write(PathIn(context, CommandLine.Parse(command, rest, Options(), 1, 1).Arguments[0]), context),
                _ => throw new UsageException($"unknown command '{EchoText.Of(command)}' (commands: {string.Join(", ", CommandHelp.Commands)}; see latsweep --help)"),
            };
        }
        catch (Exception ex) when (StoreFaults.IsDiskFull(ex, StoreOf(rest, context)))
        {
            // Before the generic store message: "cannot open the store: disk I/O error" says too little.
            return BadInput(context, ex is StoreFullException ? ex.Message : StoreFaults.Describe(StoreOf(rest, context)));
        }
        catch (UsageException ex)
        {
            return BadInput(context, ex.Message);
        }
        catch (JobFileException ex)
        {
            return BadInput(context, ex.Message);
        }
        catch (ModelException ex)
        {
            return BadInput(context, "the model cannot be solved as given: " + ex.Message);
        }
        catch (OutputFolderException ex)
        {
            return BadInput(context, ex.Message);
        }
        catch (StoreUnavailableException ex)
        {
            return BadInput(context, ex.Message);
        }
        catch (PlanUnavailableException ex)
        {
            return BadInput(context, ex.Message);
        }
    }

    /// <summary><c>latsweep</c>, <c>latsweep --help</c>, <c>latsweep help [COMMAND]</c>.</summary>
    private static int Help(IReadOnlyList<string> args, CliContext context)
    {
        if (args.Count == 0)
        {
            context.Stderr.Write(Usage.Text);
            return ExitCodes.BadInput;
        }

        if (args.Count > 1 && args[0] == "help")
        {
            if (CommandHelp.For(args[1]) is not { } text)
            {
                return BadInput(context, $"no command '{EchoText.Of(args[1])}' (commands: {string.Join(", ", CommandHelp.Commands)})");
            }

            context.Stdout.Write(text);
            return ExitCodes.Ok;
        }

        context.Stdout.Write(Usage.Text);
        return ExitCodes.Ok;
    }

    /// <summary>The store a command line names (its --store, else the default), or null when it names none usable.</summary>
    private static StoreLocation? StoreOf(IReadOnlyList<string> rest, CliContext context)
    {
        string? value = null;
        for (var i = 0; i < rest.Count; i++)
        {
            if (rest[i] == "--store" && i + 1 < rest.Count)
            {
                value = rest[i + 1];
            }
            else if (rest[i].StartsWith("--store=", StringComparison.Ordinal))
            {
                value = rest[i]["--store=".Length..];
            }
        }

        try
        {
            return StoreLocation.Parse(value, context.CurrentDirectory);
        }
        catch (ArgumentException)
        {
            return null;
        }
    }

    private static int Solve(CommandLine line, CliContext context) =>
        SolveCommand.Run(PathIn(context, line.Arguments[0]), context.Stdout, context.Stderr, line.Flag("full-precision"));

    /// <summary>A path given on the command line, taken relative to the command's folder.</summary>
    internal static string PathIn(CliContext context, string path) => Path.GetFullPath(Path.Combine(context.CurrentDirectory, path));

    private static int BadInput(CliContext context, string message) => BadInputReport.Write(context.Stderr, message);

    /// <summary>Option names; a leading '!' marks a flag without a value.</summary>
    private static Dictionary<string, bool> Options(params string[] names) =>
        names.ToDictionary(n => n.TrimStart('!'), n => !n.StartsWith('!'), StringComparer.Ordinal);
}
