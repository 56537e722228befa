using System.Text;
using System.Text.Json;
using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// What the dashboard's sweep page shows by default on a merged points/ table, worked out once by the
/// merge and written beside the files (<see cref="FileName"/>, committed with them): the key swept
/// parameters (which parameter no other one determines), the default parameter plot's and scatter's
/// drawn sample with the values and ids they carry, the scatter's Pareto front with its rows, and the
/// cells of the default table's first page (its rows of 131,072-row groups would otherwise be read for
/// 100 rows: ~0.3 s of a 10^6-point first load's ~0.85 s CPU, bench/README round 18). The
/// entry names every file it describes (name, length, write time, rows) in the dashboard's reading
/// order; the dashboard uses it only for exactly those files and only where its own defaults
/// resolve to the same columns, and otherwise works from every row as before. Where the merge
/// cannot answer as the dashboard would (a text column on an axis or splitting the series, more
/// rows than <see cref="MergeBudget"/> lets it hold, a file without its column summary) the entry
/// leaves that part out or is not written. The rules mirror the dashboard's <c>SweepPlots</c>; its
/// tests compare both paths' pages and plots byte for byte.
/// </summary>
internal static class FirstLoadFacts
{
    public const string FileName = ".first-load.json";

    /// <summary>
    /// Raised whenever what the entry holds, or how it is worked out, changes: older entries are then ignored.
    /// A part a reader may go without (<c>first_page</c>) is added without raising it: an entry without it is read as before.
    /// </summary>
    public const int Version = 1;

    public const string SweptPrefix = "swept parameter ";

    /// <summary>Parameters whose label starts so (a candidate's name) come first among the key parameters.</summary>
    public const string CandidatePrefix = "candidates.";

    public const string ConductivityColumn = "kappa_w_per_m_k";

    public const string PlanColumn = "point_index";

    /// <summary>Usual y columns of the parameter plot: the first that varies wins.</summary>
    public static readonly string[] ParameterPlotY = [ConductivityColumn, "cv_j_per_mol_k", "debye_temperature_from_cv_k", "max_freq_thz"];

    public static readonly string[] ScatterX = ["debye_temperature_from_cv_k", "max_freq_thz", "sound_speed_mean_m_per_s"];

    public static readonly string[] ScatterY = [ConductivityColumn, "cv_j_per_kg_k", "cv_j_per_mol_k", "largest_gap_width_thz"];

    /// <summary>Summary columns the dashboard's table shows by default after the swept parameters (each when it has values).</summary>
    public static readonly string[] TableColumns =
    [
        "state", "max_freq_thz", "largest_gap_width_thz", "sound_speed_mean_m_per_s", "cv_j_per_mol_k",
        "debye_temperature_from_cv_k", "stable",
    ];

    /// <summary>Rows of the default table's first page whose cells the entry keeps (the dashboard's page size).</summary>
    public const int PageRowsKept = 100;

    /// <summary>Columns about the run, not the model: never a default axis.</summary>
    public static readonly string[] RunColumns = [PlanColumn, "attempt", "duration_s"];

    public const int MaxDefaultGroups = 12;

    public const int MaxGradientGroups = 60;

    /// <summary>A plot draws at most about this many points (an even sample of each series past it).</summary>
    public const int MaxDrawn = 4000;

    /// <summary>Bytes held per row and column read (8-byte values, with room for the sort entries).</summary>
    private const long BytesPerCell = 8;

    private const long BytesPerRowBeside = 64;

    /// <summary>The rows from which the facts collect garbage between their steps (<see cref="CollectGarbage"/>): arrays of a value per row of 512 KiB.</summary>
    internal const int CollectFromRows = 1 << 16;

    /// <summary>Past this many distinct values of one parameter, "which parameter determines which" is left to the dashboard.</summary>
    private const int MaxKeys = 1 << 16;

    /// <summary>
    /// Writes the entry into <paramref name="folder"/> (a table's staging folder, every file in it) when
    /// it can; returns whether it did. <paramref name="schema"/> is the sweep's points/ columns (which are parameters).
    /// </summary>
    public static async Task<bool> TryWriteAsync(string folder, IReadOnlyList<ColumnDef> schema, MergeBudget budget, CancellationToken ct)
    {
        using var timing = Queue.StageTimings.MeasureAlone("merge: first-load facts");
        var path = Path.Combine(folder, FileName);
        File.Delete(path);
        var files = Directory.EnumerateFiles(folder, "*.parquet")
            .Select(f => new FileInfo(f))
            .Where(f => !f.Name.StartsWith('.'))
            .OrderByDescending(f => f.LastWriteTimeUtc).ThenBy(f => f.FullName, StringComparer.Ordinal)
            .ToList();
        if (files.Count == 0)
        {
            return false;
        }

        var table = await Table.OpenAsync(files, ct).ConfigureAwait(false);
        if (table is null)
        {
            return false;
        }

        var parameters = schema.Where(d => d.Description.StartsWith(SweptPrefix, StringComparison.Ordinal) && table.Has(d.Name)).ToList();
        if (table.Rows * ((parameters.Count + 5) * BytesPerCell + BytesPerRowBeside) > budget.InputBytes)
        {
            return false;
        }

        CollectGarbage(table.Rows);
        var facts = await WorkOutAsync(table, parameters, ct).ConfigureAwait(false);
        CollectGarbage(table.Rows);
        if (facts is null)
        {
            return false;
        }

        var temporary = path + ".tmp";
        // Written inline: the merge stays on its own thread to the end (MergeThread).
        ct.ThrowIfCancellationRequested();
        File.WriteAllBytes(temporary, facts);
        using (var written = new FileStream(temporary, FileMode.Open, FileAccess.ReadWrite))
        {
            written.Flush(flushToDisk: true);
        }

        File.Move(temporary, path, overwrite: true);
        return true;
    }

    private static async Task<byte[]?> WorkOutAsync(Table t, List<ColumnDef> parameterDefs, CancellationToken ct)
    {
        var parameters = parameterDefs.Select(d => d.Name).ToList();
        string Label(string p) => parameterDefs.First(d => d.Name == p).Description[SweptPrefix.Length..];
        var ordered = PlotDefaults.KeyOrder(parameters, Label);
        var step = Queue.StageTimings.MeasureAlone("merge: facts, key parameters");
        var cells = await ReadEachAsync(t, parameters, ct).ConfigureAwait(false);

        // The dashboard's rules (PlotDefaults) over this table's facts.
        if (PlotDefaults.KeyParameters(ordered, (q, p) => Determines(cells[q], cells[p], t.Rows)) is not { } key)
        {
            step.Dispose();
            return null;
        }

        var distinct = parameters.ToDictionary(p => p, p => DistinctCount(cells[p], t.Rows), StringComparer.Ordinal);
        var numbers = t.Columns.Where(c => c.Numeric && t.Count(c.Name) > 0 && c.Name != PlanColumn).Select(c => c.Name).ToList();
        var facts = new MergedFacts(t, parameters, key, numbers, distinct);
        bool IsNumeric(string c) => facts.IsNumeric(c);
        var (px, py, by) = PlotDefaults.Parameter(facts, null, null, null, noGrouping: false);
        var (sx, sy) = PlotDefaults.Scatter(facts, null, null);

        // Each plot keeps only the columns it reads (a value per row each, 8 MB at 10^6 rows): the parameters
        // the plots do not draw go before them, the parameter plot's columns before the scatter, each with the
        // collection that follows (all of them were held to the end of the step: bench/README, round 21).
        KeepOnly(cells, px, py, by, sx, sy);
        step.Dispose();
        CollectGarbage(t.Rows);
        step = Queue.StageTimings.MeasureAlone("merge: facts, plots");
        var flags = await Flags.ReadAsync(t, ct).ConfigureAwait(false);
        async Task<Cells> Read(string c) => cells.TryGetValue(c, out var known) ? known : cells[c] = await t.ReadAsync(c, ct).ConfigureAwait(false);

        // Each plot reads its columns in a method of its own: awaited here, they stayed on this method's frame to its
        // end (the merge's reads complete at once on its own thread), through the ids and the first page.
        ParameterSample? parameterPlot = null;
        // A text x (categories in plan order) or a text grouping (series in plan order) is left to the dashboard.
        if (px is not null && py is not null && IsNumeric(px) && (by is null || IsNumeric(by)))
        {
            parameterPlot = await ParameterPlotAsync(Read, px, py, by, flags, t.Rows).ConfigureAwait(false);
        }

        KeepOnly(cells, sx, sy);
        CollectGarbage(t.Rows);
        ScatterSample? scatter = null;
        if (sx is not null && sy is not null)
        {
            scatter = await ScatterAsync(Read, sx, sy, flags, t.Rows).ConfigureAwait(false);
        }

        cells.Clear();
        step.Dispose();
        CollectGarbage(t.Rows);
        step = Queue.StageTimings.MeasureAlone("merge: facts, plan order and ids");
        var planFirst = t.Has(PlanColumn) ? await PlanFirstAsync(t, ct).ConfigureAwait(false) : null;
        var wanted = new SortedSet<int>();
        foreach (var row in (parameterPlot?.Series.SelectMany(s => s.Rows) ?? []).Concat(scatter?.Stable.Rows ?? []).Concat(scatter?.Unstable.Rows ?? []).Concat(scatter?.Front.Rows ?? []))
        {
            wanted.Add(row);
        }

        var ids = await t.TextAtAsync(MergedLayout.PointIdColumn, wanted, ct).ConfigureAwait(false);
        step.Dispose();
        if (ids is null)
        {
            return null;
        }

        // The ids were read for every row (a string each, ~56 MB at 10^6 rows, some promoted while the row
        // groups were decoded): gone before the page's columns are read (its peak, 310 MB in a 10^6-point run: bench/README, round 19).
        CollectGarbage(t.Rows);
        step = Queue.StageTimings.MeasureAlone("merge: facts, first page");
        var pageRows = planFirst is null ? null : planFirst.Take(PageRowsKept).ToArray();
        var page = pageRows is null ? null : await PageCellsAsync(t, pageRows, PageColumns(t, parameters), ct).ConfigureAwait(false);
        step.Dispose();

        using var buffer = new MemoryStream();
        using (var json = new Utf8JsonWriter(buffer))
        {
            json.WriteStartObject();
            json.WriteNumber("version", Version);
            json.WriteNumber("rows", t.Rows);
            json.WriteStartArray("files");
            foreach (var f in t.Files)
            {
                json.WriteStartObject();
                json.WriteString("name", f.File.Name);
                json.WriteNumber("length", f.File.Length);
                json.WriteNumber("written_ticks", f.File.LastWriteTimeUtc.Ticks);
                json.WriteNumber("rows", f.Rows);
                json.WriteEndObject();
            }

            json.WriteEndArray();
            WriteNames(json, "parameters", ordered);
            WriteNames(json, "key_parameters", key);
            if (planFirst is not null)
            {
                json.WriteStartArray("plan_first");
                foreach (var row in planFirst)
                {
                    json.WriteNumberValue(row);
                }

                json.WriteEndArray();
            }

            if (pageRows is not null && page is not null)
            {
                WritePage(json, pageRows, page);
            }

            if (parameterPlot is not null)
            {
                json.WriteStartObject("parameter_plot");
                json.WriteString("x", px);
                json.WriteString("y", py);
                json.WriteString("by", by);
                json.WriteNumber("plotted", parameterPlot.Plotted);
                json.WriteStartArray("series");
                foreach (var s in parameterPlot.Series)
                {
                    json.WriteStartObject();
                    json.WritePropertyName("group");
                    if (s.Group is { } g)
                    {
                        json.WriteNumberValue(g);
                    }
                    else
                    {
                        json.WriteNullValue();
                    }

                    json.WriteBoolean("lines", s.Lines);
                    WritePoints(json, "points", s.Rows, i => s.X[i], i => s.Y[i], ids, flags, false);
                    json.WriteEndObject();
                }

                json.WriteEndArray();
                json.WriteEndObject();
            }

            if (scatter is not null)
            {
                json.WriteStartObject("scatter");
                json.WriteString("x", sx);
                json.WriteString("y", sy);
                json.WriteNumber("plotted", scatter.Plotted);
                WritePoints(json, "stable", scatter.Stable.Rows, i => scatter.Stable.X[i], i => scatter.Stable.Y[i], ids, flags, false);
                WritePoints(json, "unstable", scatter.Unstable.Rows, i => scatter.Unstable.X[i], i => scatter.Unstable.Y[i], ids, flags, false);
                WritePoints(json, "front", scatter.Front.Rows, i => scatter.Front.X[i], i => scatter.Front.Y[i], ids, flags, true);
                json.WriteEndObject();
            }

            json.WriteEndObject();
        }

        return buffer.ToArray();
    }

    /// <summary>
    /// The columns whose cells the first page keeps: those the dashboard's default page reads (the id,
    /// the marks, <see cref="TableColumns"/>, conductivity and every swept parameter, of which it shows
    /// the key ones), where the table has them; times are left out (the page then reads its rows).
    /// </summary>
    private static List<string> PageColumns(Table t, List<string> parameters) =>
        [.. new[] { MergedLayout.PointIdColumn, "state", "stable", "floppy" }.Concat(TableColumns).Append(ConductivityColumn).Concat(parameters)
            .Distinct(StringComparer.Ordinal)
            .Where(c => t.Columns.FirstOrDefault(x => x.Name == c) is { } column && (column.Numeric || column.Text || column.ClrType == typeof(bool)))];

    /// <summary>
    /// The cells of <paramref name="columns"/> at <paramref name="rows"/> (the first page in plan order), boxed as
    /// the dashboard boxes a cell (a whole number of an int or long column as that type, other numbers as
    /// doubles, text, flags; null where empty or where a file lacks the column). Only the row groups holding
    /// those rows are read. A column with a number JSON cannot hold (NaN, infinity) is left out.
    /// </summary>
    private static async Task<Dictionary<string, object?[]>> PageCellsAsync(Table t, int[] rows, List<string> columns, CancellationToken ct)
    {
        var page = new Dictionary<string, object?[]>(StringComparer.Ordinal);
        bool Holds(int at, int n) => rows.Any(r => r >= at && r < at + n);
        foreach (var column in columns)
        {
            var cells = new object?[rows.Length];
            await t.ForEachAsync(column, (at, data, n) =>
            {
                for (var k = 0; k < rows.Length; k++)
                {
                    var i = rows[k] - at;
                    if (i < 0 || i >= n)
                    {
                        continue;
                    }

                    cells[k] = data switch
                    {
                        string?[] s => s[i],
                        double?[] d => d[i],
                        float?[] f => f[i] is { } x ? (double)x : null,
                        int?[] v => v[i],
                        long?[] l => l[i],
                        bool?[] b => b[i],
                        _ => null,
                    };
                }
            }, ct, Holds).ConfigureAwait(false);
            if (!cells.Any(c => c is double d && !double.IsFinite(d)))
            {
                page[column] = cells;
            }
        }

        return page;
    }

    /// <summary>Writes <c>first_page</c>: the rows and each column's cells at them (also a part's first rows, <see cref="PartFirstRows"/>).</summary>
    internal static void WritePage(Utf8JsonWriter json, int[] rows, Dictionary<string, object?[]> page)
    {
        json.WriteStartObject("first_page");
        json.WriteStartArray("rows");
        foreach (var row in rows)
        {
            json.WriteNumberValue(row);
        }

        json.WriteEndArray();
        json.WriteStartObject("columns");
        foreach (var (column, cells) in page)
        {
            json.WriteStartArray(column);
            foreach (var cell in cells)
            {
                switch (cell)
                {
                    case null: json.WriteNullValue(); break;
                    case string s: json.WriteStringValue(s); break;
                    case bool b: json.WriteBooleanValue(b); break;
                    case int i: json.WriteNumberValue(i); break;
                    case long l: json.WriteNumberValue(l); break;
                    case double d: json.WriteNumberValue(d); break;
                    default: throw new InvalidOperationException($"column {column}: a cell of type {cell.GetType().Name}");
                }
            }

            json.WriteEndArray();
        }

        json.WriteEndObject();
        json.WriteEndObject();
    }

    private static void WriteNames(Utf8JsonWriter json, string name, IEnumerable<string> names)
    {
        json.WriteStartArray(name);
        foreach (var n in names)
        {
            json.WriteStringValue(n);
        }

        json.WriteEndArray();
    }

    /// <summary>Points as [x, y, id, unstable, floppy] (and the row, for the front's listed rows); x and y by position in <paramref name="rows"/>.</summary>
    private static void WritePoints(Utf8JsonWriter json, string name, IReadOnlyList<int> rows, Func<int, double> x, Func<int, double> y, Dictionary<int, string> ids, Flags flags, bool withRow)
    {
        json.WriteStartArray(name);
        for (var i = 0; i < rows.Count; i++)
        {
            var row = rows[i];
            json.WriteStartArray();
            json.WriteNumberValue(x(i));
            json.WriteNumberValue(y(i));
            json.WriteStringValue(ids[row]);
            json.WriteBooleanValue(flags.IsUnstable(row));
            json.WriteBooleanValue(flags.IsFloppy(row));
            if (withRow)
            {
                json.WriteNumberValue(row);
            }

            json.WriteEndArray();
        }

        json.WriteEndArray();
    }

    /// <summary>A series' drawn points: their rows, x and y (only these are kept, not a column of every row).</summary>
    private sealed record SeriesSample(double? Group, bool Lines, int[] Rows, double[] X, double[] Y);

    private sealed record ParameterSample(List<SeriesSample> Series, int Plotted);

    /// <summary>Drawn points of the scatter: rows with their x and y.</summary>
    private sealed record Drawn(int[] Rows, double[] X, double[] Y)
    {
        public static Drawn Of(IEnumerable<int> rows, Cells xs, Cells ys)
        {
            int[] r = [.. rows];
            return new Drawn(r, [.. r.Select(row => xs.Number[row])], [.. r.Select(row => ys.Number[row])]);
        }
    }

    private sealed record ScatterSample(Drawn Stable, Drawn Unstable, Drawn Front, int Plotted);

    /// <summary>One in this many points of each series is drawn.</summary>
    public static int Stride(int plotted) => plotted <= MaxDrawn ? 1 : (plotted + MaxDrawn - 1) / MaxDrawn;

    /// <summary>The positions drawn of a series of <paramref name="count"/> points: one in <paramref name="stride"/> in its order, with its last.</summary>
    public static IEnumerable<int> Sample(int count, int stride)
    {
        for (var i = 0; i < count; i++)
        {
            if (i % stride == 0 || i == count - 1)
            {
                yield return i;
            }
        }
    }

    /// <summary>The columns, each read whole, in a method of its own (see <see cref="ParameterPlotAsync"/>).</summary>
    private static async Task<Dictionary<string, Cells>> ReadEachAsync(Table t, List<string> columns, CancellationToken ct)
    {
        var cells = new Dictionary<string, Cells>(StringComparer.Ordinal);
        foreach (var c in columns)
        {
            cells[c] = await t.ReadAsync(c, ct).ConfigureAwait(false);
        }

        return cells;
    }

    /// <summary>
    /// The parameter plot's columns read and drawn in a method of its own: the merge runs its reads on its own thread, where
    /// they complete at once, and a column awaited in <see cref="WorkOutAsync"/> itself stayed on its frame to its end. The
    /// reads' garbage is collected before the plot's own arrays of a row each are made (the plots step's peak at 10^6 rows:
    /// 171 -> 149 MiB in a fresh merge, bench/README round 21); the scatter likewise.
    /// </summary>
    private static async Task<ParameterSample> ParameterPlotAsync(Func<string, Task<Cells>> read, string x, string y, string? by, Flags flags, int rows)
    {
        var xs = await read(x).ConfigureAwait(false);
        var ys = await read(y).ConfigureAwait(false);
        var groups = by is null ? null : await read(by).ConfigureAwait(false);
        CollectGarbage(rows);
        return ParameterPlot(xs, ys, groups, flags, rows);
    }

    private static async Task<ScatterSample> ScatterAsync(Func<string, Task<Cells>> read, string x, string y, Flags flags, int rows)
    {
        var xs = await read(x).ConfigureAwait(false);
        var ys = await read(y).ConfigureAwait(false);
        CollectGarbage(rows);
        return Scatter(xs, ys, flags, rows);
    }

    private static ParameterSample ParameterPlot(Cells xs, Cells ys, Cells? groups, Flags flags, int rows)
    {
        var groupAt = new Dictionary<long, int>();
        var groupRows = new List<List<int>>();
        for (var row = 0; row < rows; row++)
        {
            var x = xs.Number[row];
            var y = ys.Number[row];
            if (!double.IsFinite(x) || !double.IsFinite(y))
            {
                continue;
            }

            // Groups by the cell's bits (an empty cell is NaN's, which no table holds as a value).
            var key = groups is null ? 0 : BitConverter.DoubleToInt64Bits(groups.Number[row]);
            if (!groupAt.TryGetValue(key, out var g))
            {
                groupAt[key] = g = groupRows.Count;
                groupRows.Add([]);
            }

            groupRows[g].Add(row);
        }

        // Series by the grouping value (an empty cell last), ties in first-seen order (a stable sort).
        // The stride is known from the counts, so each series is sampled as soon as it is sorted and
        // only the drawn points are kept (a series of every row would hold its rows and x twice over).
        double Order(List<int> r) => groups is null || double.IsNaN(groups.Number[r[0]]) ? double.MaxValue : groups.Number[r[0]];
        var plotted = groupRows.Sum(g => g.Count);
        var stride = Stride(plotted);
        var sampled = new List<SeriesSample>();
        foreach (var group in groupRows.OrderBy(Order))
        {
            var entries = new (double X, int Order, int Row)[group.Count];
            for (var i = 0; i < entries.Length; i++)
            {
                entries[i] = (xs.Number[group[i]], i, group[i]);
            }

            entries.AsSpan().Sort((p, q) => p.X.CompareTo(q.X) is var c and not 0 ? c : p.Order.CompareTo(q.Order));
            var lines = true;
            for (var i = 1; i < entries.Length && lines; i++)
            {
                lines = entries[i].X != entries[i - 1].X;
            }

            double? name = groups is null || double.IsNaN(groups.Number[group[0]]) ? null : groups.Number[group[0]];
            var at = Sample(entries.Length, stride).ToArray();
            sampled.Add(new SeriesSample(name, lines, [.. at.Select(i => entries[i].Row)], [.. at.Select(i => entries[i].X)], [.. at.Select(i => ys.Number[entries[i].Row])]));
        }

        return new ParameterSample(sampled, plotted);
    }

    private static ScatterSample Scatter(Cells xs, Cells ys, Flags flags, int rows)
    {
        var stable = new List<int>();
        var unstable = new List<int>();
        for (var row = 0; row < rows; row++)
        {
            if (double.IsFinite(xs.Number[row]) && double.IsFinite(ys.Number[row]))
            {
                (flags.IsUnstable(row) ? unstable : stable).Add(row);
            }
        }

        var front = ParetoFront.OfRows(xs.Number, ys.Number, stable, true, true);
        var plotted = stable.Count + unstable.Count;
        var stride = Stride(plotted);
        return new ScatterSample(Drawn.Of(Sample(stable.Count, stride).Select(i => stable[i]), xs, ys), Drawn.Of(Sample(unstable.Count, stride).Select(i => unstable[i]), xs, ys),
            Drawn.Of(front, xs, ys), plotted);
    }

    /// <summary>Rows listed at most in plan order (the first pages of the default table).</summary>
    public const int PlanRowsKept = 1000;

    /// <summary>
    /// The first <see cref="PlanRowsKept"/> rows in plan order as the dashboard sorts them: by plan
    /// index, rows without one last, ties in row order. Read a row group at a time into a bounded
    /// selection (<see cref="PlanOrderSelection"/>), not an array of every row (24 bytes a row, 24 MB at 10^6 points).
    /// </summary>
    private static async Task<int[]> PlanFirstAsync(Table t, CancellationToken ct)
    {
        var first = new PlanOrderSelection(PlanRowsKept);
        await t.ForEachAsync(PlanColumn, (at, data, n) =>
        {
            for (var i = 0; i < n; i++)
            {
                first.Offer(data switch
                {
                    double?[] d => d[i] ?? double.NaN,
                    float?[] f => f[i] ?? double.NaN,
                    int?[] v => v[i] is { } x ? x : double.NaN,
                    long?[] l => l[i] is { } x ? x : double.NaN,
                    _ => double.NaN,
                }, at + i);
            }
        }, ct).ConfigureAwait(false);

        // Rows of a file without the column (ForEachAsync skips it) have no plan index, as ReadAsync leaves them.
        var start = 0;
        foreach (var file in t.Files)
        {
            for (var row = start; row < start + file.Rows && !file.Fields.Any(f => f.Name == PlanColumn); row++)
            {
                first.Offer(double.NaN, row);
            }

            start += file.Rows;
        }

        return first.Rows();
    }

    private static bool? Determines(Cells q, Cells p, int rows) => PlotDefaults.Determines(q, p, rows, MaxKeys);

    private static int DistinctCount(Cells c, int rows) => PlotDefaults.DistinctCount(c, rows, MaxKeys);

    /// <summary>Forgets every column read but <paramref name="kept"/> (null entries are ignored).</summary>
    private static void KeepOnly(Dictionary<string, Cells> cells, params string?[] kept)
    {
        foreach (var column in cells.Keys.Where(c => !kept.Contains(c, StringComparer.Ordinal)).ToList())
        {
            cells.Remove(column);
        }
    }

    /// <summary>
    /// A full, compacting collection that hands freed memory back. The facts hold a few arrays of a
    /// value per row and leave as many behind at each step (the rules' sorted pairs, the row lists):
    /// large objects the GC would otherwise keep until its own full collection, which set the merge's
    /// (and so a whole run's) peak memory at 10^6 points (bench/README, round 16). A few per sweep,
    /// ~10-50 ms each. Only from <see cref="CollectFromRows"/> rows: below, those arrays are small, and in a
    /// 300-point run the five collections (and the pages faulted in again after each) were most of the facts' cost
    /// (bench/README, round 21).
    /// </summary>
    private static void CollectGarbage(int rows)
    {
        if (rows < CollectFromRows)
        {
            return;
        }

        GC.Collect(GC.MaxGeneration, GCCollectionMode.Aggressive, blocking: true, compacting: true);
        Queue.HeapCeiling.Process.Reset();
    }

    /// <summary>One column of the whole table: numbers as doubles (NaN where empty: no table holds NaN), or text.</summary>
    private sealed class Cells(double[] number, string?[]? text) : IRuleCells
    {
        public double[] Number { get; } = number;

        public string?[]? Text { get; } = text;

        public bool Numeric => Text is null;

        public long NumberBits(int row) => BitConverter.DoubleToInt64Bits(Number[row]);

        public RuleKey Key(int row) => Text is { } t
            ? (t[row] is { } s ? new RuleKey(0, s) : RuleKey.Empty)
            : new RuleKey(NumberBits(row), null);
    }

    /// <summary>The marks as the dashboard reads them: unstable by its state or stable = false, floppy by its flag.</summary>
    private sealed class Flags(bool[] unstable, bool[] floppy)
    {
        public bool IsUnstable(int row) => unstable[row];

        public bool IsFloppy(int row) => floppy[row];

        public static async Task<Flags> ReadAsync(Table t, CancellationToken ct)
        {
            var unstable = new bool[t.Rows];
            var floppy = new bool[t.Rows];
            await t.ForEachAsync("state", (at, data, n) =>
            {
                if (data is string?[] s)
                {
                    for (var i = 0; i < n; i++)
                    {
                        unstable[at + i] |= s[i] == "unstable";
                    }
                }
            }, ct).ConfigureAwait(false);
            await t.ForEachAsync("stable", (at, data, n) =>
            {
                if (data is bool?[] b)
                {
                    for (var i = 0; i < n; i++)
                    {
                        unstable[at + i] |= b[i] == false;
                    }
                }
            }, ct).ConfigureAwait(false);
            await t.ForEachAsync("floppy", (at, data, n) =>
            {
                if (data is bool?[] b)
                {
                    for (var i = 0; i < n; i++)
                    {
                        floppy[at + i] = b[i] == true;
                    }
                }
            }, ct).ConfigureAwait(false);
            return new Flags(unstable, floppy);
        }
    }

    /// <summary>The merged table's facts as the shared rules read them.</summary>
    private sealed class MergedFacts(Table t, List<string> parameters, List<string> key, List<string> numbers, Dictionary<string, int> distinct) : IPlotDefaultFacts
    {
        public IReadOnlyList<string> Parameters => parameters;

        public IReadOnlyList<string> KeyParameters => key;

        public IReadOnlyList<string> Numbers => numbers;

        public bool IsNumeric(string column) => t.Columns.First(x => x.Name == column).Numeric;

        public bool IsParameter(string column) => parameters.Contains(column);

        public bool Varies(string column) => t.Varies(column);

        public int Distinct(string column) => distinct[column];
    }

    private sealed record TableColumn(string Name, Type ClrType, bool Numeric, bool Text);

    /// <summary>Text as Parquet.Net reads it (a string, or characters in memory).</summary>
    private static bool IsText(DataField field) => field.ClrType == typeof(string) || field.ClrType == typeof(ReadOnlyMemory<char>);

    private sealed record TableFile(FileInfo File, int Rows, DataField[] Fields);

    /// <summary>The merged files read one after the other, with the column facts of their footers added up.</summary>
    private sealed class Table
    {
        private readonly Dictionary<string, (long Count, long Finite, double Min, double Max)> _facts;

        private Table(List<TableFile> files, List<TableColumn> columns, Dictionary<string, (long, long, double, double)> facts)
        {
            Files = files;
            Columns = columns;
            _facts = facts;
            Rows = files.Sum(f => f.Rows);
        }

        public List<TableFile> Files { get; }

        public List<TableColumn> Columns { get; }

        public int Rows { get; }

        public bool Has(string column) => Columns.Any(c => c.Name == column);

        public long Count(string column) => _facts.TryGetValue(column, out var f) ? f.Count : 0;

        /// <summary>More than one finite value, not all equal (as the dashboard judges "varies" from the footers).</summary>
        public bool Varies(string column) => _facts.TryGetValue(column, out var f) && f.Finite > 1 && f.Min < f.Max;

        /// <summary>Opens the files' footers; null when one lacks its column summary or the files differ in columns.</summary>
        public static async Task<Table?> OpenAsync(List<FileInfo> files, CancellationToken ct)
        {
            var opened = new List<TableFile>();
            List<TableColumn>? columns = null;
            var facts = new Dictionary<string, (long Count, long Finite, double Min, double Max)>(StringComparer.Ordinal);
            foreach (var file in files)
            {
                await using var stream = file.OpenRead();
                await using var reader = await ParquetReader.CreateAsync(new InlineStream(stream), cancellationToken: ct).ConfigureAwait(false);
                var fields = reader.Schema.GetDataFields();
                var mine = fields.Select(f => new TableColumn(f.Name, f.ClrType, f.ClrType == typeof(double) || f.ClrType == typeof(int) || f.ClrType == typeof(long) || f.ClrType == typeof(float), IsText(f))).ToList();
                if (columns is null)
                {
                    columns = mine;
                }
                else if (!columns.SequenceEqual(mine))
                {
                    return null;
                }

                long rows = 0;
                for (var g = 0; g < reader.RowGroupCount; g++)
                {
                    using var group = reader.OpenRowGroupReader(g);
                    rows += group.RowCount;
                }

                if (reader.CustomMetadata?.GetValueOrDefault(ColumnSummary.Key) is not { } text || rows > int.MaxValue)
                {
                    return null;
                }

                using var json = JsonDocument.Parse(text);
                if (json.RootElement.GetProperty("rows").GetInt64() != rows)
                {
                    return null;
                }

                foreach (var c in json.RootElement.GetProperty("columns").EnumerateObject())
                {
                    var count = c.Value.GetProperty("count").GetInt64();
                    var finite = c.Value.TryGetProperty("finite", out var f) ? f.GetInt64() : 0;
                    var min = finite > 0 ? c.Value.GetProperty("min").GetDouble() : double.PositiveInfinity;
                    var max = finite > 0 ? c.Value.GetProperty("max").GetDouble() : double.NegativeInfinity;
                    var before = facts.GetValueOrDefault(c.Name, (0, 0, double.PositiveInfinity, double.NegativeInfinity));
                    facts[c.Name] = (before.Count + count, before.Finite + finite, Math.Min(before.Min, min), Math.Max(before.Max, max));
                }

                opened.Add(new TableFile(file, (int)rows, fields));
            }

            return columns is null ? null : new Table(opened, columns, facts);
        }

        /// <summary>
        /// Calls <paramref name="each"/> with every row group's cells of <paramref name="column"/> (the first
        /// <c>n</c> cells of the array), the row it starts at and its rows. The array is one buffer per type
        /// reused from group to group (a merged file's groups are 131,072 rows: an array per group and column
        /// would be large-object garbage the GC keeps until a full collection), so <paramref name="each"/> must not keep it.
        /// </summary>
        /// <remarks><paramref name="groups"/>(start, rows), when given, picks the row groups read (the others are skipped unread).</remarks>
        public async Task ForEachAsync(string column, Action<int, Array, int> each, CancellationToken ct, Func<int, int, bool>? groups = null)
        {
            var at = 0;
            foreach (var file in Files)
            {
                var field = file.Fields.FirstOrDefault(f => f.Name == column);
                if (field is null)
                {
                    at += file.Rows;
                    continue;
                }

                await using var stream = file.File.OpenRead();
                await using var reader = await ParquetReader.CreateAsync(new InlineStream(stream), cancellationToken: ct).ConfigureAwait(false);
                for (var g = 0; g < reader.RowGroupCount; g++)
                {
                    using var group = reader.OpenRowGroupReader(g);
                    var n = checked((int)group.RowCount);
                    if (groups is not null && !groups(at, n))
                    {
                        at += n;
                        continue;
                    }

                    Array data;
                    var type = field.ClrType;
                    if (IsText(field))
                    {
                        var v = Buffer<string?>(n);
                        await group.ReadAsync(field, v.AsMemory(0, n)).ConfigureAwait(false);
                        data = v;
                    }
                    else if (type == typeof(double))
                    {
                        var v = Buffer<double?>(n);
                        await group.ReadAsync<double>(field, v.AsMemory(0, n)).ConfigureAwait(false);
                        data = v;
                    }
                    else if (type == typeof(float))
                    {
                        var v = Buffer<float?>(n);
                        await group.ReadAsync<float>(field, v.AsMemory(0, n)).ConfigureAwait(false);
                        data = v;
                    }
                    else if (type == typeof(int))
                    {
                        var v = Buffer<int?>(n);
                        await group.ReadAsync<int>(field, v.AsMemory(0, n)).ConfigureAwait(false);
                        data = v;
                    }
                    else if (type == typeof(long))
                    {
                        var v = Buffer<long?>(n);
                        await group.ReadAsync<long>(field, v.AsMemory(0, n)).ConfigureAwait(false);
                        data = v;
                    }
                    else if (type == typeof(bool))
                    {
                        var v = Buffer<bool?>(n);
                        await group.ReadAsync<bool>(field, v.AsMemory(0, n)).ConfigureAwait(false);
                        data = v;
                    }
                    else
                    {
                        data = new object?[n];
                    }

                    each(at, data, n);
                    if (data is string?[] text)
                    {
                        Array.Clear(text, 0, n);
                    }

                    at += n;
                    Queue.HeapCeiling.Process.Check();
                }
            }
        }

        private readonly Dictionary<Type, Array> _buffers = [];

        private T[] Buffer<T>(int n)
        {
            if (_buffers.TryGetValue(typeof(T), out var known) && known.Length >= n)
            {
                return (T[])known;
            }

            var fresh = new T[Math.Max(n, MergedLayout.RowGroupRows)];
            _buffers[typeof(T)] = fresh;
            return fresh;
        }

        public async Task<Cells> ReadAsync(string column, CancellationToken ct)
        {
            var numbers = new double[Rows];
            Array.Fill(numbers, double.NaN);
            var isText = Columns.First(c => c.Name == column).Text;
            var text = isText ? new string?[Rows] : null;
            await ForEachAsync(column, (at, data, n) =>
            {
                switch (data)
                {
                    case string?[] s: Array.Copy(s, 0, text!, at, n); break;
                    case double?[] d: for (var i = 0; i < n; i++) { numbers[at + i] = d[i] ?? double.NaN; } break;
                    case float?[] f: for (var i = 0; i < n; i++) { numbers[at + i] = f[i] ?? double.NaN; } break;
                    case int?[] v: for (var i = 0; i < n; i++) { numbers[at + i] = v[i] is { } x ? x : double.NaN; } break;
                    case long?[] l: for (var i = 0; i < n; i++) { numbers[at + i] = l[i] is { } x ? x : double.NaN; } break;
                }
            }, ct).ConfigureAwait(false);
            return new Cells(numbers, text);
        }

        /// <summary>
        /// The text of <paramref name="column"/> at the rows asked for; null when a row has none. A row group is read only when
        /// it holds a row asked for, as Parquet.Net's character cells (<see cref="TextCells"/>), and strings are made at those
        /// rows alone: reading the column as strings made one per row (~56 MB at 10^6 rows, set the facts' peak beside the
        /// final pass's in a 10^6-point run: bench/README, round 30 (million)).
        /// </summary>
        public async Task<Dictionary<int, string>?> TextAtAsync(string column, SortedSet<int> rows, CancellationToken ct)
        {
            var found = new Dictionary<int, string>(rows.Count);
            var at = 0;
            foreach (var file in Files)
            {
                var field = file.Fields.FirstOrDefault(f => f.Name == column);
                if (field is null || !IsText(field) || field.MaxRepetitionLevel > 0)
                {
                    // A file without the column (or not as plain text) has no text at its rows.
                    if (rows.GetViewBetween(at, at + file.Rows - 1).Count > 0)
                    {
                        return null;
                    }

                    at += file.Rows;
                    continue;
                }

                await using var stream = file.File.OpenRead();
                await using var reader = await ParquetReader.CreateAsync(new InlineStream(stream), cancellationToken: ct).ConfigureAwait(false);
                for (var g = 0; g < reader.RowGroupCount; g++)
                {
                    using var group = reader.OpenRowGroupReader(g);
                    var n = checked((int)group.RowCount);
                    var asked = n == 0 ? null : rows.GetViewBetween(at, at + n - 1);
                    if (asked is { Count: > 0 })
                    {
                        using var cells = await TextCells.ReadAsync(group, field, ct).ConfigureAwait(false);
                        foreach (var row in asked)
                        {
                            if (cells.IsNull(row - at))
                            {
                                return null;
                            }

                            found[row] = new string(cells.Chars(row - at));
                        }

                        Queue.HeapCeiling.Process.Check();
                    }

                    at += n;
                }
            }

            return found.Count != rows.Count ? null : found;
        }
    }
}
