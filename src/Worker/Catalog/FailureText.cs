using System.Collections.Immutable;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The one format of a failed point's error text: the reason, then its origin in brackets,
/// <c>REASON [swept: PATH at FILE:LINE:COL]</c>, with several keys in one file the file said once
/// (<c>[swept in FILE: PATH at LINE:COL; PATH at LINE:COL]</c>), <c>[swept together ...]</c>,
/// <c>[from the job file's own values]</c>, <c>[not traced to a swept value]</c> or
/// <c>[inside the solver]</c>. A failure traced to columns of a candidates table names the failing
/// candidate's row, <c>[candidate in FILE:LINE, column NAME (PATH)]</c> (a Parquet file: <c>FILE row N</c>),
/// more columns and any other swept key after <c>; </c>, or <c>[candidate together in ...]</c>. Written by the worker, read back by <c>status</c>, <c>run</c> and the
/// dashboard; a reader of <c>points/</c> sees the same line. Texts without a bracket (stores from
/// before, I/O and input failures) have no origin.
/// </summary>
public static class FailureText
{
    private const string Swept = "swept: ";
    private const string Together = "swept together: ";
    private const string OwnValues = "from the job file's own values";
    private const string NotTraced = "not traced to a swept value";
    private const string Solver = "inside the solver, not tied to a job-file key";
    private const string KeySeparator = "; ";
    private const string At = " at ";
    private const string InFile = " in ";
    private const string Candidate = "candidate in ";
    private const string CandidateTogether = "candidate together in ";
    private const string ColumnLead = "column ";

    public static string Compose(string reason, FailureOrigin origin)
    {
        ArgumentNullException.ThrowIfNull(reason);
        ArgumentNullException.ThrowIfNull(origin);
        var tag = origin.CandidateRow is { } row ? CandidateList(origin, row) : origin.Kind switch
        {
            FailureOriginKind.SweptValue => KeyList(Swept, origin),
            FailureOriginKind.SweptTogether => KeyList(Together, origin),
            FailureOriginKind.JobFileValue => OwnValues,
            FailureOriginKind.NotTraced => NotTraced,
            _ => Solver,
        };
        return $"{reason} [{tag}]";
    }

    /// <summary>
    /// <c>swept: PATH at FILE:LINE:COL; ...</c>, or when every key's place is in one file and there are
    /// several, <c>swept in FILE: PATH at LINE:COL; ...</c>: a long absolute path said once, not per key.
    /// </summary>
    private static string KeyList(string lead, FailureOrigin origin)
    {
        if (origin.SharedFile() is { } file)
        {
            return $"{lead[..^2]}{InFile}{file}: " + string.Join(KeySeparator, origin.Keys.Select(k => k.Path + At + k.Place));
        }

        return lead + string.Join(KeySeparator, origin.Keys.Select(k => k.Path + At + k.Location));
    }

    /// <summary>
    /// <c>candidate in ROW, column NAME (PATH); ...; PATH at FILE:LINE:COL</c>: the row said once, its columns, then
    /// any swept key of the job file with its own place. The row is what a user edits; the path is the field it sets.
    /// </summary>
    private static string CandidateList(FailureOrigin origin, string row)
    {
        var lead = origin.Kind == FailureOriginKind.SweptTogether ? CandidateTogether : Candidate;
        var items = origin.Keys.Where(k => k.IsCandidate).Select(k => $"{ColumnLead}{k.CandidateColumn} ({k.Path})")
            .Concat(origin.Keys.Where(k => !k.IsCandidate).Select(k => k.Path + At + k.Location));
        return $"{lead}{row}, " + string.Join(KeySeparator, items);
    }

    /// <summary>The reason and its origin; the whole text and null when it carries none.</summary>
    public static (string Reason, FailureOrigin? Origin) Split(string? error)
    {
        if (string.IsNullOrEmpty(error) || !error.EndsWith(']'))
        {
            return (error ?? "", null);
        }

        var open = error.LastIndexOf(" [", StringComparison.Ordinal);
        while (open >= 0)
        {
            var tag = error[(open + 2)..^1];
            if (Parse(tag) is { } origin)
            {
                return (error[..open], origin);
            }

            open = open == 0 ? -1 : error.LastIndexOf(" [", open - 1, StringComparison.Ordinal);
        }

        return (error, null);
    }

    private static FailureOrigin? Parse(string tag)
    {
        foreach (var (lead, kind) in new[] { (CandidateTogether, FailureOriginKind.SweptTogether), (Candidate, FailureOriginKind.SweptValue) })
        {
            if (tag.StartsWith(lead, StringComparison.Ordinal))
            {
                return CandidateKeys(kind, tag[lead.Length..]);
            }
        }

        foreach (var (lead, kind) in new[] { (Together, FailureOriginKind.SweptTogether), (Swept, FailureOriginKind.SweptValue) })
        {
            if (tag.StartsWith(lead, StringComparison.Ordinal))
            {
                return Keys(kind, tag[lead.Length..], file: null);
            }

            var inFile = lead[..^2] + InFile;
            if (tag.StartsWith(inFile, StringComparison.Ordinal))
            {
                // The file may hold ": " itself: the list starts after the first ": " whose rest reads as keys at LINE:COL.
                var rest = tag[inFile.Length..];
                for (var colon = rest.IndexOf(": ", StringComparison.Ordinal); colon > 0; colon = rest.IndexOf(": ", colon + 1, StringComparison.Ordinal))
                {
                    if (Keys(kind, rest[(colon + 2)..], rest[..colon]) is { } origin)
                    {
                        return origin;
                    }
                }

                return null;
            }
        }

        return tag switch
        {
            OwnValues => FailureOrigin.JobFile,
            NotTraced => FailureOrigin.Untraced,
            Solver => FailureOrigin.Solver,
            _ => null,
        };
    }

    /// <summary>
    /// <c>ROW, column NAME (PATH); ...</c>: the file may hold <c>", "</c> itself, so the row ends at the first
    /// <c>", column "</c> after a line (<c>:LINE</c>) or row number (<c> row N</c>) whose rest reads as the list.
    /// </summary>
    private static FailureOrigin? CandidateKeys(FailureOriginKind kind, string rest)
    {
        const string Separator = ", " + ColumnLead;
        for (var at = rest.IndexOf(Separator, StringComparison.Ordinal); at > 0; at = rest.IndexOf(Separator, at + 1, StringComparison.Ordinal))
        {
            var row = rest[..at];
            if (!IsCandidateRow(row))
            {
                continue;
            }

            var keys = ImmutableArray.CreateBuilder<OriginKey>();
            foreach (var item in rest[(at + 2)..].Split(KeySeparator))
            {
                var open = item.LastIndexOf(" (", StringComparison.Ordinal);
                if (item.StartsWith(ColumnLead, StringComparison.Ordinal) && item.EndsWith(')') && open > ColumnLead.Length)
                {
                    keys.Add(new OriginKey(item[(open + 2)..^1], row, item[ColumnLead.Length..open]));
                }
                else if (item.IndexOf(At, StringComparison.Ordinal) is var keyAt and > 0)
                {
                    keys.Add(new OriginKey(item[..keyAt], item[(keyAt + At.Length)..]));
                }
                else
                {
                    keys.Clear();
                    break;
                }
            }

            if (keys.Count > 0 && keys[0].IsCandidate)
            {
                return new FailureOrigin(kind, keys.ToImmutable());
            }
        }

        return null;
    }

    /// <summary>True for <c>FILE:LINE</c> or <c>FILE row N</c>.</summary>
    private static bool IsCandidateRow(string row)
    {
        var digits = row.Length - row.AsSpan().TrimEnd("0123456789").Length;
        if (digits == 0 || digits == row.Length)
        {
            return false;
        }

        var head = row.AsSpan(0, row.Length - digits);
        return (head.EndsWith(":") && head.Length > 1) || (head.EndsWith(" row ") && head.Length > 5);
    }

    /// <summary>The keys of a list; with <paramref name="file"/>, each place is <c>LINE:COL</c> in that file.</summary>
    private static FailureOrigin? Keys(FailureOriginKind kind, string list, string? file)
    {
        var keys = ImmutableArray.CreateBuilder<OriginKey>();
        foreach (var item in list.Split(KeySeparator))
        {
            var at = item.IndexOf(At, StringComparison.Ordinal);
            if (at <= 0)
            {
                return null;
            }

            var place = item[(at + At.Length)..];
            if (file is not null && !OriginKey.IsLineAndColumn(place))
            {
                return null;
            }

            keys.Add(new OriginKey(item[..at], file is null ? place : $"{file}:{place}"));
        }

        return keys.Count == 0 ? null : new FailureOrigin(kind, keys.ToImmutable());
    }
}
