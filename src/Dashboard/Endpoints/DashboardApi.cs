using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Datasets;

namespace LatticeSweep.Dashboard.Endpoints;

/// <summary>
/// The JSON endpoints (read only; the pages' scripts and scripts of users use them):
/// <c>/api/sweeps</c>, <c>/api/sweeps/{id}</c>, <c>/api/sweeps/{id}/results</c>,
/// <c>/api/sweeps/{id}/points/{point}</c>, <c>/api/sweeps/{id}/points/{point}/curves</c>.
/// </summary>
internal static class DashboardApi
{
    public static void MapDashboardApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api");
        api.MapGet("/sweeps", (SweepBoard board) => Results.Ok(SweepViews.List(board)));

        api.MapGet("/sweeps/{sweepId}", (string sweepId, SweepBoard board) =>
            board.Find(sweepId) is { } sweep ? Results.Ok(SweepViews.Detail(board, sweep)) : NoSweep(sweepId));

        api.MapGet("/sweeps/{sweepId}/results", async (string sweepId, string? sort, string? dir, int? offset, int? limit, SweepBoard board, CancellationToken ct) =>
        {
            if (board.Find(sweepId) is not { } sweep)
            {
                return NoSweep(sweepId);
            }

            var query = new SummaryQuery(sort, IsDescending(dir), offset ?? 0, limit ?? SummaryQuery.DefaultLimit);
            var (_, page) = await SweepViews.ResultsAsync(board, sweep, query, ct).ConfigureAwait(false);
            return Results.Ok(page);
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

    private static IResult NoSweep(string sweepId) =>
        Results.NotFound(new { error = $"no sweep with id '{sweepId}' in this store" });

    private static IResult NoPoint(string sweepId, string pointId) =>
        Results.NotFound(new { error = $"sweep '{sweepId}' has no point '{pointId}'" });
}
