using System.Collections.Immutable;
using LatticeSweep.Dashboard.Formatting;
using LatticeSweep.Dashboard.Progress;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Endpoints;

/// <summary>A sweep's line on the sweeps page: counts, rate and time left, with the texts the page shows.</summary>
public sealed record SweepLine(
    string SweepId,
    string Name,
    string Description,
    string State,
    long Total,
    long Waiting,
    long Running,
    long Done,
    long Failed,
    long Cancelled,
    double FractionFinished,
    double? RatePointsPerMin,
    double? EtaS,
    double? ElapsedS,
    DateTimeOffset CreatedAt,
    DateTimeOffset? StartedAt,
    DateTimeOffset? FinishedAt,
    string Url,
    SweepLineText Text)
{
    /// <summary>Points solved whose model is unstable (not in <see cref="Done"/>).</summary>
    public long Unstable { get; init; }

    public static SweepLine Of(SweepProgress p)
    {
        ArgumentNullException.ThrowIfNull(p);
        var s = p.Sweep;
        var c = s.Counts;
        return new SweepLine(
            s.SweepId, s.Name, s.Description, StateText(s.State), c.Total, c.Waiting, c.Running, c.Done, c.Failed, c.Cancelled,
            p.FractionFinished, p.RatePointsPerMinute, p.Remaining?.TotalSeconds, p.Elapsed?.TotalSeconds,
            s.CreatedAt, s.StartedAt, s.FinishedAt, Links.Sweep(s.SweepId),
            new SweepLineText(Show.Percent(p.FractionFinished), Show.Rate(p.RatePointsPerMinute), Show.Number(p.RatePointsPerMinute),
                p.IsActive ? Show.Duration(p.Remaining) : Show.Missing, Show.Duration(p.Elapsed), Show.Clock(s.StartedAt), Show.Clock(s.FinishedAt)))
        {
            Unstable = c.Unstable,
        };
    }

    public static string StateText(SweepState state) => state.ToString().ToLowerInvariant();
}

/// <summary>The display texts of a <see cref="SweepLine"/>, formatted once on the server (times in UTC).</summary>
public sealed record SweepLineText(string Finished, string Rate, string RateNumber, string Eta, string Elapsed, string Started, string FinishedAt);

/// <summary>The sweeps list.</summary>
public sealed record SweepList(DateTimeOffset GeneratedAt, ImmutableArray<SweepLine> Sweeps);

/// <summary>Point counts for one value of a swept parameter.</summary>
public sealed record AxisValueLine(object Value, string ValueText, long Total, long Done, long Failed, long Pending, long Cancelled)
{
    /// <summary>Points of this value whose model is unstable.</summary>
    public long Unstable { get; init; }

    /// <summary>
    /// For a bin of a drawn axis (<see cref="AxisLine.Bins"/>), its upper edge: <see cref="Value"/> is its lower edge and
    /// <see cref="ValueText"/> the bin as read (<c>[10, 10.5)</c>); null for a value.
    /// </summary>
    [System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    public object? Upper { get; init; }
}

/// <summary>
/// Coverage of one swept parameter: <see cref="Values"/> from position <see cref="Offset"/> of
/// <see cref="ValueCount"/>, at most <see cref="ValuesPerPage"/>; <see cref="MoreValues"/> after them,
/// the next ones at <see cref="NextUrl"/> (null when none are left).
/// </summary>
public sealed record AxisLine(string Column, string Path, string Unit, ImmutableArray<AxisValueLine> Values)
{
    /// <summary>Values per axis in the sweep's JSON and on its page, and the largest <c>limit</c> of an axis's own endpoint.</summary>
    public const int ValuesPerPage = 1000;

    public long Offset { get; init; }

    public long ValueCount { get; init; }

    public long MoreValues => Math.Max(0, ValueCount - Offset - Values.Length);

    /// <summary>
    /// For a swept parameter of drawn values (one point per value), what its coverage is counted in
    /// (<c>100 bins of equal width on a linear scale</c>): each of <see cref="Values"/> is then a bin. Null for values.
    /// </summary>
    [System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    public string? Bins { get; init; }

    public string? NextUrl { get; init; }
}

/// <summary>A failed point as listed in its group.</summary>
public sealed record FailedPointLine(string PointId, ImmutableSortedDictionary<string, object> Parameters, int Attempts, string? Worker, string Url);

/// <summary>
/// Failed points sharing one reason and origin: <see cref="Reason"/> without its origin, <see cref="From"/> where in the job
/// file it comes from (null for I/O and input failures), <see cref="FailingValues"/> the values of the swept keys it is
/// traced to over all the group's points, <see cref="Error"/> the text in the error column of <c>points/</c>.
/// </summary>
public sealed record FailureLine(string Kind, string KindText, string Reason, long Count, ImmutableArray<FailedPointLine> Points)
{
    public string Error { get; init; } = Reason;

    public string? From { get; init; }

    public ImmutableArray<string> Keys { get; init; } = [];

    public ImmutableArray<string> KeyColumns { get; init; } = [];

    public string? FailingValues { get; init; }

    /// <summary>The group's short name in addresses (<see cref="LatticeSweep.Worker.Catalog.FailureGroup.Key"/>).</summary>
    public string Key { get; init; } = "";

    /// <summary>Where <see cref="Points"/> starts among the group's points, in plan order.</summary>
    public long Offset { get; init; }

    /// <summary>The page listing the group's points, a page at a time (<c>?offset=N</c>).</summary>
    public string PageUrl { get; init; } = "";
}

/// <summary>A failure group as a block of a page: the sweep page's first page of points, or one page of the group's own list.</summary>
public sealed record FailureGroupBlock(FailureLine Line, ImmutableArray<LatticeSweep.Worker.Planning.AxisInfo> Axes, bool Paged);

/// <summary>A dataset folder of the sweep and where to browse it.</summary>
public sealed record DatasetLink(string Table, string Url, int PartFiles);

/// <summary>Everything the sweep page shows except the summary table.</summary>
public sealed record SweepDetail(
    SweepLine Sweep,
    int Chunks,
    string EngineVersion,
    bool ResultsAvailable,
    ImmutableArray<AxisLine> Axes,
    ImmutableArray<FailureLine> Failures,
    ImmutableArray<DatasetLink> Datasets,
    string ResultsUrl,
    StabilityCounts Stability)
{
    /// <summary>Failure reasons beyond the groups listed (the largest are listed).</summary>
    public int MoreFailureReasons { get; init; }

    /// <summary>Failed points of those reasons.</summary>
    public long MoreFailedPoints { get; init; }
}

/// <summary>A page of the summary table: <see cref="TotalRows"/> rows pass the filter, of <see cref="AllRows"/> in points/.</summary>
public sealed record ResultsPage(
    ImmutableArray<SummaryColumn> Columns,
    ImmutableArray<ResultsRow> Rows,
    int TotalRows,
    int AllRows,
    string Sort,
    bool Descending,
    int Offset,
    int Limit,
    FilterLine Filter,
    StabilityCounts Stability);

/// <summary>A row of the summary table, values in column order, with its marks.</summary>
public sealed record ResultsRow(string PointId, string Url, ImmutableArray<object?> Values, bool Unstable, bool Floppy);

/// <summary>The filter in effect: in words, as an address query, and what could not be applied.</summary>
public sealed record FilterLine(string Text, string Query, ImmutableArray<string> Problems);

/// <summary>Both plots of the sweep page for one address; a plot is null when the table cannot give it (no results yet).</summary>
public sealed record SweepPlotSet(SweepPlot? Parameter, SweepPlot? Scatter, FilterLine Filter);

/// <summary>A point: the catalog's record and its summary numbers (empty until it has a result row).</summary>
public sealed record PointDetail(
    string SweepId,
    string PointId,
    string State,
    string? FailureKind,
    string? Error,
    int Attempts,
    string ChunkId,
    string? Worker,
    DateTimeOffset? StartedAt,
    DateTimeOffset? FinishedAt,
    double? DurationS,
    ImmutableSortedDictionary<string, object> Parameters,
    ImmutableArray<PointNumberGroup> Summary,
    string CurvesUrl);

/// <summary>Addresses of the pages and endpoints, in one place.</summary>
public static class Links
{
    public static string Sweep(string sweepId) => "/sweeps/" + Uri.EscapeDataString(sweepId);

    public static string Point(string sweepId, string pointId) => Sweep(sweepId) + "/points/" + Uri.EscapeDataString(pointId);

    public static string ApiSweep(string sweepId) => "/api" + Sweep(sweepId);

    public static string ApiResults(string sweepId) => ApiSweep(sweepId) + "/results";

    public static string ApiPoint(string sweepId, string pointId) => "/api" + Point(sweepId, pointId);

    public static string ApiCurves(string sweepId, string pointId) => ApiPoint(sweepId, pointId) + "/curves";

    public static string ApiPlots(string sweepId) => ApiSweep(sweepId) + "/plots";

    /// <summary>The sweep page's plots as an HTML fragment (their facts and their JSON), for the page's script or a reader without one.</summary>
    public static string SweepPlots(string sweepId) => Sweep(sweepId) + "/plots";

    public static string Compare(string sweepId) => Sweep(sweepId) + "/compare";

    /// <summary>The page of one failure group's points (<c>?offset=N</c> for a later page).</summary>
    public static string Failures(string sweepId, string groupKey) => Sweep(sweepId) + "/failures/" + Uri.EscapeDataString(groupKey);

    public static string ApiFailures(string sweepId, string groupKey) => "/api" + Failures(sweepId, groupKey);

    /// <summary>One swept parameter's coverage, <c>?offset=N&amp;limit=M</c> values at a time.</summary>
    public static string ApiCoverage(string sweepId, string column) => ApiSweep(sweepId) + "/coverage/" + Uri.EscapeDataString(column);

    public static string ApiCompare(string sweepId) => ApiSweep(sweepId) + "/compare";

    public static string Export(string sweepId, string format) => ApiSweep(sweepId) + "/export." + format;

    public const string ApiWorkers = "/api/workers";

    /// <summary>The file browser for a path relative to the output root (segments escaped, slashes kept).</summary>
    public static string Files(string relative) =>
        "/files/" + string.Join('/', relative.Split('/', StringSplitOptions.RemoveEmptyEntries).Select(Uri.EscapeDataString));
}
