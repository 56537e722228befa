using System.Collections.Immutable;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Progress;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Endpoints;

/// <summary>Builds what the pages and the JSON endpoints show from the catalog and the result files, so both say the same.</summary>
internal static class SweepViews
{
    public static SweepList List(SweepBoard board) =>
        new(board.Time.GetUtcNow(), [.. board.Catalog.ListSweeps().Select(s => SweepLine.Of(board.Progress(s)))]);

    public static SweepDetail Detail(SweepBoard board, SweepRecord sweep)
    {
        var folder = board.Results.SweepFolderOf(sweep);
        var axes = board.Catalog.GetAxisCoverage(sweep.SweepId)
            .Select(a => new AxisLine(a.ColumnName, a.Path, a.Unit, [.. a.Values.Select(v =>
                new AxisValueLine(v.Value, Formatting.Show.Value(v.Value, a.Unit), v.Total, v.Done, v.Failed, v.Pending, v.Cancelled) { Unstable = v.Unstable })]))
            .ToImmutableArray();
        var failures = FailureReport.Of(board.Catalog, sweep.SweepId)
            .Select(g => new FailureLine(g.Group.Kind.ToString().ToLowerInvariant(), g.KindText, g.Group.Reason, g.Group.Count,
                [.. g.Points.Select(p => new FailedPointLine(p.PointId, p.Parameters, p.Attempts, p.Worker, Links.Point(sweep.SweepId, p.PointId)))]))
            .ToImmutableArray();
        var datasets = folder is null
            ? []
            : sweep.Tables
                .Select(t => (Table: t, Folder: board.Root.Contain(SweepFolder.Table(folder, t))))
                .Where(t => t.Folder is not null && Directory.Exists(t.Folder))
                .Select(t => new DatasetLink(t.Table, Links.Files(board.Root.Relative(t.Folder!)), ParquetTableReader.PartFiles(t.Folder!).Count))
                .Prepend(new DatasetLink(SweepFolder.ManifestFileName, Links.Files(board.Root.Relative(folder) + "/" + SweepFolder.ManifestFileName), 0))
                .ToImmutableArray();
        return new SweepDetail(SweepLine.Of(board.Progress(sweep)), sweep.ChunkCount, sweep.EngineVersion, folder is not null, axes, failures, datasets, Links.ApiResults(sweep.SweepId));
    }

    public static async Task<(SummaryTable Table, ResultsPage Page)> ResultsAsync(SweepBoard board, SweepRecord sweep, SummaryQuery query, CancellationToken ct)
    {
        var points = await board.Results.PointsAsync(sweep, ct).ConfigureAwait(false);
        var table = SummaryTable.Build(points, sweep, query);
        var page = new ResultsPage(table.Columns, [.. table.Rows.Select(r => new ResultsRow(r.PointId, Links.Point(sweep.SweepId, r.PointId), r.Values))],
            table.TotalRows, table.Sort, table.Descending, table.Offset, table.Limit);
        return (table, page);
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
