using LatticeSweep.Worker.JobFiles;

namespace LatticeSweep.Worker.Cli;

/// <summary>
/// How every command reports a user's mistake: "latsweep: " before the first line (so it reads as
/// this program's message among others in a script's output), each line escaped and cut (a message
/// may quote text from the user or from a library) unless it comes from the job-file reader, which
/// quotes through <see cref="EchoText"/> already; exit code 2.
/// </summary>
public static class BadInputReport
{
    public static int Write(TextWriter stderr, string message, bool escaped = false)
    {
        ArgumentNullException.ThrowIfNull(stderr);
        ArgumentNullException.ThrowIfNull(message);
        if (escaped)
        {
            stderr.WriteLine("latsweep: " + message);
            return ExitCodes.BadInput;
        }

        var prefix = "latsweep: ";
        foreach (var line in message.ReplaceLineEndings("\n").Split('\n'))
        {
            stderr.WriteLine(prefix + EchoText.Cut(line, EchoText.MaxLineChars));
            prefix = "";
        }

        return ExitCodes.BadInput;
    }
}
