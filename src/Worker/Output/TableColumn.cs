namespace LatticeSweep.Worker.Output;

/// <summary>
/// A column and how to take its value from one row's source. Values are collected column by column
/// into typed arrays (<see cref="ColumnValues"/>), never boxed per cell: a chunk of small points
/// writes hundreds of thousands of cells, and per-cell boxing was a measurable share of the queue's
/// overhead (bench/README.md, case (e)).
/// </summary>
internal abstract class TableColumn<TRow>
{
    protected TableColumn(ColumnDef def)
    {
        Def = def;
    }

    public ColumnDef Def { get; }

    /// <summary>This column's values for <paramref name="rows"/>, in the Parquet type of <see cref="ColumnDef.Type"/>.</summary>
    public abstract Array Collect(IReadOnlyList<TRow> rows);

    /// <summary>For a column of the point (<see cref="PointColumn{TRow, TValue}"/>): its value for each of <paramref name="points"/>, in the Parquet type; null for any other column.</summary>
    public virtual Array? CollectPerPoint(IReadOnlyList<PointOutcome> points) => null;
}

/// <summary>A column whose value is computed from each row.</summary>
internal sealed class TableColumn<TRow, TValue> : TableColumn<TRow>
{
    private readonly Func<TRow, TValue> _get;

    public TableColumn(ColumnDef def, Func<TRow, TValue> get)
        : base(def)
    {
        _get = get;
    }

    public override Array Collect(IReadOnlyList<TRow> rows)
    {
        var values = new TValue[rows.Count];
        for (var i = 0; i < values.Length; i++)
        {
            values[i] = _get(rows[i]);
        }

        return ColumnValues.As(Def, values);
    }
}

/// <summary>
/// A column whose value is the same for every row of one point (its id, its swept parameters): it
/// is computed once per point and repeated, since long tables hold hundreds of rows per point.
/// </summary>
internal sealed class PointColumn<TRow, TValue> : TableColumn<TRow>
{
    private readonly Func<TRow, PointOutcome> _outcome;
    private readonly Func<PointOutcome, TValue> _get;

    public PointColumn(ColumnDef def, Func<TRow, PointOutcome> outcome, Func<PointOutcome, TValue> get)
        : base(def)
    {
        _outcome = outcome;
        _get = get;
    }

    public override Array Collect(IReadOnlyList<TRow> rows)
    {
        var values = new TValue[rows.Count];
        PointOutcome? last = null;
        TValue value = default!;
        for (var i = 0; i < values.Length; i++)
        {
            var o = _outcome(rows[i]);
            if (!ReferenceEquals(o, last))
            {
                last = o;
                value = _get(o);
            }

            values[i] = value;
        }

        return ColumnValues.As(Def, values);
    }

    public override Array CollectPerPoint(IReadOnlyList<PointOutcome> points)
    {
        var values = new TValue[points.Count];
        for (var i = 0; i < values.Length; i++)
        {
            values[i] = _get(points[i]);
        }

        return ColumnValues.As(Def, values);
    }
}

/// <summary>A result table: its name (the folder) and its columns in order.</summary>
internal sealed record TableSpec<TRow>(string Name, IReadOnlyList<TableColumn<TRow>> Columns)
{
    public IReadOnlyList<ColumnDef> Defs => Columns.Select(c => c.Def).ToList();

    public TableRows Rows(IEnumerable<TRow> sources)
    {
        var rows = sources as IReadOnlyList<TRow> ?? sources.ToList();
        var values = new Array[Columns.Count];
        for (var c = 0; c < values.Length; c++)
        {
            values[c] = Columns[c].Collect(rows);
        }

        return new TableRows(Name, Defs, rows.Count, values);
    }

    /// <summary>The same rows with each column collected only when asked for (<see cref="PartColumns"/>).</summary>
    public PartColumns ColumnsOf(IEnumerable<TRow> sources)
    {
        var rows = sources as IReadOnlyList<TRow> ?? sources.ToList();
        return new PartColumns(Name, Defs, rows.Count, c => Columns[c].Collect(rows));
    }
}

/// <summary>
/// The rows of one table for one chunk, each column collected when <see cref="Collect"/> asks for it (a new array each
/// time, nothing kept): a part written a column at a time holds one column of them, not all (bench/README, round 24).
/// </summary>
internal sealed record PartColumns(string Table, IReadOnlyList<ColumnDef> Columns, int RowCount, Func<int, Array> Collect)
{
    /// <summary>Every column collected (what <see cref="TableSpec{TRow}.Rows"/> gives).</summary>
    public TableRows Whole() => new(Table, Columns, RowCount, Enumerable.Range(0, Columns.Count).Select(Collect).ToList());
}

/// <summary>
/// The rows of one table for one chunk (or one merged file), column by column: <see cref="Values"/>[c]
/// is the typed array of column c (see <see cref="ColumnValues"/>), each <see cref="RowCount"/> long.
/// </summary>
internal sealed record TableRows(string Table, IReadOnlyList<ColumnDef> Columns, int RowCount, IReadOnlyList<Array> Values)
{
    /// <summary>The value of one cell (boxed; for tests and small reads, not for writing).</summary>
    public object? Cell(int row, int column) => Values[column].GetValue(row);
}
