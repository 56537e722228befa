using System.Collections.Immutable;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>Joins the tables of several part files into one: the union of their columns, rows in file order.</summary>
internal static class ResultTableConcat
{
    public static ResultTable Of(IReadOnlyList<ResultTable> tables)
    {
        if (tables.Count == 0)
        {
            return ResultTable.Empty;
        }

        if (tables.Count == 1)
        {
            return tables[0];
        }

        var columns = new List<ResultColumn>();
        var index = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var c in tables.SelectMany(t => t.Columns))
        {
            if (index.TryAdd(c.Name, columns.Count))
            {
                columns.Add(c);
            }
            else if (columns[index[c.Name]].Unit.Length == 0 && c.Unit.Length > 0)
            {
                columns[index[c.Name]] = columns[index[c.Name]] with { Unit = c.Unit };
            }
        }

        var rows = ImmutableArray.CreateBuilder<ImmutableArray<object?>>();
        foreach (var t in tables)
        {
            var map = t.Columns.Select(c => index[c.Name]).ToArray();
            foreach (var r in t.Rows)
            {
                var row = new object?[columns.Count];
                for (var i = 0; i < map.Length; i++)
                {
                    row[map[i]] = r[i];
                }

                rows.Add([.. row]);
            }
        }

        return new ResultTable([.. columns], rows.ToImmutable());
    }
}
