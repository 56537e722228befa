using System.Globalization;
using System.Text.Json;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// A points/ file's facts per column, worked out while the merge (or the Worker, for a chunk's part)
/// writes its rows and kept in the file's own metadata (<see cref="Key"/>), so a reader of a large table (the dashboard's first
/// page) learns them from the footer instead of a scan of every row, and they can never describe
/// other rows than the file's. Per column: the cells with a value, for numbers the finite ones with
/// their least and greatest, and the first <see cref="DistinctKept"/> distinct values in row order
/// (with whether more follow). Timestamps get counts only. Beside the columns, the rows per
/// combination of <c>state</c>, <c>stable</c> and <c>floppy</c> (<see cref="MarksKept"/> at most),
/// from which a reader counts done, failed, unstable and floppy points without reading them.
/// </summary>
internal sealed class ColumnSummary
{
    public const string Key = "latticesweep.column_summary";

    /// <summary>Distinct values kept per column: past this many the list says only that more follow.</summary>
    public const int DistinctKept = 64;

    /// <summary>Combinations of the state and the two flags counted: past this many the summary has none (a reader then scans).</summary>
    public const int MarksKept = 64;

    private readonly IReadOnlyList<ColumnDef> _columns;
    private readonly Column[] _stats;
    private readonly int _state;
    private readonly int _stable;
    private readonly int _floppy;
    private readonly Dictionary<(string? State, bool? Stable, bool? Floppy), long> _marks = [];
    private bool _marksOver;
    private long _rows;

    public ColumnSummary(IReadOnlyList<ColumnDef> columns)
    {
        _columns = columns;
        _stats = [.. columns.Select(_ => new Column())];
        int Find(string name, ColumnType type) => columns.Select((c, i) => (c, i)).FirstOrDefault(x => x.c.Name == name && x.c.Type == type, (null!, -1)).Item2;
        _state = Find("state", ColumnType.Text);
        _stable = Find("stable", ColumnType.Bool);
        _floppy = Find("floppy", ColumnType.Bool);
    }

    /// <summary>The summary of a table's rows (a part's: <see cref="ChunkOutputWriter"/>).</summary>
    public static ColumnSummary Of(TableRows rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var summary = new ColumnSummary(rows.Columns);
        summary.Add(rows.Values, rows.RowCount);
        return summary;
    }

    /// <summary>Adds one row group's cells (typed arrays, <see cref="ColumnValues"/>).</summary>
    public void Add(IReadOnlyList<Array> values, int rows)
    {
        ArgumentNullException.ThrowIfNull(values);
        AddRows(rows);
        AddMarks(MarkColumn(values, _state), MarkColumn(values, _stable), MarkColumn(values, _floppy), rows);
        for (var c = 0; c < _columns.Count; c++)
        {
            AddColumn(c, values[c], rows);
        }
    }

    /// <summary>
    /// A row group given one column at a time (the merge writes it so): <see cref="AddRows"/> once, <see cref="AddColumn"/>
    /// per column, and <see cref="AddMarks"/> with the columns <see cref="IsMarkColumn"/> names, the same facts as <see cref="Add"/>.
    /// </summary>
    public void AddRows(int rows) => _rows += rows;

    /// <summary>Whether column <paramref name="c"/> is one of the state and the two flags <see cref="AddMarks"/> takes, and which (0, 1, 2; -1 for none).</summary>
    public int IsMarkColumn(int c) => c == _state ? 0 : c == _stable ? 1 : c == _floppy ? 2 : -1;

    private static Array? MarkColumn(IReadOnlyList<Array> values, int c) => c >= 0 ? values[c] : null;

    /// <summary>Adds one row group's cells of column <paramref name="c"/>.</summary>
    public void AddColumn(int c, Array values, int rows)
    {
        var s = _stats[c];
        switch (values)
        {
            case string?[] text:
                for (var i = 0; i < rows; i++)
                {
                    if (text[i] is { } t)
                    {
                        s.Count++;
                        s.See(t);
                    }
                }

                break;
            case double?[] d:
                for (var i = 0; i < rows; i++)
                {
                    if (d[i] is { } v)
                    {
                        s.Count++;
                        s.Number(v);
                        s.See(v);
                    }
                }

                break;
            case int?[] n:
                for (var i = 0; i < rows; i++)
                {
                    if (n[i] is { } v)
                    {
                        s.Count++;
                        s.Number(v);
                        s.See(v);
                    }
                }

                break;
            case long?[] l:
                for (var i = 0; i < rows; i++)
                {
                    if (l[i] is { } v)
                    {
                        s.Count++;
                        s.Number(v);
                        s.See(v);
                    }
                }

                break;
            case bool?[] b:
                for (var i = 0; i < rows; i++)
                {
                    if (b[i] is { } v)
                    {
                        s.Count++;
                        s.See(v);
                    }
                }

                break;
            case DateTime?[] t:
                s.More = true;
                for (var i = 0; i < rows; i++)
                {
                    s.Count += t[i] is null ? 0 : 1;
                }

                break;
        }
    }

    /// <summary>Counts one row group's combinations of state and the two flags (each column null when the table has none).</summary>
    public void AddMarks(Array? stateColumn, Array? stableColumn, Array? floppyColumn, int rows)
    {
        if (_marksOver)
        {
            return;
        }

        var state = stateColumn as string?[];
        var stable = stableColumn as bool?[];
        var floppy = floppyColumn as bool?[];
        for (var i = 0; i < rows; i++)
        {
            var key = (state?[i], stable?[i], floppy?[i]);
            if (_marks.TryGetValue(key, out var n))
            {
                _marks[key] = n + 1;
            }
            else if (_marks.Count < MarksKept)
            {
                _marks[key] = 1;
            }
            else
            {
                _marksOver = true;
                _marks.Clear();
                return;
            }
        }
    }

    /// <summary>The summary as the JSON kept in the file's metadata.</summary>
    public string ToJson()
    {
        using var buffer = new MemoryStream();
        using (var json = new Utf8JsonWriter(buffer))
        {
            json.WriteStartObject();
            json.WriteNumber("rows", _rows);
            json.WriteStartObject("columns");
            for (var c = 0; c < _columns.Count; c++)
            {
                var s = _stats[c];
                json.WriteStartObject(_columns[c].Name);
                json.WriteNumber("count", s.Count);
                if (_columns[c].Type is ColumnType.Double or ColumnType.Int32 or ColumnType.Int64)
                {
                    json.WriteNumber("finite", s.Finite);
                    if (s.Finite > 0)
                    {
                        json.WriteNumber("min", s.Min);
                        json.WriteNumber("max", s.Max);
                    }
                }

                json.WriteStartArray("distinct");
                foreach (var v in s.Values)
                {
                    switch (v)
                    {
                        case string t: json.WriteStringValue(t); break;
                        case double d when double.IsFinite(d): json.WriteNumberValue(d); break;
                        case double d: json.WriteStringValue(d.ToString("R", CultureInfo.InvariantCulture)); break;
                        case int n: json.WriteNumberValue(n); break;
                        case long n: json.WriteNumberValue(n); break;
                        case bool b: json.WriteBooleanValue(b); break;
                    }
                }

                json.WriteEndArray();
                json.WriteBoolean("more", s.More);
                json.WriteEndObject();
            }

            json.WriteEndObject();
            if (!_marksOver)
            {
                // [state, stable, floppy, rows]; null where the cell is empty or the table has no such column.
                json.WriteStartArray("marks");
                foreach (var ((state, stable, floppy), n) in _marks.OrderByDescending(m => m.Value))
                {
                    json.WriteStartArray();
                    json.WriteStringValue(state);
                    WriteFlag(json, stable);
                    WriteFlag(json, floppy);
                    json.WriteNumberValue(n);
                    json.WriteEndArray();
                }

                json.WriteEndArray();
            }

            json.WriteEndObject();
        }

        return System.Text.Encoding.UTF8.GetString(buffer.ToArray());
    }

    private static void WriteFlag(Utf8JsonWriter json, bool? flag)
    {
        if (flag is { } f)
        {
            json.WriteBooleanValue(f);
        }
        else
        {
            json.WriteNullValue();
        }
    }

    private sealed class Column
    {
        private readonly HashSet<long> _seenBits = [];
        private readonly HashSet<string> _seenText = new(StringComparer.Ordinal);
        private long _lastBits;
        private string? _lastText;
        private bool _hasLast;

        public long Count { get; set; }

        public long Finite { get; private set; }

        public double Min { get; private set; } = double.PositiveInfinity;

        public double Max { get; private set; } = double.NegativeInfinity;

        public List<object> Values { get; } = [];

        public bool More { get; set; }

        public void Number(double v)
        {
            if (double.IsFinite(v))
            {
                Finite++;
                Min = Math.Min(Min, v);
                Max = Math.Max(Max, v);
            }
        }

        // Numbers are told apart by their bits (as the dashboard's cell keys do); the last value
        // is checked first, so a constant column costs no lookup and a column past the list none.
        public void See(double v) => SeeBits(BitConverter.DoubleToInt64Bits(v), v);

        public void See(int v) => SeeBits(v, v);

        public void See(long v) => SeeBits(v, v);

        public void See(bool v) => SeeBits(v ? 1 : 0, v);

        public void See(string v)
        {
            if (More || (_hasLast && string.Equals(v, _lastText, StringComparison.Ordinal)) || _seenText.Contains(v))
            {
                return;
            }

            _hasLast = true;
            _lastText = v;
            if (Full())
            {
                return;
            }

            _seenText.Add(v);
            Values.Add(v);
        }

        private void SeeBits<T>(long bits, T value)
            where T : notnull
        {
            if (More || (_hasLast && bits == _lastBits))
            {
                return;
            }

            _hasLast = true;
            _lastBits = bits;
            if (_seenBits.Contains(bits) || Full())
            {
                return;
            }

            _seenBits.Add(bits);
            Values.Add(value);
        }

        private bool Full()
        {
            if (Values.Count < DistinctKept)
            {
                return false;
            }

            More = true;
            _seenBits.Clear();
            _seenText.Clear();
            return true;
        }
    }
}
