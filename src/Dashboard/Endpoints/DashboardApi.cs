using System.Text;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Progress;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Endpoints;

/// <summary>
/// The JSON endpoints (read only; the pages' scripts and scripts of users use them):
/// <c>/api/sweeps</c>, <c>/api/workers</c>, <c>/api/sweeps/{id}</c>, <c>/api/sweeps/{id}/results</c>,
/// <c>/api/sweeps/{id}/plots</c>, <c>/api/sweeps/{id}/compare?p=...</c>, <c>/api/sweeps/{id}/failures/{group}?offset=N</c>,
/// <c>/api/sweeps/{id}/coverage/{column}?offset=N&amp;limit=M</c>,
/// <c>/api/sweeps/{id}/export.csv</c> and <c>.parquet</c> (files),
/// <c>/api/sweeps/{id}/points/{point}</c>, <c>/api/sweeps/{id}/points/{point}/curves</c>.
/// Every endpoint of a sweep's points takes the sweep page's address keys (<see cref="SweepView"/>),
/// so a page's address and its data agree.
/// </summary>
internal static class DashboardApi
{
    public static void MapDashboardApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api");
        api.MapGet("/sweeps", (SweepBoard board) => Results.Ok(SweepViews.List(board)));

        api.MapGet("/workers", (SweepBoard board) => Results.Ok(SweepViews.Workers(board)));

        api.MapGet("/sweeps/{sweepId}", async (string sweepId, SweepBoard board, CancellationToken ct) =>
            board.Find(sweepId) is { } sweep ? Results.Ok(await SweepViews.DetailAsync(board, sweep, ct).ConfigureAwait(false)) : NoSweep(sweepId));

        api.MapGet("/sweeps/{sweepId}/coverage/{column}", (string sweepId, string column, long? offset, int? limit, SweepBoard board) =>
        {
            if (board.Find(sweepId) is not { } sweep)
            {
                return NoSweep(sweepId);
            }

            if (offset is < 0 || limit is < 1 or > AxisLine.ValuesPerPage)
            {
                return Results.BadRequest(new { error = FormattableString.Invariant($"offset must be 0 or more and limit 1 to {AxisLine.ValuesPerPage} (values of one swept parameter per request); got offset {offset ?? 0}, limit {limit ?? AxisLine.ValuesPerPage}") });
            }

            return SweepViews.Coverage(board, sweep, column, offset ?? 0, limit ?? AxisLine.ValuesPerPage) is { } axis
                ? Results.Ok(axis)
                : Results.NotFound(new { error = $"sweep '{sweepId}' sweeps no parameter with column '{column}' (its swept columns: {string.Join(", ", sweep.Axes.Select(a => a.ColumnName))})" });
        });

        api.MapGet("/sweeps/{sweepId}/failures/{groupKey}", (string sweepId, string groupKey, long? offset, int? limit, SweepBoard board) =>
            board.Find(sweepId) is not { } sweep ? NoSweep(sweepId)
            : SweepViews.FailurePage(board, sweep, groupKey, offset ?? 0, limit ?? FailureReport.PointsPerGroup) is { } page ? Results.Ok(page)
            : Results.NotFound(new { error = $"sweep '{sweepId}' has no failure group '{groupKey}' (the groups and their keys are in {Links.ApiSweep(sweepId)})" }));

        api.MapGet("/sweeps/{sweepId}/results", async (string sweepId, HttpRequest request, SweepBoard board, CancellationToken ct) =>
        {
            if (board.Find(sweepId) is not { } sweep)
            {
                return NoSweep(sweepId);
            }

            var (_, page, _) = await SweepViews.ResultsAsync(board, sweep, SweepView.Parse(request.Query), ct).ConfigureAwait(false);
            return Results.Ok(page);
        });

        api.MapGet("/sweeps/{sweepId}/plots", async (string sweepId, HttpRequest request, SweepBoard board, CancellationToken ct) =>
            board.Find(sweepId) is { } sweep
                ? Results.Ok(await SweepViews.PlotsAsync(board, sweep, SweepView.Parse(request.Query), ct).ConfigureAwait(false))
                : NoSweep(sweepId));

        api.MapGet("/sweeps/{sweepId}/compare", async (string sweepId, HttpRequest request, SweepBoard board, CancellationToken ct) =>
            board.Find(sweepId) is { } sweep
                ? Results.Ok(await SweepViews.CompareAsync(board, sweep, request.Query[PointComparison.PointKey].OfType<string>(), ct).ConfigureAwait(false))
                : NoSweep(sweepId));

        api.MapGet("/sweeps/{sweepId}/export.csv", async (string sweepId, string? header, HttpRequest request, SweepBoard board, CancellationToken ct) =>
        {
            if (board.Find(sweepId) is not { } sweep)
            {
                return NoSweep(sweepId);
            }

            var (rows, filter) = await SweepViews.ExportRowsAsync(board, sweep, SweepView.Parse(request.Query), ct).ConfigureAwait(false);
            var csv = PointsExport.Csv(rows, new ColumnCatalog(sweep, TableNames.Points), unitsInHeader: header != "names");
            return Results.File(Encoding.UTF8.GetBytes(csv), "text/csv; charset=utf-8", FileName(sweep.SweepId, filter, "csv"));
        });

        api.MapGet("/sweeps/{sweepId}/export.parquet", async (string sweepId, HttpRequest request, SweepBoard board, CancellationToken ct) =>
        {
            if (board.Find(sweepId) is not { } sweep)
            {
                return NoSweep(sweepId);
            }

            var (rows, filter) = await SweepViews.ExportRowsAsync(board, sweep, SweepView.Parse(request.Query), ct).ConfigureAwait(false);
            var metadata = new Dictionary<string, string>
            {
                [PointsExport.SweepKey] = sweep.SweepId,
                [PointsExport.FilterKey] = filter.Query,
            };
            var bytes = await PointsExport.ParquetAsync(rows, new ColumnCatalog(sweep, TableNames.Points), metadata, ct).ConfigureAwait(false);
            return Results.File(bytes, "application/vnd.apache.parquet", FileName(sweep.SweepId, filter, "parquet"));
        });

        api.MapGet("/sweeps/{sweepId}/points/{pointId}", async (string sweepId, string pointId, SweepBoard board, CancellationToken ct) =>
        {
            if (board.Find(sweepId) is not { } sweep)
            {
                return NoSweep(sweepId);
            }

            return await board.FindPointAsync(sweep, pointId, ct).ConfigureAwait(false) is { } point
                ? Results.Ok(await SweepViews.PointAsync(board, sweep, point, ct).ConfigureAwait(false))
                : NoPoint(sweepId, pointId);
        });

        api.MapGet("/sweeps/{sweepId}/points/{pointId}/curves", async (string sweepId, string pointId, SweepBoard board, CancellationToken ct) =>
        {
            if (board.Find(sweepId) is not { } sweep)
            {
                return NoSweep(sweepId);
            }

            return await board.FindPointAsync(sweep, pointId, ct).ConfigureAwait(false) is { } point
                ? Results.Ok(await SweepViews.CurvesAsync(board, sweep, point, ct).ConfigureAwait(false))
                : NoPoint(sweepId, pointId);
        });
    }

    public static bool IsDescending(string? dir) => string.Equals(dir, "desc", StringComparison.OrdinalIgnoreCase);

    /// <summary><c>SWEEP-points.csv</c>, or <c>SWEEP-points-filtered.csv</c> when a filter chose the rows.</summary>
    private static string FileName(string sweepId, FilterLine filter, string extension) =>
        $"{sweepId}-points{(filter.Query.Length > 0 ? "-filtered" : "")}.{extension}";

    private static IResult NoSweep(string sweepId) =>
        Results.NotFound(new { error = $"no sweep with id '{sweepId}' in this store" });

    private static IResult NoPoint(string sweepId, string pointId) =>
        Results.NotFound(new { error = $"sweep '{sweepId}' has no point '{pointId}'" });
}
