using System.Collections.Immutable;
using System.Text;
using LatticeSweep.Dashboard.Datasets;
using Microsoft.AspNetCore.Http;

namespace LatticeSweep.Dashboard.Endpoints;

/// <summary>
/// Everything the sweep page's address says: the filter, the table's sort, page and columns, and
/// both plots' choices. The page, its links and the JSON endpoints read it the same way, so a
/// copied address shows the same view. Keys: the filter's (<see cref="PointFilter"/>);
/// <c>sort</c>, <c>dir</c>, <c>offset</c>, <c>col</c> (repeated) for the table; <c>x</c>, <c>y</c>,
/// <c>by</c>, <c>xscale</c>, <c>yscale</c> for the plot against a parameter; <c>sx</c>, <c>sy</c>,
/// <c>sxbest</c>, <c>sybest</c> (<c>larger</c> or <c>smaller</c>), <c>sxscale</c>, <c>syscale</c>
/// for the scatter.
/// </summary>
public sealed record SweepView(PointFilter Filter, SummaryQuery Table, ParameterPlotRequest Plot, ScatterPlotRequest Scatter, ImmutableArray<string> Problems)
{
    public static SweepView Default { get; } = new(PointFilter.None, new SummaryQuery(), new ParameterPlotRequest(), new ScatterPlotRequest(), []);

    public static SweepView Parse(IQueryCollection query)
    {
        ArgumentNullException.ThrowIfNull(query);
        var problems = new List<string>();
        var filter = PointFilter.Parse(query, problems);
        var table = new SummaryQuery(Text(query, "sort"), DashboardApi.IsDescending(Text(query, "dir")), Number(query, "offset") ?? 0, Number(query, "limit") ?? SummaryQuery.DefaultLimit)
        {
            Columns = [.. query["col"].OfType<string>().Where(c => c.Length > 0)],
        };
        var plot = new ParameterPlotRequest(Text(query, "x"), Text(query, "y"), Text(query, "by"), Scale(query, "xscale"), Scale(query, "yscale"));
        var scatter = new ScatterPlotRequest(Text(query, "sx"), Text(query, "sy"), Text(query, "sxbest") != "smaller", Text(query, "sybest") != "smaller", Scale(query, "sxscale"), Scale(query, "syscale"));
        return new SweepView(filter, table, plot, scatter, [.. problems]);
    }

    /// <summary>The view's address query (starting with '?', or empty), with only what differs from the defaults.</summary>
    public string Query(SweepView? defaults = null)
    {
        var pairs = new List<KeyValuePair<string, string>>(Filter.Query());
        void Add(string key, string? value, string? usual = null)
        {
            if (!string.IsNullOrEmpty(value) && value != usual)
            {
                pairs.Add(new(key, value));
            }
        }

        Add("sort", Table.Sort, SummaryTable.DefaultSort);
        Add("dir", Table.Descending ? "desc" : null);
        Add("offset", Table.Offset > 0 ? Table.Offset.ToString(System.Globalization.CultureInfo.InvariantCulture) : null);
        foreach (var c in Table.Columns)
        {
            Add("col", c);
        }

        Add("x", Plot.X, defaults?.Plot.X);
        Add("y", Plot.Y, defaults?.Plot.Y);
        Add("by", Plot.By, defaults?.Plot.By);
        Add("xscale", Name(Plot.XScale));
        Add("yscale", Name(Plot.YScale));
        Add("sx", Scatter.X, defaults?.Scatter.X);
        Add("sy", Scatter.Y, defaults?.Scatter.Y);
        Add("sxbest", Scatter.XLarger ? null : "smaller");
        Add("sybest", Scatter.YLarger ? null : "smaller");
        Add("sxscale", Name(Scatter.XScale));
        Add("syscale", Name(Scatter.YScale));
        return Encode(pairs);
    }

    /// <summary>The filter alone as an address query (for the export and the plot endpoints).</summary>
    public string FilterQuery() => Encode(Filter.Query());

    public static string Encode(IEnumerable<KeyValuePair<string, string>> pairs)
    {
        var sb = new StringBuilder();
        foreach (var (key, value) in pairs)
        {
            sb.Append(sb.Length == 0 ? '?' : '&').Append(Uri.EscapeDataString(key)).Append('=').Append(Uri.EscapeDataString(value));
        }

        return sb.ToString();
    }

    private static string? Name(AxisScale scale) => scale == AxisScale.Auto ? null : scale.ToString().ToLowerInvariant();

    private static string? Text(IQueryCollection query, string key) => query[key].LastOrDefault(v => !string.IsNullOrEmpty(v));

    private static int? Number(IQueryCollection query, string key) =>
        int.TryParse(Text(query, key), System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture, out var n) ? n : null;

    private static AxisScale Scale(IQueryCollection query, string key) => Text(query, key) switch
    {
        "log" => AxisScale.Log,
        "linear" => AxisScale.Linear,
        _ => AxisScale.Auto,
    };
}
