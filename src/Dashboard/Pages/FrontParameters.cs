using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>
/// The key parameters' values of the points listed under the scatter ("invented-03, 6 N/m"), for the
/// sweep page (plots drawn inline) and the plots' fragment (plots drawn after the page) alike.
/// </summary>
internal sealed class FrontParameters(FilteredPoints points, ColumnCatalog names, SweepPlot? scatter, int listed)
{
    private Dictionary<string, string>? _frontRows;

    /// <summary>A point's values of the parameters the table shows by default; the front's listed rows are found together.</summary>
    public string Of(string pointId)
    {
        // One pass over point_id, or their rows as the merge wrote them down.
        _frontRows ??= FrontRows();
        if (_frontRows.TryGetValue(pointId, out var known))
        {
            return known;
        }

        var at = points.All.FirstPositions("point_id", [pointId])[0];
        return at < 0 ? "" : ParametersAt([at])[0];
    }

    private Dictionary<string, string> FrontRows()
    {
        using var timing = StageTimings.Measure("sweep page: front rows");
        var shown = (scatter?.Front ?? []).Take(listed).ToList();
        var ids = shown.Select(f => f.PointId).Distinct(StringComparer.Ordinal).ToList();
        // The merge's front, when it is the one drawn, says where its points are; so does a front worked out from the whole
        // table's rows (a point id is in one row of it); else a pass over point_id finds them.
        var merged = points.All.FirstLoad?.Scatter?.Front;
        var rows = scatter?.FrontRows ?? default;
        var at = merged is { } front && points.Rows == points.All && front.Length >= shown.Count
            && front.Take(shown.Count).Select(p => p.PointId).SequenceEqual(shown.Select(f => f.PointId), StringComparer.Ordinal)
            ? ids.Select(id => front.First(p => p.PointId == id).Row).ToArray()
            : points.Rows == points.All && !rows.IsDefault && rows.Length == scatter!.Front.Length
                ? ids.Select(id => rows[shown.FindIndex(f => f.PointId == id)]).ToArray()
                : points.All.FirstPositions("point_id", ids);
        var found = ids.Select((id, i) => (id, at: at[i])).Where(p => p.at >= 0).ToList();
        var text = ParametersAt([.. found.Select(p => p.at)]);
        return found.Select((p, i) => (p.id, text: text[i])).Concat(ids.Select((id, i) => (id, at: at[i])).Where(p => p.at < 0).Select(p => (p.id, text: "")))
            .ToDictionary(p => p.id, p => p.text, StringComparer.Ordinal);
    }

    /// <summary>The key parameters' values at these rows, read from their row groups only (boxing the whole row would read every column of the table).</summary>
    private string[] ParametersAt(int[] rows)
    {
        var parameters = SummaryTable.KeyParameters(points.All, names);
        var cells = points.All.CellsAt([.. parameters.Select(points.All.IndexOf)], rows);
        return [.. rows.Select((_, k) => string.Join(", ", parameters.Select((p, c) => Formatting.Show.Value(cells[c][k], names.UnitOf(p)))))];
    }
}
