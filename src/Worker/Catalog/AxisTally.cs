using System.Text;
using System.Text.Json;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Points counted per (swept column, value, state), the value as its JSON text in the point's
/// parameters (<see cref="CatalogJson.WriteValue"/>): what one write adds to or takes from
/// <c>latsweep_axis_counts</c>, running points counted as waiting. The column <see cref="AllPoints"/> counts every point per state, so a
/// reader can tell whether the table still agrees with the sweep's counts.
/// </summary>
internal sealed class AxisTally
{
    /// <summary>The column (and value) under which every point is counted once per state.</summary>
    public const string AllPoints = "";

    private readonly IReadOnlySet<string> _columns;
    private readonly IReadOnlyDictionary<string, BinKeys> _bins;

    public AxisTally(IReadOnlySet<string> columns)
        : this(columns, new Dictionary<string, BinKeys>(StringComparer.Ordinal))
    {
    }

    private AxisTally(IReadOnlySet<string> columns, IReadOnlyDictionary<string, BinKeys> bins)
    {
        _columns = columns;
        _bins = bins;
    }

    /// <summary>
    /// A tally of <paramref name="axes"/>: an axis of listed values counted per value, a drawn one per
    /// bin of its interval (<see cref="AxisBins"/>; the count row's value is the bin's lower edge).
    /// </summary>
    public static AxisTally For(IEnumerable<AxisInfo> axes)
    {
        var list = axes.ToList();
        var bins = new Dictionary<string, BinKeys>(StringComparer.Ordinal);
        foreach (var axis in list)
        {
            if (AxisBins.Of(axis) is { } b)
            {
                bins[axis.ColumnName] = new BinKeys(b);
            }
        }

        return new AxisTally(new HashSet<string>(list.Select(a => a.ColumnName), StringComparer.Ordinal), bins);
    }

    /// <summary>A tally of the same columns (and bins) with nothing counted.</summary>
    public AxisTally Empty() => new(_columns, _bins);

    /// <summary>The swept columns counted (besides <see cref="AllPoints"/>).</summary>
    public IReadOnlySet<string> Columns => _columns;

    /// <summary>The bins of a drawn axis's column, null for a column counted per value.</summary>
    public AxisBins? BinsOf(string column) => _bins.GetValueOrDefault(column)?.Bins;

    public Dictionary<(string Column, string Value, string State), long> Counts { get; } = [];

    /// <summary>Counts one point in <paramref name="state"/> by its parameters' JSON object text (a null value is not counted, as coverage never showed it).</summary>
    public void AddParameters(string parametersJson, string state) => AddParameters(parametersJson, state, null, null);

    /// <summary>
    /// The same, and the same point in <paramref name="alsoState"/> in <paramref name="also"/> (a point
    /// before and after a change) from one reading of its text; <paramref name="also"/> counts the same columns.
    /// </summary>
    public void AddParameters(string parametersJson, string state, AxisTally? also, string? alsoState)
    {
        Add(AllPoints, AllPoints, state, 1);
        also?.Add(AllPoints, AllPoints, alsoState!, 1);
        if (_columns.Count == 0)
        {
            return;
        }

        var bytes = Encoding.UTF8.GetBytes(parametersJson);
        var r = new Utf8JsonReader(bytes);
        if (!r.Read() || r.TokenType != JsonTokenType.StartObject)
        {
            return;
        }

        while (r.Read() && r.TokenType == JsonTokenType.PropertyName)
        {
            var name = r.GetString()!;
            r.Read();
            var start = (int)r.TokenStartIndex;
            if (r.TokenType is JsonTokenType.StartObject or JsonTokenType.StartArray)
            {
                r.Skip();
            }

            if (r.TokenType != JsonTokenType.Null && _columns.Contains(name))
            {
                var value = _bins.TryGetValue(name, out var bins)
                    ? bins.KeyOf(NumberOf(ref r))
                    : Encoding.UTF8.GetString(bytes, start, (int)r.BytesConsumed - start);
                Add(name, value, state, 1);
                also?.Add(name, value, alsoState!, 1);
            }
        }
    }

    /// <summary>Counts points by value objects already at hand (at submit): <paramref name="values"/> per column, value and number of points.</summary>
    public void AddValues(IEnumerable<KeyValuePair<(string Column, object Value), long>> values, long points, string state)
    {
        Add(AllPoints, AllPoints, state, points);
        foreach (var ((column, value), n) in values)
        {
            if (_columns.Contains(column))
            {
                Add(column, _bins.TryGetValue(column, out var bins) ? bins.KeyOf(bins.Bins.IndexOf(value)) : ValueText(value), state, n);
            }
        }
    }

    /// <summary>The number a parameter's JSON token holds (a number, or a number written as text); NaN otherwise.</summary>
    private static double NumberOf(ref Utf8JsonReader r) => r.TokenType switch
    {
        JsonTokenType.Number => r.GetDouble(),
        JsonTokenType.String when double.TryParse(r.GetString(), System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out var d) => d,
        _ => double.NaN,
    };

    /// <summary>A drawn axis's bins and each bin's key text (its lower edge as a value's JSON text), made once per tally.</summary>
    private sealed class BinKeys(AxisBins bins)
    {
        private readonly string[] _texts = [.. Enumerable.Range(0, bins.Count).Select(k => ValueText(bins.Lower(k)))];

        public AxisBins Bins => bins;

        public string KeyOf(int bin) => _texts[bin];

        public string KeyOf(double value) => _texts[bins.IndexOf(value)];
    }

    /// <summary>The same points, all in <paramref name="state"/> (a chunk claimed, re-queued or cancelled whole).</summary>
    public AxisTally AllIn(string state) => Moved(_ => state);

    /// <summary>The same points, each moved from its state to <paramref name="next"/> of it.</summary>
    public AxisTally Moved(Func<string, string> next)
    {
        ArgumentNullException.ThrowIfNull(next);
        var moved = Empty();
        foreach (var ((column, value, state), n) in Counts)
        {
            moved.Add(column, value, next(state), n);
        }

        return moved;
    }

    /// <summary>Whether points in <paramref name="state"/> are still to do (waiting or running): counted together, as coverage shows them, so a claim changes no count.</summary>
    public static bool IsPending(string state) => state == Waiting || state == Running;

    private static readonly string Waiting = SqlSweepCatalog.Text(PointState.Waiting);
    private static readonly string Running = SqlSweepCatalog.Text(PointState.Running);

    public void Add(string column, string value, string state, long n)
    {
        if (n != 0)
        {
            var key = (column, value, IsPending(state) ? Waiting : state);
            Counts[key] = Counts.GetValueOrDefault(key) + n;
        }
    }

    /// <summary>Per key, <paramref name="after"/> minus <paramref name="before"/>, without the keys that did not change.</summary>
    public static List<((string Column, string Value, string State) Key, long Change)> Change(AxisTally before, AxisTally after)
    {
        var changes = new List<((string, string, string), long)>();
        foreach (var (key, n) in after.Counts)
        {
            var change = n - before.Counts.GetValueOrDefault(key);
            if (change != 0)
            {
                changes.Add((key, change));
            }
        }

        foreach (var (key, n) in before.Counts)
        {
            if (!after.Counts.ContainsKey(key) && n != 0)
            {
                changes.Add((key, -n));
            }
        }

        return changes;
    }

    [ThreadStatic]
    private static System.Buffers.ArrayBufferWriter<byte>? _buffer;

    /// <summary>A value's JSON text as the point's parameters hold it.</summary>
    public static string ValueText(object value)
    {
        var buffer = _buffer ??= new System.Buffers.ArrayBufferWriter<byte>(64);
        buffer.ResetWrittenCount();
        using (var w = new Utf8JsonWriter(buffer))
        {
            CatalogJson.WriteValue(w, value);
        }

        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }
}
