using System.Collections.Concurrent;
using System.Runtime.CompilerServices;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// Facts worked out from a whole table (which columns have values, how many values a column
/// takes, which parameters the others determine), kept as long as that table object lives. The
/// points/ table is cached by <see cref="ResultStore"/> until one of its files changes, so each
/// fact costs one scan per change instead of several per request (a full scan of 10^6 rows takes
/// seconds).
/// </summary>
internal static class TableFacts
{
    private static readonly ConditionalWeakTable<ResultTable, ConcurrentDictionary<string, object>> Facts = new();

    /// <summary>The fact named <paramref name="key"/> of <paramref name="table"/>, worked out by <paramref name="work"/> the first time.</summary>
    public static T Of<T>(ResultTable table, string key, Func<ResultTable, T> work)
        where T : notnull =>
        (T)Facts.GetValue(table, _ => new ConcurrentDictionary<string, object>(StringComparer.Ordinal)).GetOrAdd(key, _ => work(table));

    /// <summary>Whether the fact is known already (a page decides whether to answer before working it out).</summary>
    public static bool Has(ResultTable table, string key) =>
        Facts.TryGetValue(table, out var facts) && facts.ContainsKey(key);
}
