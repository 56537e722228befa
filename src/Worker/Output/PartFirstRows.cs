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
        if (Start(rows.Columns, rows.RowCount, c => rows.Values[c]) is not { } page)
        {
            return null;
        }

        for (var c = 0; c < rows.Columns.Count; c++)
        {
            page.Add(c, rows.Values[c]);
        }

        return page.Json();
    }

    /// <summary>
    /// The entry of a part written a column at a time (<see cref="ParquetPartWriter"/>): the first rows are picked from the
    /// plan column (<paramref name="column"/> is asked for it alone), then each column given to <see cref="Page.Add"/> in
    /// the table's order adds its cells; null when the table has no plan index.
    /// </summary>
    public static Page? Start(IReadOnlyList<ColumnDef> columns, int rowCount, Func<int, Array> column)
    {
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentNullException.ThrowIfNull(column);
        var plan = -1;
        for (var c = 0; c < columns.Count; c++)
        {
            if (columns[c].Name == FirstLoadFacts.PlanColumn)
            {
                plan = c;
            }
        }

        return plan < 0 ? null : new Page(columns, rowCount, column(plan));
    }

    /// <summary>The first rows of one part in plan order, and the cells of the columns given so far.</summary>
    internal sealed class Page
    {
        private readonly IReadOnlyList<ColumnDef> _columns;
        private readonly int _rowCount;
        private readonly int[] _first;
        private readonly long[] _indexes;
        private readonly HashSet<string> _wanted;
        private readonly Dictionary<string, object?[]> _cells = new(StringComparer.Ordinal);

        internal Page(IReadOnlyList<ColumnDef> columns, int rowCount, Array planValues)
        {
            _columns = columns;
            _rowCount = rowCount;
            long? IndexAt(int row) => planValues switch
            {
                long?[] l => l[row],
                int?[] i => i[row],
                _ => null,
            };

            // Rows with a plan index, by index then row (the table's plan order: an empty index sorts last, ties keep table order).
            _first = Enumerable.Range(0, rowCount).Where(r => IndexAt(r) is not null).OrderBy(r => IndexAt(r)!.Value).ThenBy(r => r)
                .Take(FirstLoadFacts.PageRowsKept).ToArray();
            _indexes = _first.Select(r => IndexAt(r)!.Value).ToArray();
            _wanted = new[] { MergedLayout.PointIdColumn, "state", "stable", "floppy" }.Concat(FirstLoadFacts.TableColumns).Append(FirstLoadFacts.ConductivityColumn)
                .Concat(columns.Where(c => c.Description.StartsWith(FirstLoadFacts.SweptPrefix, StringComparison.Ordinal)).Select(c => c.Name))
                .Distinct(StringComparer.Ordinal).ToHashSet(StringComparer.Ordinal);
        }

        /// <summary>Takes the first rows' cells of column <paramref name="c"/> when the page shows it.</summary>
        public void Add(int c, Array values)
        {
            if (!_wanted.Contains(_columns[c].Name))
            {
                return;
            }

            var cells = _first.Select(r => values switch
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
                _cells[_columns[c].Name] = cells;
            }
        }

        /// <summary>The footer entry, from the columns added (in the table's order).</summary>
        public string Json()
        {
            using var buffer = new MemoryStream();
            using (var json = new Utf8JsonWriter(buffer))
            {
                json.WriteStartObject();
                json.WriteNumber("rows", _rowCount);
                json.WriteStartArray("point_index");
                foreach (var index in _indexes)
                {
                    json.WriteNumberValue(index);
                }

                json.WriteEndArray();
                FirstLoadFacts.WritePage(json, _first, _cells);
                json.WriteEndObject();
            }

            return System.Text.Encoding.UTF8.GetString(buffer.ToArray());
        }
    }
}
