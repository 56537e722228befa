using System.Data.Common;
using System.Globalization;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Points per swept value and state (<c>latsweep_axis_counts</c>), the coverage table of <c>status</c>
/// and the dashboard, kept in step with the point rows as <c>latsweep_sweep_counts</c> is: each write
/// that changes point states adds what it changed per (column, value, state) in the same transaction,
/// under the sweep's lock, so a point is counted once, in its latest state, through crashes, retries
/// and re-queues. Reading it is a few rows per swept value however many points the sweep has (reading
/// every point's parameters took ~3 s for 2 x 10^5 points: bench/README.md, Round 17). Sweeps written
/// before the table (or by a latsweep that does not know it), whose per-state totals differ from the
/// sweep's counts, are counted from their points by each read (which writes nothing) until a command
/// that writes to the store anyway stores the count (<see cref="CountStaleAxesAgain"/>).
/// </summary>
public abstract partial class SqlSweepCatalog
{
    /// <summary>Rows per upsert statement: a statement is a round trip to PostgreSQL.</summary>
    private const int AxisRowsPerStatement = 100;

    /// <summary>An empty tally of the sweep's axes as its record gives them (a drawn axis per bin, any other per value).</summary>
    private static AxisTally EmptyTally(DbConnection c, DbTransaction? tx, string sweepId) => AxisTally.For(ReadAxes(c, tx, sweepId));

    /// <summary>The rows of one chunk: point id, state text and parameters' text.</summary>
    private static List<(string PointId, string State, string ParametersJson)> ChunkRows(DbConnection c, DbTransaction tx, string sweepId, string chunkId)
    {
        using var cmd = Command(c, tx, "SELECT point_id, state, parameters_json FROM latsweep_points WHERE sweep_id = @sweep AND chunk_id = @chunk");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "chunk", chunkId);
        using var r = cmd.ExecuteReader();
        var rows = new List<(string, string, string)>();
        while (r.Read())
        {
            rows.Add((r.GetString(0), r.GetString(1), r.GetString(2)));
        }

        return rows;
    }

    /// <summary>The tally of one chunk's point rows in their present states.</summary>
    private static AxisTally ChunkTally(DbConnection c, DbTransaction tx, string sweepId, string chunkId, AxisTally empty)
    {
        var tally = empty.Empty();
        foreach (var (_, state, json) in ChunkRows(c, tx, sweepId, chunkId))
        {
            tally.AddParameters(json, state);
        }

        return tally;
    }

    /// <summary>Adds the tally of a pending chunk's points (from its text, in <paramref name="state"/>) to <paramref name="tally"/>.</summary>
    private static void AddPendingChunk(DbConnection c, DbTransaction tx, string sweepId, string chunkId, string state, AxisTally tally)
    {
        using var cmd = Command(c, tx, "SELECT points_json FROM latsweep_chunks WHERE sweep_id = @sweep AND chunk_id = @chunk");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "chunk", chunkId);
        if (cmd.ExecuteScalar() is string text)
        {
            foreach (var p in ChunkText.Decode(text, chunkId))
            {
                tally.AddParameters(p.ParametersJson, state);
            }
        }
    }

    /// <summary>Adds <paramref name="after"/> minus <paramref name="before"/> to the sweep's axis counts.</summary>
    private void AddAxisChange(DbConnection c, DbTransaction tx, string sweepId, AxisTally before, AxisTally after)
    {
        var changes = AxisTally.Change(before, after);
        if (changes.Count > 0)
        {
            AddAxisRows(c, tx, sweepId, changes);
        }
    }

    /// <summary>
    /// Adds each change to its (column, value, state) count row, creating the row when missing: here
    /// <see cref="AxisRowsPerStatement"/> rows per statement (a statement is a round trip to PostgreSQL).
    /// </summary>
    protected virtual void AddAxisRows(DbConnection c, DbTransaction tx, string sweepId, IReadOnlyList<((string Column, string Value, string State) Key, long Change)> changes)
    {
        ArgumentNullException.ThrowIfNull(changes);
        for (var start = 0; start < changes.Count; start += AxisRowsPerStatement)
        {
            var count = Math.Min(AxisRowsPerStatement, changes.Count - start);
            var sql = new System.Text.StringBuilder("INSERT INTO latsweep_axis_counts (sweep_id, column_name, value_json, state, points) VALUES ");
            using var cmd = Command(c, tx, "");
            Add(cmd, "s", sweepId);
            for (var i = 0; i < count; i++)
            {
                var n = i.ToString(CultureInfo.InvariantCulture);
                var ((column, value, state), change) = changes[start + i];
                sql.Append(i == 0 ? "" : ", ").Append($"(@s, @c{n}, @v{n}, @t{n}, @n{n})");
                Add(cmd, "c" + n, column);
                Add(cmd, "v" + n, value);
                Add(cmd, "t" + n, state);
                Add(cmd, "n" + n, change);
            }

            sql.Append(" ON CONFLICT (sweep_id, column_name, value_json, state) DO UPDATE SET points = latsweep_axis_counts.points + excluded.points");
            cmd.CommandText = sql.ToString();
            cmd.ExecuteNonQuery();
        }
    }

    /// <summary>Adds a chunk's completion: its <paramref name="rows"/> as they were before, each point of <paramref name="points"/> in its new state (the last one given, as the updates leave it).</summary>
    private void AddCompletedAxes(DbConnection c, DbTransaction tx, string sweepId,
        List<(string PointId, string State, string ParametersJson)> rows, IReadOnlyList<PointCompletion> points)
    {
        var columns = EmptyTally(c, tx, sweepId);
        var next = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var p in points)
        {
            next[p.PointId] = Text(p.State);
        }

        var before = columns.Empty();
        var after = columns.Empty();
        foreach (var (pointId, state, json) in rows)
        {
            before.AddParameters(json, state, after, next.GetValueOrDefault(pointId, state));
        }

        AddAxisChange(c, tx, sweepId, before, after);
    }

    /// <summary>Moves the sweep's waiting points (rows and pending chunks) to cancelled in the axis counts. Call before the states change, under the sweep's lock.</summary>
    private void CancelAxes(DbConnection c, DbTransaction tx, string sweepId)
    {
        var waiting = EmptyTally(c, tx, sweepId);
        using (var cmd = Command(c, tx, "SELECT parameters_json FROM latsweep_points WHERE sweep_id = @sweep AND state = @waiting"))
        {
            Add(cmd, "sweep", sweepId);
            Add(cmd, "waiting", Text(PointState.Waiting));
            using var r = cmd.ExecuteReader();
            while (r.Read())
            {
                waiting.AddParameters(r.GetString(0), Text(PointState.Waiting));
            }
        }

        foreach (var chunk in ReadPendingChunks(c, tx, sweepId, PointState.Waiting))
        {
            AddPendingChunk(c, tx, sweepId, chunk.ChunkId, Text(PointState.Waiting), waiting);
        }

        AddAxisChange(c, tx, sweepId, waiting, waiting.AllIn(Text(PointState.Cancelled)));
    }

    /// <summary>The sweep's axis values counted from its point rows and pending chunks (reads only).</summary>
    private static AxisTally TallyFromPoints(DbConnection c, DbTransaction tx, string sweepId)
    {
        var tally = EmptyTally(c, tx, sweepId);
        using (var cmd = Command(c, tx, "SELECT state, parameters_json FROM latsweep_points WHERE sweep_id = @sweep"))
        {
            Add(cmd, "sweep", sweepId);
            using var r = cmd.ExecuteReader();
            while (r.Read())
            {
                tally.AddParameters(r.GetString(1), r.GetString(0));
            }
        }

        foreach (var chunk in ReadPendingChunks(c, tx, sweepId, null))
        {
            AddPendingChunk(c, tx, sweepId, chunk.ChunkId, Text(chunk.State), tally);
        }

        return tally;
    }

    /// <summary>Counts the sweep's axis values again from its point rows and pending chunks. Call under the sweep's lock.</summary>
    private void RecountAxes(DbConnection c, DbTransaction tx, string sweepId)
    {
        var tally = TallyFromPoints(c, tx, sweepId);
        Execute(c, tx, "DELETE FROM latsweep_axis_counts WHERE sweep_id = @sweep", ("sweep", sweepId));
        AddAxisChange(c, tx, sweepId, tally.Empty(), tally);
    }

    /// <summary>The count rows of a tally (without the all-points rows).</summary>
    private static List<(string Column, string Value, string State, long Points)> Rows(AxisTally tally) =>
        [.. tally.Counts.Where(e => e.Key.Column != AxisTally.AllPoints).Select(e => (e.Key.Column, e.Key.Value, e.Key.State, e.Value))];

    /// <summary>Whether axis-count totals (per state, running with waiting) agree with a sweep's counts.</summary>
    private static bool AxisTotalsAgree(SweepCounts axisTotals, SweepCounts counts) =>
        axisTotals == counts with { Waiting = counts.Waiting + counts.Running, Running = 0 };

    public int CountStaleAxesAgain()
    {
        using var c = Open();
        var stale = new List<string>();
        using (var tx = BeginRead(c))
        {
            var totals = new Dictionary<string, SweepCounts>(StringComparer.Ordinal);
            using (var cmd = Command(c, tx, "SELECT sweep_id, state, points FROM latsweep_axis_counts WHERE column_name = @all"))
            {
                Add(cmd, "all", AxisTally.AllPoints);
                using var r = cmd.ExecuteReader();
                while (r.Read())
                {
                    var id = r.GetString(0);
                    totals[id] = Count(totals.GetValueOrDefault(id) ?? SweepCounts.Empty, ParsePointState(r.GetString(1)), r.GetInt64(2));
                }
            }

            using (var cmd = Command(c, tx, "SELECT sweep_id FROM latsweep_sweeps"))
            using (var r = cmd.ExecuteReader())
            {
                while (r.Read())
                {
                    stale.Add(r.GetString(0));
                }
            }

            stale.RemoveAll(id => AxisTotalsAgree(totals.GetValueOrDefault(id) ?? SweepCounts.Empty, ReadCounts(c, tx, id)));
            tx.Commit();
        }

        foreach (var sweepId in stale)
        {
            using var tx = c.BeginTransaction();
            LockSweep(c, tx, sweepId);
            if (!AxisCountsAgree(c, tx, sweepId))
            {
                RecountAxes(c, tx, sweepId);
            }

            tx.Commit();
        }

        return stale.Count;
    }

    /// <summary>Whether the sweep's axis-count totals per state (column <see cref="AxisTally.AllPoints"/>) agree with its counts.</summary>
    private static bool AxisCountsAgree(DbConnection c, DbTransaction tx, string sweepId)
    {
        var totals = SweepCounts.Empty;
        using (var cmd = Command(c, tx, "SELECT state, points FROM latsweep_axis_counts WHERE sweep_id = @sweep AND column_name = @all"))
        {
            Add(cmd, "sweep", sweepId);
            Add(cmd, "all", AxisTally.AllPoints);
            using var r = cmd.ExecuteReader();
            while (r.Read())
            {
                totals = Count(totals, ParsePointState(r.GetString(0)), r.GetInt64(1));
            }
        }

        return AxisTotalsAgree(totals, ReadCounts(c, tx, sweepId));
    }

    /// <summary>
    /// Axes of up to this many distinct value texts are read whole and list their declared values in
    /// order, then values only points hold; larger ones list their values sorted, a window at a time
    /// (the sweep page shows 1,000 per axis; an axis of 10^6 values read whole took every row of it).
    /// </summary>
    public const int DeclaredOrderValues = 5000;

    public IReadOnlyList<AxisCoverage> GetAxisCoverage(string sweepId, AxisWindow? window = null)
    {
        window ??= AxisWindow.Whole;
        using var c = Open();
        var sweep = ReadSweeps(c, $"SELECT {SweepColumns} FROM latsweep_sweeps WHERE sweep_id = @key", [("key", sweepId)]).FirstOrDefault();
        if (sweep is null)
        {
            return [];
        }

        var axes = sweep.Axes.Where(a => window.Column is null || a.ColumnName == window.Column).ToList();
        var result = new List<AxisCoverage>();
        using var tx = BeginRead(c);
        if (!AxisCountsAgree(c, tx, sweepId))
        {
            // A sweep from before the table, or written to by a latsweep that does not keep it:
            // counted here from its points in the same snapshot, and written by the next command
            // that writes to the store anyway (CountStaleAxesAgain). A read writes nothing, so it
            // works on a read-only file or with a database role that may only read.
            var rows = Rows(TallyFromPoints(c, tx, sweepId));
            result.AddRange(Coverage(axes, rows).Select(a => Window(a, window)));
        }
        else
        {
            foreach (var axis in axes)
            {
                if (AxisBins.Of(axis) is not null)
                {
                    // A drawn axis: a few rows per bin, read whole.
                    result.Add(Window(Coverage([axis], AxisRows(c, tx, sweepId, axis.ColumnName, null))[0], window));
                    continue;
                }

                var texts = ValueTextCount(c, tx, sweepId, axis.ColumnName);
                if (texts <= DeclaredOrderValues)
                {
                    result.Add(Window(Coverage([axis], AxisRows(c, tx, sweepId, axis.ColumnName, null))[0], window));
                }
                else
                {
                    var page = PageOfTexts(c, tx, sweepId, axis, window);
                    var covered = SortedCoverage(axis, page, AxisRows(c, tx, sweepId, axis.ColumnName, page));
                    result.Add(covered with { Offset = window.Offset, ValueCount = texts });
                }
            }
        }

        tx.Commit();
        return result;
    }

    /// <summary>The part of a whole axis's coverage the window asks for.</summary>
    private static AxisCoverage Window(AxisCoverage whole, AxisWindow window) =>
        whole with
        {
            Values = [.. whole.Values.Skip((int)Math.Min(window.Offset, int.MaxValue)).Take(window.Limit)],
            Offset = window.Offset,
            ValueCount = whole.Values.Length,
        };

    /// <summary>How many value texts of one axis have points (a value a later latsweep wrote with another text counts twice).</summary>
    private static long ValueTextCount(DbConnection c, DbTransaction tx, string sweepId, string column)
    {
        using var cmd = Command(c, tx, """
            SELECT count(*) FROM (SELECT value_json FROM latsweep_axis_counts
            WHERE sweep_id = @sweep AND column_name = @column GROUP BY value_json HAVING sum(points) <> 0) t
            """);
        Add(cmd, "sweep", sweepId);
        Add(cmd, "column", column);
        return Convert.ToInt64(cmd.ExecuteScalar(), CultureInfo.InvariantCulture);
    }

    /// <summary>The value texts of one large axis in the window, sorted in the store (numbers by value, then by text).</summary>
    private List<string> PageOfTexts(DbConnection c, DbTransaction tx, string sweepId, AxisInfo axis, AxisWindow window)
    {
        var order = axis.ValueType == AxisValueType.Text ? "value_json" : $"({NumberOf("value_json")} IS NULL), {NumberOf("value_json")}, value_json";
        using var cmd = Command(c, tx, $"""
            SELECT value_json FROM latsweep_axis_counts WHERE sweep_id = @sweep AND column_name = @column
            GROUP BY value_json HAVING sum(points) <> 0 ORDER BY {order} LIMIT @limit OFFSET @offset
            """);
        Add(cmd, "sweep", sweepId);
        Add(cmd, "column", axis.ColumnName);
        Add(cmd, "limit", (long)window.Limit);
        Add(cmd, "offset", window.Offset);
        using var r = cmd.ExecuteReader();
        var texts = new List<string>();
        while (r.Read())
        {
            texts.Add(r.GetString(0));
        }

        return texts;
    }

    /// <summary>A JSON number's text as a number in SQL for sorting (null for any other text).</summary>
    protected abstract string NumberOf(string expression);

    /// <summary>The count rows of one axis: every value, or only the value texts in <paramref name="texts"/>.</summary>
    private static List<(string Column, string Value, string State, long Points)> AxisRows(DbConnection c, DbTransaction tx, string sweepId, string column, List<string>? texts)
    {
        var rows = new List<(string, string, string, long)>();
        const int PerStatement = 500;
        for (var start = 0; texts is null ? start == 0 : start < texts.Count; start += PerStatement)
        {
            var sql = new System.Text.StringBuilder("SELECT value_json, state, points FROM latsweep_axis_counts WHERE sweep_id = @sweep AND column_name = @column");
            using var cmd = Command(c, tx, "");
            Add(cmd, "sweep", sweepId);
            Add(cmd, "column", column);
            if (texts is not null)
            {
                var part = texts.Skip(start).Take(PerStatement).ToList();
                sql.Append(" AND value_json IN (").Append(string.Join(", ", part.Select((_, i) => "@v" + i.ToString(CultureInfo.InvariantCulture)))).Append(')');
                for (var i = 0; i < part.Count; i++)
                {
                    Add(cmd, "v" + i.ToString(CultureInfo.InvariantCulture), part[i]);
                }
            }

            cmd.CommandText = sql.ToString();
            using var r = cmd.ExecuteReader();
            while (r.Read())
            {
                rows.Add((column, r.GetString(0), r.GetString(1), r.GetInt64(2)));
            }
        }

        return rows;
    }

    /// <summary>The coverage of a large axis's window: its value texts in the store's order, each value's states summed over the texts that read as it.</summary>
    private static AxisCoverage SortedCoverage(AxisInfo axis, List<string> page, List<(string Column, string Value, string State, long Points)> rows)
    {
        var byText = rows.GroupBy(r => r.Value, StringComparer.Ordinal).ToDictionary(g => g.Key, g => g.ToList(), StringComparer.Ordinal);
        var byValue = new Dictionary<string, AxisValueCoverage>(StringComparer.Ordinal);
        var order = new List<string>();
        foreach (var text in page)
        {
            if (CatalogJson.ReadValue(text, axis.ValueType) is not { } value)
            {
                continue;
            }

            var key = CatalogJson.Show(value);
            if (!byValue.TryGetValue(key, out var e))
            {
                e = new AxisValueCoverage(value, 0, 0, 0, 0, 0);
                order.Add(key);
            }

            foreach (var (_, _, state, n) in byText.GetValueOrDefault(text) ?? [])
            {
                e = Counted(e, ParsePointState(state), n);
            }

            byValue[key] = e;
        }

        return new AxisCoverage(axis.ColumnName, axis.Path, axis.Unit, [.. order.Select(k => byValue[k])]);
    }

    /// <summary>
    /// The coverage of a drawn axis: every bin of its interval in order (empty ones too), each with the
    /// points of the count rows whose value (a bin's lower edge, or from a sweep counted from its points
    /// the value itself) falls in it.
    /// </summary>
    private static AxisCoverage BinnedCoverage(AxisInfo axis, AxisBins bins, List<(string Column, string Value, string State, long Points)> rows)
    {
        var entries = Enumerable.Range(0, bins.Count)
            .Select(k => new AxisValueCoverage(bins.Lower(k), 0, 0, 0, 0, 0) { Upper = bins.Upper(k), BinText = bins.Text(k) })
            .ToArray();
        foreach (var (column, text, state, n) in rows)
        {
            if (column == axis.ColumnName && n != 0 && CatalogJson.ReadValue(text, axis.ValueType) is { } value)
            {
                var k = bins.IndexOf(value);
                entries[k] = Counted(entries[k], ParsePointState(state), n);
            }
        }

        return new AxisCoverage(axis.ColumnName, axis.Path, axis.Unit, [.. entries]) { Bins = bins.Describe() };
    }

    private static AxisValueCoverage Counted(AxisValueCoverage e, PointState state, long n) => state switch
    {
        PointState.Done => e with { Total = e.Total + n, Done = e.Done + n },
        PointState.Failed => e with { Total = e.Total + n, Failed = e.Failed + n },
        PointState.Cancelled => e with { Total = e.Total + n, Cancelled = e.Cancelled + n },
        PointState.Unstable => e with { Total = e.Total + n, Unstable = e.Unstable + n },
        _ => e with { Total = e.Total + n, Pending = e.Pending + n },
    };

    /// <summary>The coverage table from the count rows: per axis its declared values in order, then values only points hold (sorted), each value's states summed over the texts that read as it.</summary>
    private static List<AxisCoverage> Coverage(IEnumerable<AxisInfo> axes, List<(string Column, string Value, string State, long Points)> rows)
    {
        var result = new List<AxisCoverage>();
        foreach (var axis in axes)
        {
            if (AxisBins.Of(axis) is { } bins)
            {
                result.Add(BinnedCoverage(axis, bins, rows));
                continue;
            }

            var byValue = new Dictionary<string, (object Value, long Total, long Done, long Failed, long Pending, long Cancelled, long Unstable)>(StringComparer.Ordinal);
            var order = new List<string>();
            foreach (var v in axis.Values)
            {
                var key = CatalogJson.Show(v);
                if (byValue.TryAdd(key, (v, 0, 0, 0, 0, 0, 0)))
                {
                    order.Add(key);
                }
            }

            var extra = new List<(object Value, string Key)>();
            foreach (var (_, text, stateText, n) in rows.Where(r => r.Column == axis.ColumnName))
            {
                if (n == 0 || CatalogJson.ReadValue(text, axis.ValueType) is not { } value)
                {
                    continue;
                }

                var key = CatalogJson.Show(value);
                if (!byValue.TryGetValue(key, out var e))
                {
                    e = (value, 0, 0, 0, 0, 0, 0);
                    extra.Add((value, key));
                }

                byValue[key] = ParsePointState(stateText) switch
                {
                    PointState.Done => e with { Total = e.Total + n, Done = e.Done + n },
                    PointState.Failed => e with { Total = e.Total + n, Failed = e.Failed + n },
                    PointState.Cancelled => e with { Total = e.Total + n, Cancelled = e.Cancelled + n },
                    PointState.Unstable => e with { Total = e.Total + n, Unstable = e.Unstable + n },
                    _ => e with { Total = e.Total + n, Pending = e.Pending + n },
                };
            }

            order.AddRange(extra.OrderBy(x => x.Value is double d ? d : x.Value is long l ? l : 0.0).ThenBy(x => x.Key, StringComparer.Ordinal).Select(x => x.Key));
            result.Add(new AxisCoverage(axis.ColumnName, axis.Path, axis.Unit,
                [.. order.Select(k => byValue[k]).Select(e => new AxisValueCoverage(e.Value, e.Total, e.Done, e.Failed, e.Pending, e.Cancelled) { Unstable = e.Unstable })]));
        }

        return result;
    }
}
