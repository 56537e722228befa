using System.Collections.Immutable;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Progress;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Endpoints;

/// <summary>The sweep's points/ table, the rows that pass the filter, and the filter as applied (conditions on unknown columns left out).</summary>
internal sealed record FilteredPoints(ResultTable All, ResultTable Rows, PointFilter Filter, FilterLine Line);

/// <summary>Builds what the pages and the JSON endpoints show from the catalog and the result files, so both say the same.</summary>
internal static class SweepViews
{
    public static SweepList List(SweepBoard board) =>
        new(board.Time.GetUtcNow(), [.. board.Catalog.ListSweeps().Select(s => SweepLine.Of(board.Progress(s)))]);

    public static WorkerList Workers(SweepBoard board) => WorkerBoard.Of(board.Store, board.Time.GetUtcNow());

    public static async Task<SweepDetail> DetailAsync(SweepBoard board, SweepRecord sweep, CancellationToken ct)
    {
        using var catalogSide = StageTimings.Measure("detail: catalog and files");
        var folder = board.Results.SweepFolderOf(sweep);
        IReadOnlyList<AxisCoverage> coverage;
        using (StageTimings.Measure("detail: coverage"))
        {
            coverage = board.Catalog.GetAxisCoverage(sweep.SweepId, new AxisWindow(0, AxisLine.ValuesPerPage));
        }

        var axes = coverage.Select(a => AxisLineOf(sweep, a, AxisLine.ValuesPerPage)).ToImmutableArray();
        FailureSummary failures;
        using (StageTimings.Measure("detail: failures"))
        {
            failures = FailureReport.Of(board.Catalog, sweep.SweepId);
        }
        var datasets = folder is null
            ? []
            : sweep.Tables
                .Select(t => (Table: t, Folder: board.Root.Contain(SweepFolder.Table(folder, t))))
                .Where(t => t.Folder is not null && Directory.Exists(t.Folder))
                .Select(t => new DatasetLink(t.Table, Links.Files(board.Root.Relative(t.Folder!)), ParquetTableReader.PartFiles(t.Folder!).Count))
                .Prepend(new DatasetLink(SweepFolder.ManifestFileName, Links.Files(board.Root.Relative(folder) + "/" + SweepFolder.ManifestFileName), 0))
                .ToImmutableArray();
        StabilityCounts stability;
        using (StageTimings.Measure("detail: stability counts"))
        {
            stability = StabilityCounts.Of(await board.Results.PointsAsync(sweep, ct).ConfigureAwait(false));
        }

        return new SweepDetail(SweepLine.Of(board.Progress(sweep)), sweep.ChunkCount, sweep.EngineVersion, folder is not null, axes,
            [.. failures.Groups.Select(g => FailureLineOf(sweep, g))], datasets, Links.ApiResults(sweep.SweepId), stability)
        {
            MoreFailureReasons = failures.MoreReasons,
            MoreFailedPoints = failures.MorePoints,
        };
    }

    /// <summary>One swept parameter's coverage as the page and the JSON show it, with the address of its next <paramref name="limit"/> values.</summary>
    public static AxisLine AxisLineOf(SweepRecord sweep, AxisCoverage a, int limit)
    {
        var next = a.Offset + a.Values.Length;
        return new AxisLine(a.ColumnName, a.Path, Formatting.Show.Unit(a.Unit), [.. a.Values.Select(v =>
            new AxisValueLine(v.Value, v.BinText ?? Formatting.Show.Value(v.Value, a.Unit), v.Total, v.Done, v.Failed, v.Pending, v.Cancelled) { Unstable = v.Unstable, Upper = v.Upper })])
        {
            Bins = a.Bins,
            Offset = a.Offset,
            ValueCount = a.ValueCount,
            NextUrl = next < a.ValueCount
                ? Links.ApiCoverage(sweep.SweepId, a.ColumnName) + FormattableString.Invariant($"?offset={next}&limit={limit}")
                : null,
        };
    }

    /// <summary>
    /// One swept parameter's values from <paramref name="offset"/>, at most <paramref name="limit"/>;
    /// null when the sweep sweeps no parameter of that column.
    /// </summary>
    public static AxisLine? Coverage(SweepBoard board, SweepRecord sweep, string column, long offset, int limit)
    {
        using var timing = StageTimings.Measure("coverage: one axis");
        return board.Catalog.GetAxisCoverage(sweep.SweepId, new AxisWindow(offset, limit, column)).FirstOrDefault() is { } a ? AxisLineOf(sweep, a, limit) : null;
    }

    /// <summary>One failure group as the pages and the JSON show it, with the page of its points <paramref name="view"/> holds.</summary>
    public static FailureLine FailureLineOf(SweepRecord sweep, FailureGroupView view) =>
        new(view.Group.Kind.ToString().ToLowerInvariant(), view.KindText, view.Group.ReasonText, view.Group.Count,
            [.. view.Points.Select(p => new FailedPointLine(p.PointId, p.Parameters, p.Attempts, p.Worker, Links.Point(sweep.SweepId, p.PointId)))])
        {
            Error = view.Group.Reason,
            From = view.Group.Origin?.Describe(),
            Keys = [.. view.Group.Origin?.Keys.Select(k => k.Path) ?? []],
            KeyColumns = [.. view.Group.Values.Select(v => v.Column)],
            FailingValues = view.Group.Values.Length > 0 ? view.Group.ValuesText : null,
            Key = view.Group.Key,
            Offset = view.Offset,
            PageUrl = Links.Failures(sweep.SweepId, view.Group.Key),
        };

    /// <summary>A page of one failure group's points, or null when the sweep has no group with that key.</summary>
    public static FailureLine? FailurePage(SweepBoard board, SweepRecord sweep, string key, long offset, int limit)
    {
        using var timing = StageTimings.Measure("failures: a group's page");
        return FailureReport.Page(board.Catalog, sweep.SweepId, key, Math.Max(0, offset), limit) is { } view ? FailureLineOf(sweep, view) : null;
    }

    /// <summary>The points/ table and the rows that pass <paramref name="filter"/>.</summary>
    /// <remarks><paramref name="drawing"/>: the view whose plots the request draws (its ids are read ahead while the filter runs), or null.</remarks>
    public static async Task<FilteredPoints> FilterAsync(SweepBoard board, SweepRecord sweep, PointFilter filter, IEnumerable<string> problems, CancellationToken ct,
        SweepView? drawing = null)
    {
        var all = await board.Results.PointsAsync(sweep, ct).ConfigureAwait(false);
        var said = new List<string>(problems);
        var applied = all.Rows.Length == 0 ? filter : filter.CheckedAgainst(all, said);
        if (drawing is not null)
        {
            ReadIdsAhead(all, applied, drawing);
        }

        var line = new FilterLine(applied.Describe(new ColumnCatalog(sweep, TableNames.Points)), SweepView.Encode(applied.Query()), [.. said]);
        return new FilteredPoints(all, applied.Apply(all), applied, line);
    }

    /// <remarks><paramref name="withPlots"/>: the request draws the view's plots too (the sweep page).</remarks>
    public static async Task<(SummaryTable Table, ResultsPage Page, FilteredPoints Points)> ResultsAsync(SweepBoard board, SweepRecord sweep, SweepView view, CancellationToken ct,
        bool withPlots = false)
    {
        var points = await FilterAsync(board, sweep, view.Filter, view.Problems, ct, withPlots ? view : null).ConfigureAwait(false);
        var table = SummaryTable.Build(points.All, points.Rows, sweep, view.Table);
        var page = new ResultsPage(table.Columns, [.. table.Rows.Select(r => new ResultsRow(r.PointId, Links.Point(sweep.SweepId, r.PointId), r.Values, r.Unstable, r.Floppy))],
            table.TotalRows, table.AllRows, table.Sort, table.Descending, table.Offset, table.Limit, points.Line, StabilityCounts.Of(points.All));
        return (table, page, points);
    }

    /// <summary>
    /// The plots, kept with the filtered table for the same choices: an unfiltered view is the cached
    /// whole table, so its plots are made once per change of points/; a filtered view's are kept with
    /// the whole table too, among its last few (<see cref="RecentFacts"/>), so paging or sorting a
    /// filter draws them once. A filtered view's two plots are made side by side (each a pass over
    /// the view's rows; the 10^6-row table's far filtered page spent 0.7 s in them one after the other).
    /// </summary>
    public static SweepPlotSet Plots(FilteredPoints points, SweepRecord sweep, SweepView view)
    {
        if (ReferenceEquals(points.Rows, points.All))
        {
            if (points.All.FirstLoad is { Merged: true })
            {
                return new(ParameterPlot(points, sweep, view), ScatterPlot(points, sweep, view), points.Line);
            }

            // Side by side, as a filtered view's: without the merge's entry each plot is a pass over every row (a running
            // sweep's 10^6 rows in 128 parts: the plots' fragment waited for one after the other on a 2-core machine).
            var scatterMade = Task.Run(() => ScatterPlot(points, sweep, view));
            var parameterMade = ParameterPlot(points, sweep, view);
            return new(parameterMade, scatterMade.GetAwaiter().GetResult(), points.Line);
        }

        var (parameter, scatter) = RecentFacts.Of(points.All, FilteredPlotsKey(points.Filter, view), () =>
        {
            var made = Task.Run(() => ScatterPlot(points, sweep, view));
            var first = ParameterPlot(points, sweep, view);
            return (Parameter: new Cached<SweepPlot>(first), Scatter: new Cached<SweepPlot>(made.GetAwaiter().GetResult()));
        });
        return new(parameter.Value, scatter.Value, points.Line);
    }

    /// <summary>
    /// True when drawing the view's plots reads the table's rows: points/ has no merge's first-load facts (a
    /// running sweep's parts, or a sweep stopped before its merge) and the plots were not kept from an earlier
    /// request. The sweep page then answers without them (a 10^6-row table's plots take seconds to draw).
    /// A merged table's plots are drawn with the page, filtered or not, as before.
    /// </summary>
    public static bool PlotsReadRows(FilteredPoints points, SweepRecord sweep, SweepView view)
    {
        ArgumentNullException.ThrowIfNull(points);
        ArgumentNullException.ThrowIfNull(sweep);
        ArgumentNullException.ThrowIfNull(view);
        if (points.All.FirstLoad is { Merged: true } || points.All.Count == 0)
        {
            return false;
        }

        return ReferenceEquals(points.Rows, points.All)
            ? !(TableFacts.Has(points.Rows, ParameterPlotKey(sweep, view)) && TableFacts.Has(points.Rows, ScatterPlotKey(sweep, view)))
            : !RecentFacts.Has(points.All, FilteredPlotsKey(points.Filter, view));
    }

    private static string ParameterPlotKey(SweepRecord sweep, SweepView view) => $"parameter plot\n{sweep.SweepId}\n{view.Plot}";

    private static string ScatterPlotKey(SweepRecord sweep, SweepView view) => $"scatter plot\n{sweep.SweepId}\n{view.Scatter}";

    /// <summary>What a filtered view's plots depend on: the filter as applied and the plot choices (not the table's sort or page).</summary>
    private static string FilteredPlotsKey(PointFilter filter, SweepView view) =>
        $"filtered plots\n{SweepView.Encode(filter.Query())}\n{view.Plot}\n{view.Scatter}";

    private static SweepPlot? ParameterPlot(FilteredPoints points, SweepRecord sweep, SweepView view) =>
        TableFacts.Of(points.Rows, ParameterPlotKey(sweep, view), _ =>
        {
            using var timing = StageTimings.Measure("plots: parameter plot");
            return new Cached<SweepPlot>(SweepPlots.Parameter(points.All, points.Rows, sweep, view.Plot));
        }).Value;

    private static SweepPlot? ScatterPlot(FilteredPoints points, SweepRecord sweep, SweepView view) =>
        TableFacts.Of(points.Rows, ScatterPlotKey(sweep, view), _ =>
        {
            using var timing = StageTimings.Measure("plots: scatter plot");
            return new Cached<SweepPlot>(SweepPlots.Scatter(points.All, points.Rows, sweep, view.Scatter));
        }).Value;

    /// <summary>
    /// For a request that draws a filtered view's plots not kept yet: the points' ids are read on
    /// another thread while this one filters and sorts (the plots' points link to their pages by id,
    /// and a filter's drawn rows lie in every row group, so the whole id column is read once per
    /// change of points/ either way).
    /// </summary>
    private static void ReadIdsAhead(ResultTable all, PointFilter applied, SweepView view)
    {
        if (applied.IsEmpty || all.Count == 0 || applied.KeepsEveryRow(all) || RecentFacts.Has(all, FilteredPlotsKey(applied, view)) || all.IndexOf("point_id") is not (var id and >= 0))
        {
            return;
        }

        _ = Task.Run(() =>
        {
            try
            {
                all.Cells(id).HasValue(0);
            }
            catch (Exception)
            {
                // A read ahead only: the plots read the column themselves and report what fails.
            }
        });
    }

    /// <summary>A value that may be null, as a fact.</summary>
    private sealed record Cached<T>(T? Value)
        where T : class;

    public static async Task<SweepPlotSet> PlotsAsync(SweepBoard board, SweepRecord sweep, SweepView view, CancellationToken ct) =>
        Plots(await FilterAsync(board, sweep, view.Filter, view.Problems, ct, view).ConfigureAwait(false), sweep, view);

    /// <summary>The filtered points table, sorted like the summary table, every column.</summary>
    public static async Task<(ResultTable Rows, FilterLine Filter)> ExportRowsAsync(SweepBoard board, SweepRecord sweep, SweepView view, CancellationToken ct)
    {
        var points = await FilterAsync(board, sweep, view.Filter, view.Problems, ct).ConfigureAwait(false);
        var sort = view.Table.Sort is { } s && points.Rows.Has(s) ? s : SummaryTable.DefaultSort;
        return (SummaryTable.Ordered(points.Rows, sort, view.Table.Descending), points.Line);
    }

    /// <summary>The points named (up to <see cref="PointComparison.MaxPoints"/>, each once), side by side.</summary>
    public static async Task<PointComparison> CompareAsync(SweepBoard board, SweepRecord sweep, IEnumerable<string> pointIds, CancellationToken ct)
    {
        var asked = pointIds.Where(p => !string.IsNullOrWhiteSpace(p)).Distinct(StringComparer.Ordinal).ToList();
        var notes = new List<string>();
        if (asked.Count > PointComparison.MaxPoints)
        {
            notes.Add($"{asked.Count} points were picked; the first {PointComparison.MaxPoints} are compared (more curves on one plot cannot be told apart).");
            asked = asked[..PointComparison.MaxPoints];
        }

        var compared = new List<(PointRecord, PointCurves)>();
        foreach (var id in asked)
        {
            if (await board.FindPointAsync(sweep, id, ct).ConfigureAwait(false) is { } point)
            {
                compared.Add((point, await CurvesAsync(board, sweep, point, ct).ConfigureAwait(false)));
            }
            else
            {
                notes.Add($"This sweep has no point '{id}'.");
            }
        }

        return PointComparison.Build(sweep, await board.Results.PointsAsync(sweep, ct).ConfigureAwait(false), compared, notes);
    }

    public static async Task<PointDetail> PointAsync(SweepBoard board, SweepRecord sweep, PointRecord point, CancellationToken ct)
    {
        var row = await board.Results.PointRowsAsync(sweep, TableNames.Points, point.ChunkId, point.PointId, ct).ConfigureAwait(false);
        return new PointDetail(sweep.SweepId, point.PointId, point.State.ToString().ToLowerInvariant(), point.FailureKind?.ToString().ToLowerInvariant(),
            point.Error, point.Attempts, point.ChunkId, point.Worker, point.StartedAt, point.FinishedAt, point.DurationSeconds, point.Parameters,
            PointDetails.Build(sweep, row), Links.ApiCurves(sweep.SweepId, point.PointId));
    }

    public static async Task<PointCurves> CurvesAsync(SweepBoard board, SweepRecord sweep, PointRecord point, CancellationToken ct)
    {
        var dos = await board.Results.PointRowsAsync(sweep, TableNames.Dos, point.ChunkId, point.PointId, ct).ConfigureAwait(false);
        var thermal = await board.Results.PointRowsAsync(sweep, TableNames.Thermal, point.ChunkId, point.PointId, ct).ConfigureAwait(false);
        var dispersion = await board.Results.PointRowsAsync(sweep, TableNames.Dispersion, point.ChunkId, point.PointId, ct).ConfigureAwait(false);
        return PointCurves.Build(dos, thermal, dispersion);
    }
}
