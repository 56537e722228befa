namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// One column's cells as a typed array (no boxed cell kept): numbers as doubles with a presence
/// mask and the column's own type remembered, text as strings, flags and times as nullable
/// values. <see cref="Cell"/> boxes one cell on demand, as the row reader gave it (a float as a
/// double, a time as a <see cref="DateTimeOffset"/> in UTC).
/// </summary>
internal abstract class CellColumn
{
    protected CellColumn(int length)
    {
        Length = length;
    }

    public int Length { get; }

    /// <summary>The cell as a boxed value (null when empty).</summary>
    public abstract object? Cell(int row);

    public abstract bool HasValue(int row);

    /// <summary>The cell as a double; null when empty or not a number.</summary>
    public virtual double? Number(int row) => ResultTable.ToDouble(Cell(row));

    /// <summary>The cell's text when the column holds text; else null.</summary>
    public virtual string? Text(int row) => Cell(row) as string;

    /// <summary>An equality key of the cell that does not allocate for numbers and flags (same cells, same key).</summary>
    public virtual CellKey Key(int row) => CellKey.Of(Cell(row));

    /// <summary>True when the cell is the boolean true.</summary>
    public virtual bool IsTrue(int row) => Cell(row) is true;

    /// <summary>True when the cell is the boolean false.</summary>
    public virtual bool IsFalse(int row) => Cell(row) is false;
}

/// <summary>A value used to compare cells for equality: number bits, a flag or text; empty cells share one key.</summary>
internal readonly record struct CellKey(byte Kind, long Bits, string? Text)
{
    public static readonly CellKey Empty = new(0, 0, null);

    public static CellKey Of(object? value) => value switch
    {
        null => Empty,
        string s => new(1, 0, s),
        double d => new(2, BitConverter.DoubleToInt64Bits(d), null),
        float f => new(2, BitConverter.DoubleToInt64Bits(f), null),
        int n => new(3, n, null),
        long n => new(3, n, null),
        bool b => new(4, b ? 1 : 0, null),
        DateTimeOffset t => new(5, t.UtcTicks, null),
        _ => new(6, 0, value.ToString()),
    };
}

/// <summary>Cells kept boxed (a table built from rows: small tables and tests).</summary>
internal sealed class BoxedCells(object?[] cells) : CellColumn(cells.Length)
{
    public override object? Cell(int row) => cells[row];

    public override bool HasValue(int row) => cells[row] is not null;
}

/// <summary>A column a file does not have: every cell empty.</summary>
internal sealed class EmptyCells(int length) : CellColumn(length)
{
    public override object? Cell(int row) => null;

    public override bool HasValue(int row) => false;

    public override double? Number(int row) => null;

    public override CellKey Key(int row) => CellKey.Empty;
}

/// <summary>Numbers (double, int or long in the file) as doubles with a presence mask; boxed back to their own type.</summary>
internal sealed class NumberCells(double[] values, bool[] present, Type type) : CellColumn(values.Length)
{
    internal double[] Values => values;

    internal bool[] Present => present;

    internal Type Type => type;

    public override object? Cell(int row) =>
        !present[row] ? null : type == typeof(int) ? (object)(int)values[row] : type == typeof(long) ? (object)(long)values[row] : (object)values[row];

    public override bool HasValue(int row) => present[row];

    public override double? Number(int row) => present[row] ? values[row] : null;

    public override CellKey Key(int row) =>
        !present[row] ? CellKey.Empty : type == typeof(int) || type == typeof(long) ? new(3, (long)values[row], null) : new(2, BitConverter.DoubleToInt64Bits(values[row]), null);
}

/// <summary>64-bit integers kept exactly (a double cannot hold every long).</summary>
internal sealed class LongCells(long?[] values) : CellColumn(values.Length)
{
    public override object? Cell(int row) => values[row] is { } v ? v : null;

    public override bool HasValue(int row) => values[row].HasValue;

    public override double? Number(int row) => values[row];

    public override CellKey Key(int row) => values[row] is { } v ? new(3, v, null) : CellKey.Empty;
}

internal sealed class TextCells(string?[] values) : CellColumn(values.Length)
{
    public override object? Cell(int row) => values[row];

    public override bool HasValue(int row) => values[row] is not null;

    public override double? Number(int row) => null;

    public override string? Text(int row) => values[row];

    public override CellKey Key(int row) => values[row] is { } s ? new(1, 0, s) : CellKey.Empty;
}

internal sealed class FlagCells(bool?[] values) : CellColumn(values.Length)
{
    private static readonly object True = true;
    private static readonly object False = false;

    public override object? Cell(int row) => values[row] switch { true => True, false => False, null => null };

    public override bool HasValue(int row) => values[row].HasValue;

    public override double? Number(int row) => null;

    public override CellKey Key(int row) => values[row] is { } b ? new(4, b ? 1 : 0, null) : CellKey.Empty;

    public override bool IsTrue(int row) => values[row] == true;

    public override bool IsFalse(int row) => values[row] == false;
}

internal sealed class TimeCells(DateTimeOffset?[] values) : CellColumn(values.Length)
{
    public override object? Cell(int row) => values[row];

    public override bool HasValue(int row) => values[row].HasValue;

    public override double? Number(int row) => null;
}

/// <summary>The columns of several files one after the other (a dataset of many files), each file's part as read.</summary>
internal sealed class ConcatCells : CellColumn
{
    private readonly CellColumn[] _parts;
    private readonly int[] _starts;

    public ConcatCells(CellColumn[] parts)
        : base(parts.Sum(p => p.Length))
    {
        _parts = parts;
        Parts = [.. parts];
        _starts = new int[parts.Length];
        for (int i = 1; i < parts.Length; i++)
        {
            _starts[i] = _starts[i - 1] + parts[i - 1].Length;
        }
    }

    /// <summary>The files' parts in row order.</summary>
    public System.Collections.Immutable.ImmutableArray<CellColumn> Parts { get; }

    public override object? Cell(int row) => Find(row, out var r).Cell(r);

    public override bool HasValue(int row) => Find(row, out var r).HasValue(r);

    public override double? Number(int row) => Find(row, out var r).Number(r);

    public override string? Text(int row) => Find(row, out var r).Text(r);

    public override CellKey Key(int row) => Find(row, out var r).Key(r);

    public override bool IsTrue(int row) => Find(row, out var r).IsTrue(r);

    public override bool IsFalse(int row) => Find(row, out var r).IsFalse(r);

    private CellColumn Find(int row, out int inPart)
    {
        var i = Array.BinarySearch(_starts, row);
        if (i < 0)
        {
            i = ~i - 1;
        }

        // Skip empty parts that share a start with the next one.
        while (i + 1 < _starts.Length && _starts[i + 1] == row && _parts[i].Length == 0)
        {
            i++;
        }

        while (i < _parts.Length && row - _starts[i] >= _parts[i].Length)
        {
            i++;
        }

        inPart = row - _starts[i];
        return _parts[i];
    }
}
