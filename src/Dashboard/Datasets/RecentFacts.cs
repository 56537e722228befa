using System.Runtime.CompilerServices;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// A few facts of a whole table kept across requests, the most recently used first: what a filtered
/// view's plots were (a view object lives for one request, so <see cref="TableFacts"/> on it would
/// keep nothing). At most <see cref="Kept"/> per table; they go with the table object, which
/// <see cref="ResultStore"/> replaces when one of its files changes, so a fact never outlives the
/// rows it was worked out from.
/// </summary>
internal static class RecentFacts
{
    /// <summary>Facts kept per table: a reader paging through a filter or two, not every filter ever asked for.</summary>
    public const int Kept = 8;

    private static readonly ConditionalWeakTable<ResultTable, Recent> Tables = new();

    /// <summary>The fact named <paramref name="key"/> of <paramref name="table"/>, worked out by <paramref name="work"/> unless one of the last <see cref="Kept"/> asked for.</summary>
    public static T Of<T>(ResultTable table, string key, Func<T> work)
        where T : notnull
    {
        ArgumentNullException.ThrowIfNull(table);
        ArgumentNullException.ThrowIfNull(work);
        var recent = Tables.GetValue(table, _ => new Recent());
        if (recent.TryGet(key, out var known))
        {
            return (T)known;
        }

        // Worked out outside the lock: two requests for the same new fact may both work, one result is kept.
        var made = work();
        recent.Add(key, made);
        return made;
    }

    /// <summary>Whether the fact is kept now (a request decides whether to read ahead for it).</summary>
    public static bool Has(ResultTable table, string key) =>
        Tables.TryGetValue(table, out var recent) && recent.TryGet(key, out _);

    private sealed class Recent
    {
        private readonly LinkedList<(string Key, object Value)> _order = new();
        private readonly Dictionary<string, LinkedListNode<(string Key, object Value)>> _at = new(StringComparer.Ordinal);
        private readonly Lock _lock = new();

        public bool TryGet(string key, out object value)
        {
            lock (_lock)
            {
                if (_at.TryGetValue(key, out var node))
                {
                    _order.Remove(node);
                    _order.AddFirst(node);
                    value = node.Value.Value;
                    return true;
                }
            }

            value = null!;
            return false;
        }

        public void Add(string key, object value)
        {
            lock (_lock)
            {
                if (_at.TryGetValue(key, out var old))
                {
                    _order.Remove(old);
                }

                _at[key] = _order.AddFirst((key, value));
                while (_order.Count > Kept)
                {
                    _at.Remove(_order.Last!.Value.Key);
                    _order.RemoveLast();
                }
            }
        }
    }
}
