using System.Collections;
using System.Collections.Immutable;
using System.Diagnostics.CodeAnalysis;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// A point's swept values keyed by column name, in ordinal column order: the column names are one
/// array shared by every point of a plan, the values one small array per point (the boxed values
/// themselves are the axes' own, shared too). A plan of a million points so keeps two references
/// and a two-value array per point instead of a sorted tree per point.
/// </summary>
public sealed class PointParameters : IReadOnlyDictionary<string, object>
{
    private readonly string[] _columns;
    private readonly object[] _values;

    public static PointParameters Empty { get; } = new([], []);

    /// <param name="columns">Column names in ordinal order (shared; not copied).</param>
    /// <param name="values">The value of each column, in the same order (owned by this instance).</param>
    internal PointParameters(string[] columns, object[] values)
    {
        _columns = columns;
        _values = values;
    }

    public static PointParameters From(IEnumerable<KeyValuePair<string, object>> parameters)
    {
        ArgumentNullException.ThrowIfNull(parameters);
        var sorted = parameters.OrderBy(p => p.Key, StringComparer.Ordinal).ToArray();
        return new([.. sorted.Select(p => p.Key)], [.. sorted.Select(p => p.Value)]);
    }

    public static implicit operator PointParameters(ImmutableSortedDictionary<string, object> parameters) => From(parameters);

    public object this[string key] => TryGetValue(key, out var v) ? v : throw new KeyNotFoundException($"no swept column '{key}'");

    public IEnumerable<string> Keys => _columns;

    public IEnumerable<object> Values => _values;

    public int Count => _columns.Length;

    /// <summary>A copy with <paramref name="column"/> set to <paramref name="value"/> (an existing column).</summary>
    internal PointParameters With(string column, object value)
    {
        var i = Array.BinarySearch(_columns, column, StringComparer.Ordinal);
        if (i < 0)
        {
            throw new KeyNotFoundException($"no swept column '{column}'");
        }

        var values = (object[])_values.Clone();
        values[i] = value;
        return new PointParameters(_columns, values);
    }

    /// <summary>The column names in ordinal order (the array shared by a plan's points).</summary>
    internal string[] Columns => _columns;

    /// <summary>The value of the <paramref name="i"/>-th column in ordinal column order.</summary>
    internal object ValueAt(int i) => _values[i];

    public bool ContainsKey(string key) => Array.BinarySearch(_columns, key, StringComparer.Ordinal) >= 0;

    public bool TryGetValue(string key, [MaybeNullWhen(false)] out object value)
    {
        var i = Array.BinarySearch(_columns, key, StringComparer.Ordinal);
        value = i >= 0 ? _values[i] : null;
        return i >= 0;
    }

    public IEnumerator<KeyValuePair<string, object>> GetEnumerator()
    {
        for (var i = 0; i < _columns.Length; i++)
        {
            yield return KeyValuePair.Create(_columns[i], _values[i]);
        }
    }

    IEnumerator IEnumerable.GetEnumerator() => GetEnumerator();
}
