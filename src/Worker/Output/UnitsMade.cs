using System.Text.Json;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// The units JSON of the column lists a process wrote files of (<see cref="ParquetPartWriter.UnitsKey"/>), kept for the
/// next file of the same columns. A list is the same when its columns are equal one by one (name, type, unit,
/// description); a process writes a handful of tables, so a few recent lists are kept and an older one is made again.
/// </summary>
internal static class UnitsMade
{
    /// <summary>Column lists kept at most (a sweep has up to ~10 tables; more sweeps in one process make their lists again).</summary>
    internal const int ListsKept = 16;

    private static readonly object Gate = new();
    private static readonly List<(ColumnDef[] Columns, string Json)> Recent = [];

    /// <summary>The units JSON of <paramref name="columns"/>: a JSON object from each column's name to its unit, in column order.</summary>
    public static string Of(IReadOnlyList<ColumnDef> columns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        lock (Gate)
        {
            foreach (var (kept, json) in Recent)
            {
                if (Same(kept, columns))
                {
                    return json;
                }
            }
        }

        var made = JsonSerializer.Serialize(columns.ToDictionary(c => c.Name, c => c.Unit));
        lock (Gate)
        {
            if (Recent.Count >= ListsKept)
            {
                Recent.RemoveAt(0);
            }

            Recent.Add(([.. columns], made));
        }

        return made;
    }

    private static bool Same(ColumnDef[] kept, IReadOnlyList<ColumnDef> columns)
    {
        if (kept.Length != columns.Count)
        {
            return false;
        }

        for (var i = 0; i < kept.Length; i++)
        {
            if (!ReferenceEquals(kept[i], columns[i]) && !kept[i].Equals(columns[i]))
            {
                return false;
            }
        }

        return true;
    }
}
