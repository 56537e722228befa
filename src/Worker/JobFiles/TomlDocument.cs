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
internal sealed class TomlDocument
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

    /// <summary>Parses <paramref name="text"/>; on syntax errors adds them to <paramref name="problems"/> and returns null.</summary>
    public static TomlDocument? Parse(string text, string file, ProblemCollector problems)
    {
        var syntax = SyntaxParser.Parse(text, file, true);
        if (syntax.HasErrors)
        {
            foreach (var d in syntax.Diagnostics)
            {
                if (d.Kind == Tomlyn.Syntax.DiagnosticMessageKind.Error)
                {
                    problems.Add(new SourceLocation(d.Span.Start.Line + 1, d.Span.Start.Column + 1), "", "TOML syntax: " + d.Message);
                }
            }

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
            problems.Add(new SourceLocation(Math.Max(0, e.Line ?? 0), Math.Max(0, e.Column ?? 0)), "", "TOML: " + FirstLine(e.Message));
            return null;
        }
    }

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
