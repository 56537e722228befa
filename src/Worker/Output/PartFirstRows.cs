using System.Text.Json;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// A points/ part's first rows in plan order (least <c>point_index</c> first, ties in row order), at
/// most <see cref="FirstLoadFacts.PageRowsKept"/>, with their plan indexes and the cells of the
/// columns the dashboard's default first page reads (the id, the marks, the default summary columns,
/// conductivity, every swept parameter), kept in the part's footer under <see cref="Key"/>. A running
/// sweep's whole table in plan order starts with the least of the parts' first rows, so the page
/// picks its first 100 rows and their cells from the footers instead of reading and sorting the plan
/// index of every row and then each shown column's row groups in every part. Written with the part, so
/// it describes exactly its rows; a reader without it (or one it cannot use) reads the rows.
/// </summary>
internal static class PartFirstRows
{
    public const string Key = "latticesweep.first_rows";

    /// <summary>The entry of a points/ part's rows; null when the table has no plan index.</summary>
    public static string? Json(TableRows rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var plan = -1;
        for (var c = 0; c < rows.Columns.Count; c++)
        {
            if (rows.Columns[c].Name == FirstLoadFacts.PlanColumn)
            {
                plan = c;
            }
        }

        if (plan < 0)
        {
            return null;
        }

        long? IndexAt(int row) => rows.Values[plan] switch
        {
            long?[] l => l[row],
            int?[] i => i[row],
            _ => null,
        };

        // Rows with a plan index, by index then row (the table's plan order: an empty index sorts last, ties keep table order).
        var first = Enumerable.Range(0, rows.RowCount).Where(r => IndexAt(r) is not null).OrderBy(r => IndexAt(r)!.Value).ThenBy(r => r)
            .Take(FirstLoadFacts.PageRowsKept).ToArray();
        var wanted = new[] { MergedLayout.PointIdColumn, "state", "stable", "floppy" }.Concat(FirstLoadFacts.TableColumns).Append(FirstLoadFacts.ConductivityColumn)
            .Concat(rows.Columns.Where(c => c.Description.StartsWith(FirstLoadFacts.SweptPrefix, StringComparison.Ordinal)).Select(c => c.Name))
            .Distinct(StringComparer.Ordinal).ToHashSet(StringComparer.Ordinal);
        var page = new Dictionary<string, object?[]>(StringComparer.Ordinal);
        for (var c = 0; c < rows.Columns.Count; c++)
        {
            if (!wanted.Contains(rows.Columns[c].Name))
            {
                continue;
            }

            var values = rows.Values[c];
            var cells = first.Select(r => values switch
            {
                string?[] s => s[r],
                double?[] d => d[r],
                int?[] i => i[r],
                long?[] l => l[r],
                bool?[] b => b[r],
                _ => (object?)null,
            }).ToArray();
            // Times are left out, as a number JSON cannot hold (the page then reads those cells).
            if (values is not DateTime?[] && !cells.Any(x => x is double d && !double.IsFinite(d)))
            {
                page[rows.Columns[c].Name] = cells;
            }
        }

        using var buffer = new MemoryStream();
        using (var json = new Utf8JsonWriter(buffer))
        {
            json.WriteStartObject();
            json.WriteNumber("rows", rows.RowCount);
            json.WriteStartArray("point_index");
            foreach (var r in first)
            {
                json.WriteNumberValue(IndexAt(r)!.Value);
            }

            json.WriteEndArray();
            FirstLoadFacts.WritePage(json, first, page);
            json.WriteEndObject();
        }

        return System.Text.Encoding.UTF8.GetString(buffer.ToArray());
    }
}
