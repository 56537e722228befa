using System.Collections;
using System.Collections.Immutable;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>One column of a result table as read from its Parquet files: name, value type and unit.</summary>
public sealed record ResultColumn(string Name, Type ClrType, string Unit)
{
    public bool IsNumeric => ClrType == typeof(double) || ClrType == typeof(int) || ClrType == typeof(long) || ClrType == typeof(float);
}

/// <summary>
/// Rows of a result table (one or more part files); a value is null where a file has no such
/// column or the cell is empty. Kept by column (<see cref="CellColumn"/>: typed arrays, a
/// column of a Parquet dataset read from its files only when first asked for) with the rows in
/// view as indexes into them, so a filter or a sort makes a new view without copying cells and a
/// page boxes only its own rows (<see cref="Rows"/> boxes a row each time it is read).
/// </summary>
public sealed class ResultTable
{
    private readonly Lazy<CellColumn>[] _cells;
    private readonly int[]? _rows;
    private readonly int _count;
    private readonly Func<int, bool?>? _filled;
    private readonly Func<int[], int[], object?[][]>? _peek;
    private readonly Func<int, string, int[]?>? _find;
    private readonly Func<int, int[], string?[]>? _texts;

    /// <summary>A table of boxed rows (small tables: one point's rows, tests).</summary>
    public ResultTable(ImmutableArray<ResultColumn> columns, ImmutableArray<ImmutableArray<object?>> rows)
        : this(columns, rows.Length, c => new BoxedCells([.. rows.Select(r => c < r.Length ? r[c] : null)]))
    {
    }

    /// <summary>
    /// A table of <paramref name="count"/> rows whose column c is <paramref name="load"/>(c), called
    /// once, when first needed; <paramref name="filled"/>(c), when not null, says without reading
    /// whether the column has a value in some row (from the files' statistics).
    /// </summary>
    /// <remarks>
    /// <paramref name="peek"/>(columns, rows), when not null, gives the boxed cells of those columns at a few
    /// rows without loading the whole column (a page's rows read from their row groups only).
    /// </remarks>
    /// <remarks>
    /// <paramref name="find"/>(column, value), when not null, gives the rows whose text column holds a
    /// value without reading the whole column (a point's row from the files' row-group indexes), or null
    /// when it cannot tell.
    /// </remarks>
    internal ResultTable(ImmutableArray<ResultColumn> columns, int count, Func<int, CellColumn> load, Func<int, bool?>? filled = null, TableSummary? summary = null,
        Func<int[], int[], object?[][]>? peek = null, Func<int, string, int[]?>? find = null, Func<int, int[], string?[]>? texts = null)
    {
        Columns = columns;
        _count = count;
        _filled = filled;
        _peek = peek;
        _find = find;
        _texts = texts;
        Summary = summary is not null && summary.Rows == count ? summary : null;
        _cells = [.. columns.Select((_, c) => new Lazy<CellColumn>(() => load(c), LazyThreadSafetyMode.ExecutionAndPublication))];
    }

    private ResultTable(ResultTable source, int[] rows)
    {
        Whole = source.Whole ?? source;
        Columns = source.Columns;
        _cells = source._cells;
        _peek = source._peek;
        _texts = source._texts;
        _rows = rows;
        _count = rows.Length;
    }

    public static ResultTable Empty { get; } = new([], []);

    /// <summary>The whole table a view (a filter's rows, an ordering) was taken from; null for a whole table.</summary>
    internal ResultTable? Whole { get; }

    /// <summary>The rows in view as rows of <see cref="Whole"/>; null for a whole table.</summary>
    internal int[]? TableRows() => _rows;

    /// <summary>Facts of the whole table from its files' footers (<see cref="TableSummary"/>); null for a filtered view or files without one.</summary>
    internal TableSummary? Summary { get; }

    /// <summary>The default page's whole-table work done by the merge (<see cref="Datasets.FirstLoad"/>); null for a filtered view or a table it does not describe.</summary>
    internal FirstLoad? FirstLoad { get; set; }

    public ImmutableArray<ResultColumn> Columns { get; }

    /// <summary>The rows in view, each boxed when read (a whole table's worth is slow: prefer <see cref="Cells"/>).</summary>
    public RowList Rows => new(this);

    public int Count => _count;

    public int IndexOf(string column)
    {
        for (var i = 0; i < Columns.Length; i++)
        {
            if (Columns[i].Name == column)
            {
                return i;
            }
        }

        return -1;
    }

    public bool Has(string column) => IndexOf(column) >= 0;

    public ResultColumn? Column(string name) => IndexOf(name) is var i and >= 0 ? Columns[i] : null;

    /// <summary>Column <paramref name="column"/> over the rows in view.</summary>
    internal ColumnView Cells(int column) => new(_cells[column].Value, _rows);

    /// <summary>
    /// Column <paramref name="column"/>'s numbers as the typed arrays of its files, in row order (a file
    /// without the column as null), when this is a whole table whose files hold it as numbers; else null.
    /// </summary>
    internal IReadOnlyList<(int Rows, NumberCells? Cells)>? WholeNumbers(int column) => _rows is not null ? null : _cells[column].Value switch
    {
        NumberCells n => [(n.Length, n)],
        ConcatCells c when c.Parts.All(p => p is NumberCells or EmptyCells) => [.. c.Parts.Select(p => (p.Length, p as NumberCells))],
        _ => null,
    };

    /// <summary>The named column over the rows in view; every cell empty when the table has no such column.</summary>
    internal ColumnView Cells(string column) => IndexOf(column) is var i and >= 0 ? Cells(i) : new(new EmptyCells(_count), null);

    /// <summary>True when the column has a value in some row in view (known from statistics where the view is the whole table).</summary>
    internal bool HasAnyValue(int column)
    {
        if (_rows is null && _filled?.Invoke(column) is { } known)
        {
            return known;
        }

        var cells = Cells(column);
        for (var r = 0; r < _count; r++)
        {
            if (cells.HasValue(r))
            {
                return true;
            }
        }

        return false;
    }

    /// <summary>The cell of row <paramref name="row"/> (in view) and column <paramref name="column"/>, boxed.</summary>
    public object? Cell(int row, int column) => _cells[column].Value.Cell(_rows is null ? row : _rows[row]);

    /// <summary>
    /// The cells of one column at a few rows in view, boxed as <see cref="Cell"/> boxes them: from the
    /// column when it is loaded already, else (a table read from files) only the row groups that
    /// hold those rows are read, and the column stays unloaded. For a page of a large table.
    /// </summary>
    internal object?[][] CellsAt(IReadOnlyList<int> columns, IReadOnlyList<int> rows)
    {
        var at = new int[rows.Count];
        for (var i = 0; i < at.Length; i++)
        {
            at[i] = _rows is null ? rows[i] : _rows[rows[i]];
        }

        var result = new object?[columns.Count][];
        var unloaded = Enumerable.Range(0, columns.Count).Where(k => _peek is not null && !_cells[columns[k]].IsValueCreated).ToArray();
        var peeked = unloaded.Length > 0 ? _peek!([.. unloaded.Select(k => columns[k])], at) : [];
        for (var k = 0; k < unloaded.Length; k++)
        {
            result[unloaded[k]] = peeked[k];
        }

        for (var k = 0; k < columns.Count; k++)
        {
            if (result[k] is null)
            {
                var cells = _cells[columns[k]].Value;
                result[k] = [.. at.Select(cells.Cell)];
            }
        }

        return result;
    }

    /// <summary>
    /// The text of one column at a few rows in view (a plot's drawn points' ids): from the column when it is loaded already,
    /// else (a table read from files) from the row groups holding those rows, made into strings at those rows only, and the
    /// column stays unloaded. Null where a cell is empty or not text.
    /// </summary>
    internal string?[] TextsAt(int column, IReadOnlyList<int> rows)
    {
        var at = new int[rows.Count];
        for (var i = 0; i < at.Length; i++)
        {
            at[i] = _rows is null ? rows[i] : _rows[rows[i]];
        }

        if (_texts is not null && !_cells[column].IsValueCreated)
        {
            return _texts(column, at);
        }

        var cells = _cells[column].Value;
        return [.. at.Select(cells.Text)];
    }

    /// <summary>The rows in view at <paramref name="rows"/> (positions in this view), in that order.</summary>
    internal ResultTable Select(IReadOnlyList<int> rows)
    {
        var picked = new int[rows.Count];
        for (var i = 0; i < picked.Length; i++)
        {
            picked[i] = _rows is null ? rows[i] : _rows[rows[i]];
        }

        return new ResultTable(this, picked);
    }

    /// <summary>The rows in view for which <paramref name="keep"/> of their position is true.</summary>
    internal ResultTable Where(Func<int, bool> keep)
    {
        var kept = new List<int>();
        for (var i = 0; i < _count; i++)
        {
            if (keep(i))
            {
                kept.Add(i);
            }
        }

        return kept.Count == _count ? this : Select(kept);
    }

    /// <summary>The rows whose <paramref name="column"/> equals <paramref name="value"/>.</summary>
    /// <remarks>
    /// On a whole table read from files that index the column (a point id), the rows are found from
    /// the index and returned with their cells read from their row groups only (a table of boxed
    /// rows): a point's page reads neither every id nor every column of 10^6 rows.
    /// </remarks>
    public ResultTable Where(string column, string value)
    {
        var i = IndexOf(column);
        if (i < 0)
        {
            return Select([]);
        }

        if (_rows is null && _find?.Invoke(i, value) is { } found)
        {
            var all = Enumerable.Range(0, Columns.Length).ToArray();
            var cells = CellsAt(all, found);
            return new ResultTable(Columns, [.. found.Select((_, k) => ImmutableArray.Create(all.Select(c => cells[c][k]).ToArray()))]);
        }

        return Select(TableFacts.Of(this, "positions\n" + column, t => Positions(t, i))(value));
    }

    /// <summary>
    /// The first position in view of each of a few <paramref name="values"/> of a text column (-1 where
    /// absent), found in one pass without indexing every row (a handful of point ids out of 10^6).
    /// </summary>
    internal int[] FirstPositions(string column, IReadOnlyList<string> values)
    {
        var found = new int[values.Count];
        Array.Fill(found, -1);
        var i = IndexOf(column);
        if (i < 0 || values.Count == 0)
        {
            return found;
        }

        var wanted = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var v in values)
        {
            wanted.TryAdd(v, wanted.Count);
        }

        var at = new int[wanted.Count];
        Array.Fill(at, -1);
        var left = wanted.Count;
        var cells = Cells(i);
        for (var r = 0; r < _count && left > 0; r++)
        {
            if (cells.Text(r) is { } s && wanted.TryGetValue(s, out var k) && at[k] < 0)
            {
                at[k] = r;
                left--;
            }
        }

        for (var v = 0; v < values.Count; v++)
        {
            found[v] = at[wanted[values[v]]];
        }

        return found;
    }

    /// <summary>The values of a numeric column as doubles (null where empty).</summary>
    public IEnumerable<double?> Numbers(string column)
    {
        var i = IndexOf(column);
        if (i < 0)
        {
            return Enumerable.Repeat((double?)null, _count);
        }

        var cells = Cells(i);
        return Enumerable.Range(0, _count).Select(cells.Number);
    }

    public static double? ToDouble(object? value) => value switch
    {
        double d => d,
        float f => f,
        int n => n,
        long n => n,
        _ => null,
    };

    /// <summary>Where each text value of a column is: one position per value as a rule (a point id), a list only for a value seen again.</summary>
    private static Func<string, int[]> Positions(ResultTable t, int column)
    {
        var cells = t.Cells(column);
        var first = new Dictionary<string, int>(StringComparer.Ordinal);
        var more = new Dictionary<string, List<int>>(StringComparer.Ordinal);
        for (var r = 0; r < t.Count; r++)
        {
            if (cells.Text(r) is { } s && !first.TryAdd(s, r))
            {
                if (!more.TryGetValue(s, out var list))
                {
                    more[s] = list = [first[s]];
                }

                list.Add(r);
            }
        }

        return value => more.TryGetValue(value, out var list) ? [.. list] : first.TryGetValue(value, out var at) ? [at] : [];
    }

    /// <summary>The rows of a table, each boxed when read.</summary>
    public readonly struct RowList(ResultTable table) : IReadOnlyList<ImmutableArray<object?>>
    {
        public int Length => table._count;

        int IReadOnlyCollection<ImmutableArray<object?>>.Count => table._count;

        public ImmutableArray<object?> this[int index]
        {
            get
            {
                ArgumentOutOfRangeException.ThrowIfNegative(index);
                ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(index, table._count);
                var row = new object?[table.Columns.Length];
                var at = table._rows is null ? index : table._rows[index];
                for (var c = 0; c < row.Length; c++)
                {
                    row[c] = table._cells[c].Value.Cell(at);
                }

                return ImmutableArray.Create(row);
            }
        }

        public IEnumerator<ImmutableArray<object?>> GetEnumerator()
        {
            for (var i = 0; i < table._count; i++)
            {
                yield return this[i];
            }
        }

        IEnumerator IEnumerable.GetEnumerator() => GetEnumerator();
    }
}

/// <summary>One column of a table over its rows in view: position i is the i-th row in view.</summary>
internal readonly struct ColumnView(CellColumn cells, int[]? rows)
{
    public object? Cell(int row) => cells.Cell(At(row));

    public bool HasValue(int row) => cells.HasValue(At(row));

    public double? Number(int row) => cells.Number(At(row));

    public string? Text(int row) => cells.Text(At(row));

    public CellKey Key(int row) => cells.Key(At(row));

    public bool IsTrue(int row) => cells.IsTrue(At(row));

    public bool IsFalse(int row) => cells.IsFalse(At(row));

    private int At(int row) => rows is null ? row : rows[row];

    /// <summary>
    /// Every row's number in view order, NaN where the cell is empty (a plot's pass over 10^5-10^6 rows):
    /// from the files' number arrays directly where the column is held as numbers and the rows in view
    /// keep their table order (a filter's), else cell by cell.
    /// </summary>
    public double[] NumbersOrNaN()
    {
        var count = rows?.Length ?? cells.Length;
        var result = new double[count];
        var parts = cells switch
        {
            NumberCells n => [n],
            ConcatCells c when c.Parts.All(p => p is NumberCells or EmptyCells) => c.Parts,
            _ => default(System.Collections.Immutable.ImmutableArray<CellColumn>?),
        };
        if (parts is not { } held || (rows is { } r && !Increasing(r)))
        {
            for (var i = 0; i < count; i++)
            {
                result[i] = cells.Number(At(i)) ?? double.NaN;
            }

            return result;
        }

        // Walk the files' parts alongside the rows in view (both in table order).
        var k = 0;
        var start = 0;
        foreach (var part in held)
        {
            var end = start + part.Length;
            var numbers = part as NumberCells;
            for (; k < count && At(k) < end; k++)
            {
                var at = At(k) - start;
                result[k] = numbers is not null && numbers.Present[at] ? numbers.Values[at] : double.NaN;
            }

            start = end;
        }

        return result;
    }

    private static bool Increasing(int[] rows)
    {
        for (var i = 1; i < rows.Length; i++)
        {
            if (rows[i] <= rows[i - 1])
            {
                return false;
            }
        }

        return true;
    }
}
