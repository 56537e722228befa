using System.Globalization;

namespace LatticeSweep.Worker.Cli;

/// <summary>
/// A parsed command line: the command, its positional arguments and its options
/// (<c>--name value</c>, <c>--name=value</c>, or a bare <c>--flag</c>).
/// </summary>
public sealed record CommandLine(string Command, IReadOnlyList<string> Arguments, IReadOnlyDictionary<string, string?> Options)
{
    public string? Option(string name) => Options.TryGetValue(name, out var v) ? v : null;

    public bool Flag(string name) => Options.ContainsKey(name);

    /// <summary>A whole-number option within a range, or the default when absent.</summary>
    public int IntOption(string name, int fallback, int min, int max)
    {
        var text = Option(name);
        if (text is null)
        {
            return fallback;
        }

        if (!int.TryParse(text, NumberStyles.Integer, CultureInfo.InvariantCulture, out var value) || value < min || value > max)
        {
            throw new UsageException($"--{name} takes a whole number from {min} to {max}, got '{text}'");
        }

        return value;
    }

    /// <summary>Parses <paramref name="args"/> against the command's known options (name → takes a value).</summary>
    public static CommandLine Parse(string command, IReadOnlyList<string> args, IReadOnlyDictionary<string, bool> known, int minArguments, int maxArguments)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(known);
        var positional = new List<string>();
        var options = new Dictionary<string, string?>(StringComparer.Ordinal);
        for (var i = 0; i < args.Count; i++)
        {
            var arg = args[i];
            if (!arg.StartsWith("--", StringComparison.Ordinal) || arg == "--")
            {
                positional.Add(arg);
                continue;
            }

            var body = arg[2..];
            string? inline = null;
            var eq = body.IndexOf('=', StringComparison.Ordinal);
            if (eq >= 0)
            {
                inline = body[(eq + 1)..];
                body = body[..eq];
            }

            if (!known.TryGetValue(body, out var takesValue))
            {
                var list = known.Count == 0 ? "it takes no options" : "known: " + string.Join(", ", known.Keys.Order(StringComparer.Ordinal).Select(k => "--" + k));
                throw new UsageException($"unknown option --{body} for '{command}' ({list})");
            }

            if (takesValue)
            {
                if (inline is null)
                {
                    if (i + 1 >= args.Count || args[i + 1].StartsWith("--", StringComparison.Ordinal))
                    {
                        throw new UsageException($"--{body} needs a value");
                    }

                    inline = args[++i];
                }

                options[body] = inline;
            }
            else
            {
                if (inline is not null)
                {
                    throw new UsageException($"--{body} takes no value");
                }

                options[body] = null;
            }
        }

        if (positional.Count < minArguments || positional.Count > maxArguments)
        {
            throw new UsageException(minArguments == maxArguments
                ? $"'{command}' takes {minArguments} argument(s), got {positional.Count}; see latsweep --help"
                : $"'{command}' takes {minArguments} to {maxArguments} argument(s), got {positional.Count}; see latsweep --help");
        }

        return new CommandLine(command, positional, options);
    }
}
