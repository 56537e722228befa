using System.Globalization;
using System.Net;
using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>The point page and <c>/api/sweeps/{id}/points/{point}</c> and <c>.../curves</c>.</summary>
[Collection(StandardCollection.Name)]
public sealed class PointPageTests
{
    private readonly StandardFixture _f;

    public PointPageTests(StandardFixture f)
    {
        _f = f;
    }

    [Fact]
    public async Task Summary_numbers_are_the_points_row_with_units()
    {
        var (sweepId, point) = DonePoint(_f.FinishedId);
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{sweepId}/points/{point.PointId}");
        using var duck = new DuckDb();
        var folder = Path.Combine(_f.Store.OutputRoot, sweepId);
        var numeric = duck.Rows($"SELECT column_name FROM (DESCRIBE SELECT * FROM {DuckDb.Table(folder, "points")}) WHERE column_type IN ('DOUBLE', 'BIGINT', 'INTEGER')")
            .Select(r => (string)r[0]!).ToList();
        var row = duck.Rows($"SELECT {string.Join(", ", numeric)} FROM {DuckDb.Table(folder, "points")} WHERE point_id = {DuckDb.Text(point.PointId)}").Single();
        var checkedCells = 0;
        for (var i = 0; i < numeric.Count; i++)
        {
            var cell = page.QuerySelector($".summary-group [data-field='{numeric[i]}']");
            if (point.Parameters.ContainsKey(numeric[i]))
            {
                continue;
            }

            if (cell is null)
            {
                // Only a group with no number at all is left out (conductivity or the mesh check, not asked for).
                Assert.True(row[i] is null && (numeric[i].StartsWith("kappa_", StringComparison.Ordinal) || numeric[i] == "acoustic_debye_temperature_k"
                    || numeric[i].Contains("_mesh_change", StringComparison.Ordinal)), $"{numeric[i]} is not shown");
                continue;
            }

            var shown = cell.GetAttribute("data-value")!;
            if (row[i] is null)
            {
                Assert.Equal("", shown);
            }
            else
            {
                Assert.Equal(Convert.ToDouble(row[i], CultureInfo.InvariantCulture), double.Parse(shown, CultureInfo.InvariantCulture));
                checkedCells++;
            }
        }

        Assert.True(checkedCells > 25, $"only {checkedCells} numbers compared");
        Assert.EndsWith(" THz", Html.Text(page.DocumentElement, "max_freq_thz"), StringComparison.Ordinal);
        Assert.EndsWith(" J/(mol K)", Html.Text(page.DocumentElement, "cv_j_per_mol_k"), StringComparison.Ordinal);
        Assert.EndsWith(" K", Html.Text(page.DocumentElement, "debye_temperature_from_cv_k"), StringComparison.Ordinal);
        Assert.EndsWith(" m/s", Html.Text(page.DocumentElement, "sound_speed_mean_m_per_s"), StringComparison.Ordinal);
    }

    [Fact]
    public async Task Parameters_and_state_are_the_catalogs()
    {
        var (sweepId, point) = DonePoint(_f.FinishedId);
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{sweepId}/points/{point.PointId}");
        var parameters = page.QuerySelector("#parameters")!;
        Assert.Equal(2, point.Parameters.Count);
        foreach (var (column, value) in point.Parameters)
        {
            var expected = value is double d ? d.ToString("R", CultureInfo.InvariantCulture) : Convert.ToString(value, CultureInfo.InvariantCulture);
            Assert.Equal(expected, Html.Raw(parameters, column));
        }

        Assert.Contains(" amu", Html.Text(parameters, "sites_b_mass_amu"), StringComparison.Ordinal);
        Assert.Equal("done", Html.Text(page.DocumentElement, "state"));

        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{sweepId}/points/{point.PointId}"));
        Assert.Equal("done", json.RootElement.GetProperty("state").GetString());
        Assert.Equal(point.ChunkId, json.RootElement.GetProperty("chunk_id").GetString());
        Assert.Equal(point.Attempts, json.RootElement.GetProperty("attempts").GetInt32());
    }

    [Fact]
    public async Task Curves_are_the_dos_thermal_and_dispersion_rows_of_the_point()
    {
        var (sweepId, point) = DonePoint(_f.RunningId);
        using var http = _f.Server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{sweepId}/points/{point.PointId}/curves"));
        using var duck = new DuckDb();
        var folder = Path.Combine(_f.Store.OutputRoot, sweepId);
        var id = DuckDb.Text(point.PointId);

        var dos = json.RootElement.GetProperty("dos");
        Assert.Equal("THz", dos.GetProperty("frequency_unit").GetString());
        var curves = dos.GetProperty("curves").EnumerateArray().ToList();
        Assert.Equal(["total", "site 0", "site 1"], curves.Select(c => c.GetProperty("name").GetString()));
        var total = duck.Rows($"SELECT freq_thz, dos_per_thz_per_cell FROM {DuckDb.Table(folder, "dos")} WHERE point_id = {id} AND curve = 'total' ORDER BY freq_thz");
        Assert.Equal(total.Select(r => (double)r[0]!), curves[0].GetProperty("x").EnumerateArray().Select(x => x.GetDouble()));
        Assert.Equal(total.Select(r => (double)r[1]!), curves[0].GetProperty("y").EnumerateArray().Select(x => x.GetDouble()));
        var site1 = duck.Rows($"SELECT dos_per_thz_per_cell FROM {DuckDb.Table(folder, "dos")} WHERE point_id = {id} AND curve = 'site' AND site = 1 ORDER BY freq_thz");
        Assert.Equal(site1.Select(r => (double)r[0]!), curves[2].GetProperty("y").EnumerateArray().Select(x => x.GetDouble()));

        var thermal = json.RootElement.GetProperty("thermal");
        var rows = duck.Rows($"SELECT temperature_k, cv_j_per_mol_k, debye_temperature_k FROM {DuckDb.Table(folder, "thermal")} WHERE point_id = {id} ORDER BY temperature_k");
        Assert.Equal(rows.Select(r => (double)r[0]!), thermal.GetProperty("temperature_k").EnumerateArray().Select(x => x.GetDouble()));
        Assert.Equal(rows.Select(r => (double)r[1]!), thermal.GetProperty("heat_capacity_j_per_mol_k").EnumerateArray().Select(x => x.GetDouble()));
        Assert.Equal(rows.Select(r => (double?)r[2]), thermal.GetProperty("debye_temperature_k").EnumerateArray().Select(x => x.ValueKind == JsonValueKind.Null ? (double?)null : x.GetDouble()));
        Assert.Equal(JsonValueKind.Null, thermal.GetProperty("kappa_w_per_m_k").ValueKind);

        var dispersion = json.RootElement.GetProperty("dispersion");
        var branches = (long)duck.Scalar($"SELECT COUNT(DISTINCT branch) FROM {DuckDb.Table(folder, "dispersion")} WHERE point_id = {id}")!;
        Assert.Equal(branches, dispersion.GetProperty("frequencies").GetArrayLength());
        Assert.Equal(branches, dispersion.GetProperty("group_speeds").GetArrayLength());
        Assert.Equal("1/nm", dispersion.GetProperty("position_unit").GetString());
        Assert.Equal(["G", "X"], dispersion.GetProperty("corners").EnumerateArray().Select(c => c.GetProperty("label").GetString()));
        var top = duck.Rows($"""
            SELECT path_position_per_nm, freq_thz, sqrt(group_velocity_x_m_per_s^2 + group_velocity_y_m_per_s^2 + group_velocity_z_m_per_s^2)
            FROM {DuckDb.Table(folder, "dispersion")} WHERE point_id = {id} AND branch = {branches - 1} ORDER BY path_position_per_nm
            """);
        var lastBranch = dispersion.GetProperty("frequencies")[(int)branches - 1];
        Assert.Equal(top.Select(r => (double)r[0]!), lastBranch.GetProperty("x").EnumerateArray().Select(x => x.GetDouble()));
        Assert.Equal(top.Select(r => (double)r[1]!), lastBranch.GetProperty("y").EnumerateArray().Select(x => x.GetDouble()));
        var speeds = dispersion.GetProperty("group_speeds")[(int)branches - 1].GetProperty("y").EnumerateArray().Select(x => x.GetDouble()).ToList();
        for (var i = 0; i < top.Count; i++)
        {
            Assert.Equal((double)top[i][2]!, speeds[i], 1e-9 * Math.Max(1, speeds[i]));
        }
    }

    [Fact]
    public async Task The_page_has_a_plot_for_each_curve_and_embeds_the_curves()
    {
        var (sweepId, point) = DonePoint(_f.RunningId);
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{sweepId}/points/{point.PointId}");
        // The partial densities of states (two sites) have a panel of their own, not hidden under the total.
        Assert.Equal(["dos", "dos-sites", "cv", "debye", "dispersion", "group-speed"], page.QuerySelectorAll("canvas[data-chart]").Select(c => c.GetAttribute("data-chart")));
        Assert.Null(page.QuerySelector("canvas[data-chart='kappa']"));
        using var embedded = JsonDocument.Parse(page.QuerySelector("script#point-curves")!.TextContent);
        using var api = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{sweepId}/points/{point.PointId}/curves"));
        Assert.Equal(api.RootElement.GetRawText(), embedded.RootElement.GetRawText());
        Assert.NotNull(page.QuerySelector("script[src='/lib/chartjs/chart.umd.min.js']"));

        // Without a dispersion path there is no dispersion plot.
        var (finishedId, finishedPoint) = DonePoint(_f.FinishedId);
        var plain = await Html.GetAsync(http, $"/sweeps/{finishedId}/points/{finishedPoint.PointId}");
        Assert.Equal(["dos", "dos-sites", "cv", "debye"], plain.QuerySelectorAll("canvas[data-chart]").Select(c => c.GetAttribute("data-chart")));
    }

    [Fact]
    public async Task A_failed_point_shows_its_reason_and_no_plots()
    {
        using var catalog = _f.Store.OpenCatalog();
        var failed = catalog.GetPoints(_f.FailuresId, new PointQuery(PointState.Failed)).First();
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{_f.FailuresId}/points/{failed.PointId}");
        Assert.Equal("failed", Html.Text(page.DocumentElement, "state"));
        Assert.Contains(failed.Error!, page.QuerySelector(".problem")!.TextContent, StringComparison.Ordinal);
        Assert.Empty(page.QuerySelectorAll("canvas"));
    }

    [Fact]
    public async Task A_waiting_point_has_its_parameters_and_no_results_yet()
    {
        using var catalog = _f.Store.OpenCatalog();
        var waiting = catalog.GetPoints(_f.RunningId, new PointQuery(PointState.Waiting)).First();
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{_f.RunningId}/points/{waiting.PointId}");
        Assert.Equal("waiting", Html.Text(page.DocumentElement, "state"));
        Assert.Equal(((double)waiting.Parameters["sites_b_mass_amu"]).ToString("R", CultureInfo.InvariantCulture), Html.Raw(page.QuerySelector("#parameters")!, "sites_b_mass_amu"));
        Assert.Empty(page.QuerySelectorAll("canvas"));
        Assert.Empty(page.QuerySelectorAll(".summary-group"));
    }

    [Fact]
    public async Task An_unknown_point_gets_404()
    {
        using var http = _f.Server.Client();
        await Html.GetAsync(http, $"/sweeps/{_f.FinishedId}/points/0000000000000000", HttpStatusCode.NotFound);
        using var api = await http.GetAsync($"/api/sweeps/{_f.FinishedId}/points/0000000000000000/curves");
        Assert.Equal(HttpStatusCode.NotFound, api.StatusCode);
    }

    private (string SweepId, PointRecord Point) DonePoint(string sweepId)
    {
        using var catalog = _f.Store.OpenCatalog();
        return (sweepId, catalog.GetPoints(sweepId, new PointQuery(PointState.Done)).First());
    }
}
