using System.Collections.Immutable;

namespace LatticeSweep.Worker.Catalog;

/// <summary>What a failure is traced to.</summary>
public enum FailureOriginKind
{
    /// <summary>Each listed swept key alone: with its value put back to the job file's own, the point passes the Engine's checks.</summary>
    SweptValue,

    /// <summary>The listed swept keys together: no one of them alone, but with all put back the point passes.</summary>
    SweptTogether,

    /// <summary>The job file's own (unswept) values fail as well: the reason's lines are the keys to edit.</summary>
    JobFileValue,

    /// <summary>The failure could not be traced to a swept key (the Engine's checks before the spectrum pass; it failed later).</summary>
    NotTraced,

    /// <summary>A failure inside the solver (numerical, or a defect), not tied to any job-file key or value.</summary>
    InsideSolver,
}

/// <summary>
/// A swept key a failure is traced to: its field path and <c>FILE:LINE:COL</c> of its values; for a
/// column of a candidates table (<paramref name="CandidateColumn"/> set, the column's name in that file),
/// the failing candidate's row instead: <c>FILE:LINE</c> of a CSV file, <c>FILE row N</c> of a Parquet file.
/// </summary>
public sealed record OriginKey(string Path, string Location, string? CandidateColumn = null)
{
    /// <summary>True for a candidates column traced to its row.</summary>
    public bool IsCandidate => CandidateColumn is not null;

    /// <summary>The file of <see cref="Location"/>, or null when it is not <c>FILE:LINE:COL</c> (or names a candidate's row).</summary>
    public string? File => !IsCandidate && SplitAt() is { } at ? Location[..at] : null;

    /// <summary><c>LINE:COL</c> of <see cref="Location"/> (the whole location when it has no line).</summary>
    public string Place => !IsCandidate && SplitAt() is { } at ? Location[(at + 1)..] : Location;

    /// <summary>True for <c>LINE:COL</c>, two positive integers.</summary>
    public static bool IsLineAndColumn(string place)
    {
        var colon = place.IndexOf(':', StringComparison.Ordinal);
        return colon > 0 && IsNumber(place.AsSpan(0, colon)) && IsNumber(place.AsSpan(colon + 1));
    }

    private static bool IsNumber(ReadOnlySpan<char> s) => s.Length > 0 && !s.ContainsAnyExcept("0123456789");

    /// <summary>Index of the colon before <c>LINE:COL</c> at the end of the location.</summary>
    private int? SplitAt()
    {
        var col = Location.LastIndexOf(':');
        var line = col > 0 ? Location.LastIndexOf(':', col - 1) : -1;
        return line > 0 && IsLineAndColumn(Location[(line + 1)..]) ? line : null;
    }
}

/// <summary>
/// Where in the job file a failed point's reason comes from. It is written at the end of the error
/// text, in brackets (<see cref="FailureText"/>), the same for every point with that reason and
/// origin, so <c>points/</c>' <c>error</c> column, the catalog, <c>status</c>, <c>run</c> and the dashboard
/// group and show the same thing; the failing values are each point's own swept columns.
/// </summary>
public sealed record FailureOrigin(FailureOriginKind Kind, ImmutableArray<OriginKey> Keys)
{
    public static FailureOrigin JobFile { get; } = new(FailureOriginKind.JobFileValue, []);

    public static FailureOrigin Untraced { get; } = new(FailureOriginKind.NotTraced, []);

    public static FailureOrigin Solver { get; } = new(FailureOriginKind.InsideSolver, []);

    public bool Equals(FailureOrigin? other) => other is not null && Kind == other.Kind && Keys.SequenceEqual(other.Keys);

    public override int GetHashCode() => Keys.Aggregate(Kind.GetHashCode(), (h, k) => HashCode.Combine(h, k));

    /// <summary>The one file every key's place is in, when there are several keys (said once, not per key); else null.</summary>
    public string? SharedFile() =>
        Keys.Length > 1 && Keys[0].File is { } file && Keys.All(k => k.File == file) ? file : null;

    /// <summary>
    /// The failing candidate's row (<c>FILE:LINE</c> or <c>FILE row N</c>) when the failure is traced to columns of
    /// a candidates table; else null. A point comes from one row, so every candidate key names the same one.
    /// </summary>
    public string? CandidateRow => Keys.FirstOrDefault(k => k.IsCandidate)?.Location;

    /// <summary>In plain words, for the "where" line of a failure group.</summary>
    public string Describe() => CandidateRow is { } row ? DescribeCandidate(row) : Kind switch
    {
        FailureOriginKind.SweptValue when Keys.Length == 1 => $"the swept {Keys[0].Path}, values at {Keys[0].Location}",
        FailureOriginKind.SweptValue => "each of the swept " + KeysText(),
        FailureOriginKind.SweptTogether => "the swept values together (no one alone) of " + KeysText(),
        FailureOriginKind.JobFileValue => "the job file's own values (the lines named in the reason); not a swept value",
        FailureOriginKind.NotTraced => "not traced to a swept value (the checks before the spectrum pass; the lines in the reason are the job file's own keys)",
        FailureOriginKind.InsideSolver => "inside the solver: not tied to a job-file key or value (a numerical failure, or a defect to report)",
        _ => Kind.ToString(),
    };

    /// <summary>As <see cref="Describe"/> for several candidates' rows of one file that fail alike (<paramref name="rows"/> says which).</summary>
    public string DescribeCandidates(string rows) => DescribeCandidate(rows, "candidates");

    /// <summary>The candidate's row and columns first, then any other swept key with its values' place.</summary>
    private string DescribeCandidate(string row, string candidate = "candidate")
    {
        var columns = Keys.Where(k => k.IsCandidate).Select(k => $"column {k.CandidateColumn} ({k.Path})").ToList();
        var others = Keys.Where(k => !k.IsCandidate).Select(k => $"the swept {k.Path}, values at {k.Location}").ToList();
        var lead = Kind == FailureOriginKind.SweptTogether
            ? $"the values together (no one alone) of the {candidate} in {row}: "
            : $"the {candidate} in {row}: " + (Keys.Length > 1 ? "each of " : "");
        return lead + string.Join("; ", columns.Concat(others));
    }

    /// <summary><c>PATH, values at LINE:COL; ... in FILE</c> when they share a file, else each with its <c>FILE:LINE:COL</c>.</summary>
    private string KeysText() =>
        SharedFile() is { } file
            ? string.Join("; ", Keys.Select(k => $"{k.Path}, values at line {k.Place}")) + $", in {file}"
            : string.Join("; ", Keys.Select(k => $"{k.Path}, values at {k.Location}"));
}
