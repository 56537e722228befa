using System.Collections.Immutable;
using LatticeSweep.Dashboard.Formatting;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// Builds the sweep page's plots from the points/ table. Choices and defaults are judged on the
/// whole table (<c>all</c>), the points drawn are the filtered ones, so a filter never changes
/// what can be chosen, only what is drawn.
/// </summary>
internal static class SweepPlots
{
    // The default choices' rules, lists and limits live in PlotDefaults and FirstLoadFacts (the merge uses them too).

    /// <summary>At most this many values for a default grouping parameter named in a legend (a longer legend says little).</summary>
    private const int MaxDefaultGroups = FirstLoadFacts.MaxDefaultGroups;

    /// <summary>At most this many lines for a default numeric grouping parameter drawn as a colour gradient.</summary>
    public const int MaxGradientGroups = FirstLoadFacts.MaxGradientGroups;

    /// <summary>Numeric columns with at least one value: what can go on a number axis.</summary>
    public static IReadOnlyList<string> NumberColumns(ResultTable all)
    {
        var filled = SummaryTable.FilledColumns(all);
        return [.. all.Columns.Where(c => c.IsNumeric && filled.Contains(c.Name) && c.Name != SummaryTable.DefaultSort).Select(c => c.Name)];
    }

    /// <summary>The swept parameters present in the table (what can go on the x axis or split the series).</summary>
    public static IReadOnlyList<string> ParameterColumns(ResultTable all, ColumnCatalog names) => [.. names.Parameters.Where(all.Has)];

    /// <summary>The request with every empty choice replaced by its default (a choice the table cannot serve, too), by the rules the merge uses too (<see cref="PlotDefaults"/>).</summary>
    public static ParameterPlotRequest Resolve(ResultTable all, ColumnCatalog names, ParameterPlotRequest request)
    {
        var (x, y, by) = PlotDefaults.Parameter(new Facts(all, names), request.X, request.Y, request.By, noGrouping: request.By == SweepPlot.NoGrouping);
        return request with { X = x, Y = y, By = by ?? SweepPlot.NoGrouping };
    }

    public static ScatterPlotRequest Resolve(ResultTable all, ColumnCatalog names, ScatterPlotRequest request)
    {
        var (x, y) = PlotDefaults.Scatter(new Facts(all, names), request.X, request.Y);
        return request with { X = x, Y = y };
    }

    /// <summary>The whole table's facts as the shared rules read them (from the footers where they say, else from every row; each kept with the table).</summary>
    private sealed class Facts(ResultTable all, ColumnCatalog names) : IPlotDefaultFacts
    {
        private IReadOnlyList<string>? _key;

        public IReadOnlyList<string> Parameters { get; } = ParameterColumns(all, names);

        public IReadOnlyList<string> KeyParameters => _key ??= SummaryTable.KeyParameters(all, names);

        public IReadOnlyList<string> Numbers { get; } = NumberColumns(all);

        public bool IsNumeric(string column) => all.Column(column)!.IsNumeric;

        public bool IsParameter(string column) => names.IsParameter(column);

        public bool Varies(string column) => all.Summary?.Of(column) is { } s
            ? s.Finite > 1 && s.Min < s.Max
            : all.Numbers(column).OfType<double>().Where(double.IsFinite).Distinct().Skip(1).Any();

        public int Distinct(string column) => SweepPlots.Distinct(all, column);
    }

    /// <summary>A summary column against a swept parameter, one series per value of another parameter; null when the table cannot give one.</summary>
    public static SweepPlot? Parameter(ResultTable all, ResultTable filtered, SweepRecord sweep, ParameterPlotRequest asked)
    {
        var names = new ColumnCatalog(sweep, TableNames.Points);
        var r = Resolve(all, names, asked);
        if (r.X is null || r.Y is null)
        {
            return null;
        }

        var notes = new List<string>();
        var grouped = r.By is { } b && b != SweepPlot.NoGrouping ? filtered.IndexOf(b) : -1;
        var categorical = !all.Column(r.X)!.IsNumeric;
        var categories = categorical ? Categories(all, all.IndexOf(r.X)) : [];
        var (series, plotted, stride) = ReferenceEquals(all, filtered) && all.FirstLoad?.ParameterPlot is { } stored && !categorical
            && stored.X == r.X && stored.Y == r.Y && (stored.By ?? SweepPlot.NoGrouping) == r.By
            ? FromMerge(stored, filtered, names, r, grouped)
            : ParameterSeries(filtered, names, r, grouped, categorical, categories);
        if (series.Count > MaxDefaultGroups && grouped >= 0)
        {
            notes.Add($"{series.Count} lines, one per value of {names.ShortLabel(r.By!)}: coloured from blue (the lowest, {series[0].Name}) to orange (the highest, {series[^1].Name}); the tooltip names each.");
        }

        if (series.Any(s => !s.Lines) && !categorical)
        {
            notes.Add("Several points share an x value within a series, so they are drawn as points without lines: split the series by another parameter or narrow the filter.");
        }

        Thinned(series, plotted, stride, notes);
        var xAxis = Axis(names, r.X, all, r.XScale, notes, categorical, categories);
        var yAxis = Axis(names, r.Y, all, r.YScale, notes, false, []);
        return new SweepPlot(SweepPlot.ParameterKind, PointUrl(sweep), xAxis, yAxis, grouped < 0 ? null : r.By, grouped < 0 ? null : names.Label(r.By!),
            [.. series], [], null, plotted, filtered.Count - plotted, [.. notes]);
    }

    /// <summary>The series from every row: grouped and ordered as positions, and only the rows drawn (an even sample of each series) become points with their ids.</summary>
    private static (List<PlotSeries> Series, int Plotted, int Stride) ParameterSeries(ResultTable filtered, ColumnCatalog names, ParameterPlotRequest r, int grouped,
        bool categorical, ImmutableArray<string> categories)
    {
        var maker = new PointMaker(filtered, r.X!, r.Y!);
        var xs = filtered.Cells(r.X!);
        var ys = filtered.Cells(r.Y!);
        var groups = grouped < 0 ? (ColumnView?)null : filtered.Cells(grouped);
        var categoryAt = categories.Select((c, i) => (c, i)).ToDictionary(p => p.c, p => p.i, StringComparer.Ordinal);
        var usable = new List<int>();
        // Numbers read once per column from their arrays (a filter's 10^5-10^6 rows), NaN where empty.
        var yv = ys.NumbersOrNaN();
        var xv = categorical ? null : xs.NumbersOrNaN();
        for (var row = 0; row < filtered.Count; row++)
        {
            if (double.IsFinite(yv[row]) && (categorical ? xs.HasValue(row) : double.IsFinite(xv![row])))
            {
                usable.Add(row);
            }
        }

        var groupAt = new Dictionary<CellKey, int>();
        var groupRows = new List<List<int>>();
        // Without a grouping every usable row is in the one series: no key looked up per row (10^6 lookups on a large sweep).
        if (groups is null && usable.Count > 0)
        {
            groupRows.Add(usable);
            usable = [];
        }

        foreach (var row in usable)
        {
            var key = groups?.Key(row) ?? CellKey.Empty;
            if (!groupAt.TryGetValue(key, out var g))
            {
                groupAt[key] = g = groupRows.Count;
                groupRows.Add([]);
            }

            groupRows[g].Add(row);
        }

        var keyed = groupRows.Select(rows => (Raw: groups is { } c ? Show.Raw(c.Cell(rows[0])) : "", Rows: rows));
        var ordered = new List<(string Name, bool Lines, int[] Rows, double[] X)>();
        foreach (var (_, group) in keyed.OrderBy(g => g.Raw, ValueOrder.Of(filtered, grouped)))
        {
            var (rows, x) = SortedByX(group, row => categorical ? categoryAt.GetValueOrDefault(Show.Raw(xs.Cell(row)), -1) : xv![row]);
            var lines = !categorical && AllDistinct(x);
            var name = grouped < 0 ? names.Label(r.Y!) : Show.Value(groups!.Value.Cell(group[0]), names.UnitOf(filtered.Columns[grouped].Name));
            ordered.Add((name, lines, rows, x));
        }

        var plotted = ordered.Sum(s => s.Rows.Length);
        var stride = Stride(plotted);
        var drawn = ordered.Select(s => Sample(s.Rows.Length, stride).ToArray()).ToList();
        maker.ReadIds(ordered.SelectMany((s, k) => drawn[k].Select(i => s.Rows[i])));
        var series = ordered
            .Select((s, k) => new PlotSeries(s.Name, s.Lines, [.. drawn[k].Select(i => maker.Make(s.Rows[i], categorical ? (int)s.X[i] : null))]))
            .ToList();
        return (series, plotted, stride);
    }

    /// <summary>The same series from the merge's work (<see cref="FirstLoad"/>): its drawn points as they are, the series named as above.</summary>
    private static (List<PlotSeries> Series, int Plotted, int Stride) FromMerge(FirstLoad.ParameterSample stored, ResultTable filtered, ColumnCatalog names,
        ParameterPlotRequest r, int grouped)
    {
        var column = grouped < 0 ? null : filtered.Columns[grouped];
        var series = stored.Series
            .Select(s => new PlotSeries(
                column is null ? names.Label(r.Y!) : Show.Value(Box(s.Group, column.ClrType), names.UnitOf(column.Name)),
                s.Lines,
                [.. s.Points.Select(Point)]))
            .ToList();
        return (series, stored.Plotted, Stride(stored.Plotted));
    }

    /// <summary>A number boxed as a cell of its column is (<see cref="NumberCells"/>).</summary>
    private static object? Box(double? value, Type type) => value switch
    {
        null => null,
        { } v when type == typeof(int) => (int)v,
        { } v when type == typeof(long) => (long)v,
        { } v => v,
    };

    private static PlotPoint Point(FirstLoad.Point p) => new(p.X, p.Y, p.PointId, p.Unstable, p.Floppy);

    /// <summary>Two summary columns against each other, with the Pareto front for the chosen directions (unstable models are never on it).</summary>
    public static SweepPlot? Scatter(ResultTable all, ResultTable filtered, SweepRecord sweep, ScatterPlotRequest asked)
    {
        var names = new ColumnCatalog(sweep, TableNames.Points);
        var r = Resolve(all, names, asked);
        if (r.X is null || r.Y is null)
        {
            return null;
        }

        var notes = new List<string>();
        ImmutableArray<PlotPoint> front;
        ImmutableArray<int> frontRows = default;
        List<PlotSeries> series;
        int plotted;
        int stride;
        if (ReferenceEquals(all, filtered) && all.FirstLoad?.Scatter is { } stored && stored.X == r.X && stored.Y == r.Y && r.XLarger && r.YLarger)
        {
            // The merge found the front and drew the sample over the same rows (larger is better on both axes, the default).
            front = [.. stored.Front.Select(Point)];
            plotted = stored.Plotted;
            stride = Stride(plotted);
            series = [new("stable models", false, [.. stored.Stable.Select(Point)])];
            if (stored.Unstable.Length > 0)
            {
                series.Add(new PlotSeries("unstable models", false, [.. stored.Unstable.Select(Point)]));
                notes.Add("Unstable models are drawn apart and are never on the front.");
            }
        }
        else
        {
            (front, frontRows, series, plotted, stride) = ScatterSeries(filtered, r, notes);
        }

        Thinned(series, plotted, stride, notes);
        var rule = $"{(r.XLarger ? "larger" : "smaller")} {names.ShortLabel(r.X)} and {(r.YLarger ? "larger" : "smaller")} {names.ShortLabel(r.Y)} are better";
        return new SweepPlot(SweepPlot.ScatterKind, PointUrl(sweep), Axis(names, r.X, all, r.XScale, notes, false, []), Axis(names, r.Y, all, r.YScale, notes, false, []),
            null, null, [.. series], front, rule, plotted, filtered.Count - plotted, [.. notes]) { FrontRows = frontRows };
    }

    /// <summary>The scatter's front and series from every row: positions first, and only the rows drawn and the front's become points.</summary>
    private static (ImmutableArray<PlotPoint> Front, ImmutableArray<int> FrontRows, List<PlotSeries> Series, int Plotted, int Stride) ScatterSeries(ResultTable filtered, ScatterPlotRequest r, List<string> notes)
    {
        var maker = new PointMaker(filtered, r.X!, r.Y!);
        var xs = filtered.Cells(r.X!);
        var ys = filtered.Cells(r.Y!);
        // Positions first: the front is found over every stable row on the two columns, and only
        // the rows drawn (an even sample of each series) and the front's become points.
        var flags = new ColumnFlags(filtered);
        var stable = new List<int>();
        var unstable = new List<int>();
        // Numbers read once per column from their arrays, NaN where empty.
        var xv = xs.NumbersOrNaN();
        var yv = ys.NumbersOrNaN();
        for (var row = 0; row < filtered.Count; row++)
        {
            if (double.IsFinite(xv[row]) && double.IsFinite(yv[row]))
            {
                (flags.IsUnstable(row) ? unstable : stable).Add(row);
            }
        }

        var plotted = stable.Count + unstable.Count;
        // Over the stable rows in place, sorting only those inside the box of the two one-number bests (the merge's rule):
        // the same front and order as Of over copies of both columns, which sorted a 24-byte entry per stable row.
        var frontRows = ParetoFront.OfRows(xv, yv, stable, r.XLarger, r.YLarger);
        var stride = Stride(plotted);
        var stableDrawn = Sample(stable.Count, stride).Select(i => stable[i]).ToList();
        var unstableDrawn = Sample(unstable.Count, stride).Select(i => unstable[i]).ToList();
        maker.ReadIds(frontRows.Concat(stableDrawn).Concat(unstableDrawn));
        var front = frontRows.Select(row => maker.Make(row, null)).ToImmutableArray();
        var series = new List<PlotSeries> { new("stable models", false, [.. stableDrawn.Select(row => maker.Make(row, null))]) };
        if (unstable.Count > 0)
        {
            series.Add(new PlotSeries("unstable models", false, [.. unstableDrawn.Select(row => maker.Make(row, null))]));
            notes.Add("Unstable models are drawn apart and are never on the front.");
        }

        return (front, [.. frontRows], series, plotted, stride);
    }

    /// <summary>One in this many points of each series is drawn: 1 up to <see cref="SweepPlot.MaxDrawn"/> points in all.</summary>
    private static int Stride(int plotted) => FirstLoadFacts.Stride(plotted);

    /// <summary>The positions drawn of a series of <paramref name="count"/> points: one in <paramref name="stride"/> in its order, with its last.</summary>
    internal static IEnumerable<int> Sample(int count, int stride) => FirstLoadFacts.Sample(count, stride);

    /// <summary>Says in a note when the series were sampled (each evenly, when the plot has more than <see cref="SweepPlot.MaxDrawn"/> points).</summary>
    private static void Thinned(List<PlotSeries> series, int plotted, int stride, List<string> notes)
    {
        if (plotted > SweepPlot.MaxDrawn)
        {
            notes.Add($"{Show.Count(series.Sum(s => s.Points.Length))} of the {Show.Count(plotted)} points are drawn (one in {Show.Count(stride)} of each series in its order, with its first and last); the front, the table and the downloads have them all.");
        }
    }

    /// <summary>
    /// The rows ordered by x, rows of equal x in their own order (<see cref="NumberKeySort"/>), with
    /// their x values. The x values are finite.
    /// </summary>
    internal static (int[] Rows, double[] X) SortedByX(List<int> rows, Func<int, double> x)
    {
        var keys = new long[rows.Count];
        var values = new double[rows.Count];
        var order = new int[rows.Count];
        for (var i = 0; i < keys.Length; i++)
        {
            var v = x(rows[i]);
            values[i] = v;
            keys[i] = NumberKeySort.Key(v);
            order[i] = i;
        }

        NumberKeySort.SortStable(keys, order);
        var sortedRows = new int[order.Length];
        var sortedX = new double[order.Length];
        for (var i = 0; i < order.Length; i++)
        {
            sortedRows[i] = rows[order[i]];
            sortedX[i] = values[order[i]];
        }

        return (sortedRows, sortedX);
    }

    /// <summary>True when no two of the sorted values are equal.</summary>
    private static bool AllDistinct(double[] sorted)
    {
        for (var i = 1; i < sorted.Length; i++)
        {
            if (sorted[i] == sorted[i - 1])
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>A point's page is this followed by its escaped id.</summary>
    private static string PointUrl(SweepRecord sweep) => Endpoints.Links.Sweep(sweep.SweepId) + "/points/";

    /// <summary>True when every value of the column is positive and the largest is at least <see cref="SweepPlot.DecadesRatio"/> times the smallest.</summary>
    public static bool SpansDecades(IEnumerable<double?> values)
    {
        var v = values.OfType<double>().Where(double.IsFinite).ToList();
        return v.Count > 1 && v.All(x => x > 0) && v.Max() / v.Min() >= SweepPlot.DecadesRatio;
    }

    private static PlotAxis Axis(ColumnCatalog names, string column, ResultTable all, AxisScale scale, List<string> notes, bool categorical, ImmutableArray<string> categories)
    {
        var log = false;
        if (!categorical)
        {
            // Worked out once per table and column (a scan of the whole column).
            var (positive, spans) = TableFacts.Of(all, "axis\n" + column, t =>
            {
                if (t.Summary?.Of(column) is { } s)
                {
                    // The same answers from the merged files' footers: every finite value positive, and max / min.
                    return (s.Finite == 0 || s.Min > 0, s.Finite > 1 && s.Min > 0 && s.Max / s.Min >= SweepPlot.DecadesRatio);
                }

                var values = t.Numbers(column).ToList();
                return (values.OfType<double>().Where(double.IsFinite).All(v => v > 0), SpansDecades(values));
            });
            log = scale switch
            {
                AxisScale.Log when !positive => false,
                AxisScale.Log => true,
                AxisScale.Linear => false,
                _ => spans,
            };
            if (scale == AxisScale.Log && !positive)
            {
                notes.Add($"{names.ShortLabel(column)} has values of zero or below, so its axis stays linear.");
            }
        }

        return new PlotAxis(column, names.ShortLabel(column), names.UnitOf(column), log, categorical, categories);
    }

    /// <summary>The first usual column that varies over the sweep, else the first other column that does; null when none varies.</summary>
    private static int Distinct(ResultTable t, string column)
    {
        var i = t.IndexOf(column);
        return i < 0 ? 0 : TableFacts.Of(t, "distinct\n" + column, t =>
        {
            if (t.Summary?.DistinctCells(column) is { } known)
            {
                return known;
            }

            if (t.Summary?.Of(column) is { More: true } c && c.Distinct.Length == ColumnSummary.DistinctKept)
            {
                // More values than the footer lists: every use here asks "more than one", "at most 12" or "at most 60".
                return ColumnSummary.DistinctKept + 1;
            }

            // The rule the merge counts by too (PlotDefaults).
            return PlotDefaults.DistinctCount(RuleCells.Of(t, i), t.Count, int.MaxValue);
        });
    }

    /// <summary>A text column's values in plan order (first appearance), as categories.</summary>
    private static ImmutableArray<string> Categories(ResultTable all, int column) =>
        TableFacts.Of(all, "categories\n" + column, all =>
        {
            var cells = all.Cells(column);
            return (ImmutableArray<string>)[.. SummaryTable.Order(all, null, false).Select(r => Show.Raw(cells.Cell(r))).Where(v => v.Length > 0).Distinct(StringComparer.Ordinal)];
        });

    /// <summary>Turns a row with drawable x and y into a <see cref="PlotPoint"/> (its page, its marks).</summary>
    private sealed class PointMaker(ResultTable t, string x, string y)
    {
        private readonly ColumnFlags _flags = new(t);
        private readonly ColumnView _x = t.Cells(x);
        private readonly ColumnView _y = t.Cells(y);
        private readonly Dictionary<int, string?> _ids = [];

        /// <summary>
        /// Reads the ids of the rows to be made, together: only those rows' ids become strings (<see cref="ResultTable.TextsAt"/>),
        /// not the whole point_id column of a running sweep's parts, which the plots' fragment read and kept for ~8,000 drawn points.
        /// </summary>
        public void ReadIds(IEnumerable<int> rows)
        {
            var id = t.IndexOf("point_id");
            int[] wanted = [.. rows.Where(r => !_ids.ContainsKey(r)).Distinct().Order()];
            var texts = id >= 0 ? t.TextsAt(id, wanted) : new string?[wanted.Length];
            for (var k = 0; k < wanted.Length; k++)
            {
                _ids[wanted[k]] = texts[k];
            }
        }

        /// <summary>The point at position <paramref name="row"/> (its id read by <see cref="ReadIds"/>); <paramref name="category"/> replaces x on a categorical axis.</summary>
        public PlotPoint Make(int row, int? category)
        {
            if (!_ids.ContainsKey(row))
            {
                ReadIds([row]);
            }

            return new PlotPoint(category ?? _x.Number(row)!.Value, _y.Number(row)!.Value, _ids[row]!, _flags.IsUnstable(row), _flags.IsFloppy(row));
        }
    }

    /// <summary>Orders series keys: numerically when the column is numeric, else in plan order.</summary>
    private sealed class ValueOrder : IComparer<string>
    {
        private readonly Dictionary<string, int>? _planOrder;

        private ValueOrder(Dictionary<string, int>? planOrder)
        {
            _planOrder = planOrder;
        }

        public static ValueOrder Of(ResultTable t, int column)
        {
            if (column < 0 || t.Columns[column].IsNumeric)
            {
                return new ValueOrder(null);
            }

            var order = new Dictionary<string, int>(StringComparer.Ordinal);
            var cells = t.Cells(column);
            foreach (var v in SummaryTable.Order(t, null, false).Select(r => Show.Raw(cells.Cell(r))))
            {
                order.TryAdd(v, order.Count);
            }

            return new ValueOrder(order);
        }

        public int Compare(string? x, string? y)
        {
            if (_planOrder is null)
            {
                var a = double.TryParse(x, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out var p) ? p : double.MaxValue;
                var b = double.TryParse(y, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out var q) ? q : double.MaxValue;
                return a.CompareTo(b);
            }

            return _planOrder.GetValueOrDefault(x ?? "", int.MaxValue).CompareTo(_planOrder.GetValueOrDefault(y ?? "", int.MaxValue));
        }
    }
}
