namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Points per swept column and value object, counted while a sweep's chunk texts are written at
/// submit (the parameters are at hand there; their texts are made once per distinct value after).
/// </summary>
internal sealed class SweptValueCounts(IReadOnlySet<string> columns)
{
    private readonly Dictionary<(string Column, object Value), long> _counts = [];

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
                var key = (column, value);
                _counts[key] = _counts.GetValueOrDefault(key) + 1;
            }
        }
    }
}
