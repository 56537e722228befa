using System.Text.Json;
using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using Microsoft.AspNetCore.Mvc;
using Microsoft.AspNetCore.Mvc.RazorPages;
using Microsoft.Extensions.Options;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>The point page: its state, summary numbers with units, and plots of its curves.</summary>
internal sealed class PointModel : PageModel
{
    private readonly SweepBoard _board;
    private readonly JsonSerializerOptions _json;

    public PointModel(SweepBoard board, IOptions<Microsoft.AspNetCore.Http.Json.JsonOptions> json)
    {
        _board = board;
        _json = json.Value.SerializerOptions;
    }

    public SweepRecord Sweep { get; private set; } = null!;

    public PointDetail Detail { get; private set; } = null!;

    public PointCurves Curves { get; private set; } = null!;

    /// <summary>The curves as JSON, embedded in the page for its script (a data block, not code).</summary>
    public string CurvesJson { get; private set; } = "{}";

    public ResultTable SoundSpeeds { get; private set; } = ResultTable.Empty;

    /// <summary>The model has an imaginary frequency (its own state, or a points/ row with <c>stable = false</c>).</summary>
    public bool Unstable { get; private set; }

    /// <summary>The model has more zero modes than rigid-body motions.</summary>
    public bool Floppy { get; private set; }

    public async Task<IActionResult> OnGetAsync(string sweepId, string pointId, CancellationToken ct)
    {
        if (_board.Find(sweepId) is not { } sweep || await _board.FindPointAsync(sweep, pointId, ct).ConfigureAwait(false) is not { } point)
        {
            return NotFound();
        }

        Sweep = sweep;
        Detail = await SweepViews.PointAsync(_board, sweep, point, ct).ConfigureAwait(false);
        Curves = await SweepViews.CurvesAsync(_board, sweep, point, ct).ConfigureAwait(false);
        CurvesJson = JsonSerializer.Serialize(Curves, _json);
        SoundSpeeds = await _board.Results.PointRowsAsync(sweep, TableNames.SoundSpeeds, point.ChunkId, point.PointId, ct).ConfigureAwait(false);
        var row = await _board.Results.PointRowsAsync(sweep, TableNames.Points, point.ChunkId, point.PointId, ct).ConfigureAwait(false);
        var flags = new PointFlags(row);
        Unstable = point.State == PointState.Unstable || row.Rows.Any(flags.IsUnstable);
        Floppy = row.Rows.Any(flags.IsFloppy);
        return Page();
    }

    public string Unit(string column) => Formatting.Show.Unit(Sweep.Axes.FirstOrDefault(a => a.ColumnName == column)?.Unit);

    public string Path(string column) => Sweep.Axes.FirstOrDefault(a => a.ColumnName == column)?.Path ?? column;
}
