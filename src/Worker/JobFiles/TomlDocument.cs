using Tomlyn;
using Tomlyn.Model;
using Tomlyn.Parsing;
using Tomlyn.Serialization;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// A parsed TOML job file with the source position of every key, so each problem can be located.
/// Syntax is checked by Tomlyn's syntax parser first (it reports every error and rejects duplicate
/// keys, which its object reader would silently let the last one win).
/// </summary>
internal sealed partial class TomlDocument
{
    private readonly TomlMetadataStore _metadata;

    private TomlDocument(string file, TomlTable root, TomlMetadataStore metadata)
    {
        File = file;
        Root = root;
        _metadata = metadata;
    }

    public string File { get; }

    public TomlTable Root { get; }

    /// <summary>
    /// Parses <paramref name="text"/>; on a syntax error adds one problem to <paramref name="problems"/>
    /// and returns null. Only the first syntax error is reported (with a count of the others): after a
    /// missing bracket or quote the parser's later complaints are mostly echoes of the first.
    /// </summary>
    public static TomlDocument? Parse(string text, string file, ProblemCollector problems)
    {
        if (NestingDepth.FindTooDeep(text) is { } deep)
        {
            problems.Add(deep, "", TooDeep);
            return null;
        }

        Tomlyn.Syntax.DocumentSyntax syntax;
        try
        {
            syntax = SyntaxParser.Parse(text, file, true);
        }
        catch (TomlException e)
        {
            problems.Add(new SourceLocation(Math.Max(0, e.Line ?? 0), Math.Max(0, e.Column ?? 0)), "", "TOML: " + LibraryMessage(e.Message));
            return null;
        }

        if (syntax.HasErrors)
        {
            var errors = syntax.Diagnostics.Where(d => d.Kind == Tomlyn.Syntax.DiagnosticMessageKind.Error).ToList();
            var first = errors[0];
            var more = errors.Count - 1;
            var tail = more == 0 ? "" : $" ({more} more syntax error{(more == 1 ? "" : "s")} after it, often caused by this one; fix it and check again)";
            problems.Add(new SourceLocation(first.Span.Start.Line + 1, first.Span.Start.Column + 1), "", "TOML syntax: " + Plain(first.Message) + tail);
            return null;
        }

        if (SplitTableArrays.Find(syntax) is { } split)
        {
            problems.Add(split.At, split.Key, split.Message);
            return null;
        }

        var metadata = new TomlMetadataStore();
        var options = new TomlSerializerOptions { MetadataStore = metadata, SourceName = file };
        try
        {
            var root = TomlSerializer.Deserialize<TomlTable>(text, options) ?? new TomlTable();
            return new TomlDocument(file, root, metadata);
        }
        catch (TomlException e)
        {
            problems.Add(new SourceLocation(Math.Max(0, e.Line ?? 0), Math.Max(0, e.Column ?? 0)), "", "TOML: " + LibraryMessage(e.Message));
            return null;
        }
    }

    private static string TooDeep =>
        $"nested more than {NestingDepth.Max} levels deep (tables, dotted keys, arrays and inline tables inside each other); a job file needs only a few";

    /// <summary>
    /// A syntax message in plain words: the parser's token names and its newline symbol dropped.
    /// </summary>
    private static string Plain(string message)
    {
        // "already defined at (1,1) with `[sample]␤kind = ...`" quotes the whole earlier table; its line says enough.
        var plain = AlreadyDefined().Replace(TokenNames().Replace(message, ""), "is already defined at line ${line} and cannot be defined again (write each table and key once)");
        return plain.Replace("`␤`", "the end of the line", StringComparison.Ordinal).Replace("␤", "the end of the line", StringComparison.Ordinal);
    }

    /// <summary>The first line of the library's message, without advice about the library's own settings.</summary>
    private static string LibraryMessage(string message)
    {
        var line = FirstLine(message);
        var error = line.IndexOf(": error : ", StringComparison.Ordinal);
        if (error >= 0)
        {
            line = line[(error + ": error : ".Length)..]; // the location is given separately
        }

        var advice = line.IndexOf(" Change TomlSerializerOptions", StringComparison.Ordinal);
        if (line.Contains("maximum depth", StringComparison.OrdinalIgnoreCase))
        {
            return TooDeep;
        }

        return advice >= 0 ? line[..advice] : line;
    }

    [System.Text.RegularExpressions.GeneratedRegex(@"is already defined at \((?<line>\d+),\d+\) with `.*` and cannot be redefined", System.Text.RegularExpressions.RegexOptions.Singleline)]
    private static partial System.Text.RegularExpressions.Regex AlreadyDefined();

    [System.Text.RegularExpressions.GeneratedRegex(@" \(token: `[^`]*`\)")]
    private static partial System.Text.RegularExpressions.Regex TokenNames();

    /// <summary>Where <paramref name="key"/> of <paramref name="table"/> is written (its key token).</summary>
    public SourceLocation Locate(TomlTable table, string key)
    {
        if (_metadata.TryGetProperties(table, out var properties) && properties is not null
            && properties.TryGetProperty(key, out var meta) && meta is not null)
        {
            var span = meta.Span;
            if (span.Start.Line >= 0 && span.End.Offset >= span.Start.Offset)
            {
                return new SourceLocation(span.Start.Line + 1, span.Start.Column + 1);
            }
        }

        return SourceLocation.Unknown;
    }

    /// <summary>The position of the first key written in <paramref name="table"/> (for a table with a problem of its own).</summary>
    public SourceLocation LocateTable(TomlTable table)
    {
        foreach (var key in table.Keys)
        {
            var at = Locate(table, key);
            if (at.IsKnown)
            {
                return at;
            }
        }

        return SourceLocation.Unknown;
    }

    private static string FirstLine(string message)
    {
        var i = message.IndexOf('\n', StringComparison.Ordinal);
        return i < 0 ? message : message[..i].TrimEnd();
    }
}
