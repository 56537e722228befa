using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Points per swept column and value object, counted while a sweep's chunk texts are written at
/// submit (the parameters are at hand there; their texts are made once per distinct value after).
/// </summary>
internal sealed class SweptValueCounts(IReadOnlySet<string> columns, IReadOnlyDictionary<string, AxisBins>? bins = null)
{
    private readonly Dictionary<(string Column, object Value), long> _counts = [];

    // A drawn axis is counted per bin (its lower edge as the value): one entry per bin, not per point.
    private readonly Dictionary<string, (AxisBins Bins, object[] Lower)> _bins = (bins ?? new Dictionary<string, AxisBins>())
        .ToDictionary(e => e.Key, e => (e.Value, Enumerable.Range(0, e.Value.Count).Select(e.Value.Lower).ToArray()), StringComparer.Ordinal);

    /// <summary>Counts of the swept columns of <paramref name="axes"/>, a drawn axis per bin.</summary>
    public static SweptValueCounts For(IEnumerable<AxisInfo> axes)
    {
        var list = axes.ToList();
        return new(new HashSet<string>(list.Select(a => a.ColumnName), StringComparer.Ordinal),
            list.Where(a => a.Drawn is not null).ToDictionary(a => a.ColumnName, a => AxisBins.Of(a)!, StringComparer.Ordinal));
    }

    public IReadOnlySet<string> Columns => columns;

    public IEnumerable<KeyValuePair<(string Column, object Value), long>> Counts => _counts;

    public void Add(IReadOnlyDictionary<string, object> parameters)
    {
        if (columns.Count == 0)
        {
            return;
        }

        foreach (var (column, value) in parameters)
        {
            if (value is not null && columns.Contains(column))
            {
                var key = (column, _bins.TryGetValue(column, out var b) ? b.Lower[b.Bins.IndexOf(value)] : value);
                _counts[key] = _counts.GetValueOrDefault(key) + 1;
            }
        }
    }
}
