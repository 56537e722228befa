using System.Collections.Immutable;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The one format of a failed point's error text: the reason, then its origin in brackets,
/// <c>REASON [swept: PATH at FILE:LINE:COL; ...]</c>, <c>[swept together: ...]</c>,
/// <c>[from the job file's own values]</c>, <c>[not traced to a swept value]</c> or
/// <c>[inside the solver]</c>. Written by the worker, read back by <c>status</c>, <c>run</c> and the
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

    public static string Compose(string reason, FailureOrigin origin)
    {
        ArgumentNullException.ThrowIfNull(reason);
        ArgumentNullException.ThrowIfNull(origin);
        var keys = string.Join(KeySeparator, origin.Keys.Select(k => k.Path + At + k.Location));
        var tag = origin.Kind switch
        {
            FailureOriginKind.SweptValue => Swept + keys,
            FailureOriginKind.SweptTogether => Together + keys,
            FailureOriginKind.JobFileValue => OwnValues,
            FailureOriginKind.NotTraced => NotTraced,
            _ => Solver,
        };
        return $"{reason} [{tag}]";
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
        if (tag.StartsWith(Together, StringComparison.Ordinal))
        {
            return Keys(FailureOriginKind.SweptTogether, tag[Together.Length..]);
        }

        if (tag.StartsWith(Swept, StringComparison.Ordinal))
        {
            return Keys(FailureOriginKind.SweptValue, tag[Swept.Length..]);
        }

        return tag switch
        {
            OwnValues => FailureOrigin.JobFile,
            NotTraced => FailureOrigin.Untraced,
            Solver => FailureOrigin.Solver,
            _ => null,
        };
    }

    private static FailureOrigin? Keys(FailureOriginKind kind, string list)
    {
        var keys = ImmutableArray.CreateBuilder<OriginKey>();
        foreach (var item in list.Split(KeySeparator))
        {
            var at = item.IndexOf(At, StringComparison.Ordinal);
            if (at <= 0)
            {
                return null;
            }

            keys.Add(new OriginKey(item[..at], item[(at + At.Length)..]));
        }

        return keys.Count == 0 ? null : new FailureOrigin(kind, keys.ToImmutable());
    }
}
