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
            (args.Count == 0 ? context.Stderr : context.Stdout).Write(Usage.Text);
            return args.Count == 0 ? ExitCodes.BadInput : ExitCodes.Ok;
        }

        var command = args[0];
        var rest = args.Skip(1).ToList();
        if (rest.Contains("--help") || rest.Contains("-h"))
        {
            context.Stdout.Write(Usage.Text);
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
                "solve" => SolveCommand.Run(PathIn(context, CommandLine.Parse(command, rest, Options(), 1, 1).Arguments[0]), context.Stdout, context.Stderr),
                _ => throw new UsageException($"unknown command '{command}' (commands: run, check, solve, submit, work, status, cancel, resume, merge; see latsweep --help)"),
            };
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

    /// <summary>A path given on the command line, taken relative to the command's folder.</summary>
    internal static string PathIn(CliContext context, string path) => Path.GetFullPath(Path.Combine(context.CurrentDirectory, path));

    private static int BadInput(CliContext context, string message)
    {
        context.Stderr.WriteLine("latsweep: " + message);
        return ExitCodes.BadInput;
    }

    /// <summary>Option names; a leading '!' marks a flag without a value.</summary>
    private static Dictionary<string, bool> Options(params string[] names) =>
        names.ToDictionary(n => n.TrimStart('!'), n => !n.StartsWith('!'), StringComparer.Ordinal);
}
