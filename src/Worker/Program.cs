using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using LatticeSweep.Worker.Cli;

namespace LatticeSweep.Worker;

/// <summary>The <c>latsweep</c> command line.</summary>
internal static class Program
{
    private static int Main(string[] args)
    {
        // Before any Engine type is loaded: a published x86-64 build holds one Engine image per vector width.
        EngineImages.LoadFromPublishedFolders();
        Queue.MemoryRelease.LimitNativeArenas();
        Queue.MemoryTrace.StartIfAsked();
        return Run(args);
    }

    // Kept out of Main so that nothing Run needs is loaded before the handler above is in place.
    [MethodImpl(MethodImplOptions.NoInlining)]
    private static int Run(string[] args)
    {
        using var stop = new CancellationTokenSource();
        Console.CancelKeyPress += (_, e) =>
        {
            // First Ctrl+C stops gracefully (running chunks finish or go back to the queue); a second one kills.
            if (!stop.IsCancellationRequested)
            {
                e.Cancel = true;
                stop.Cancel();
            }
        };
        using var term = PosixSignalRegistration.Create(PosixSignal.SIGTERM, ctx =>
        {
            ctx.Cancel = true;
            stop.Cancel();
        });

        try
        {
            return CliApp.Run(args, new CliContext
            {
                Stdout = Console.Out,
                Stderr = Console.Error,
                CurrentDirectory = Environment.CurrentDirectory,
                StderrIsTerminal = !Console.IsErrorRedirected,
                Stop = stop.Token,
            });
        }
        catch (Exception ex) when (ex is not OutOfMemoryException)
        {
            // A defect, not the user's input: say what happened in one line; the log file has the details.
            Serilog.Log.Logger.Fatal(ex, "latsweep stopped on an unexpected error");
            Console.Error.WriteLine($"latsweep: unexpected error: {ex.GetType().Name}: {ex.Message}");
            return ExitCodes.Internal;
        }
        finally
        {
            Serilog.Log.CloseAndFlush();
        }
    }
}
