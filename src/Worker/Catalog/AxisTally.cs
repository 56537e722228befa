using System.Text;
using System.Text.Json;

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

    public AxisTally(IReadOnlySet<string> columns)
    {
        _columns = columns;
    }

    /// <summary>The swept columns counted (besides <see cref="AllPoints"/>).</summary>
    public IReadOnlySet<string> Columns => _columns;

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
                var value = Encoding.UTF8.GetString(bytes, start, (int)r.BytesConsumed - start);
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
                Add(column, ValueText(value), state, n);
            }
        }
    }

    /// <summary>The same points, all in <paramref name="state"/> (a chunk claimed, re-queued or cancelled whole).</summary>
    public AxisTally AllIn(string state) => Moved(_ => state);

    /// <summary>The same points, each moved from its state to <paramref name="next"/> of it.</summary>
    public AxisTally Moved(Func<string, string> next)
    {
        ArgumentNullException.ThrowIfNull(next);
        var moved = new AxisTally(_columns);
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
