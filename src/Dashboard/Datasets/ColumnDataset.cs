using System.Collections.Immutable;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// Several files of one table as one <see cref="ResultTable"/>: the union of their columns in
/// first-seen order (a unit from whichever file has one), rows file after file, each column
/// joined from the files' own columns when first needed. A key seen in two files (a chunk re-run
/// after its rows were merged) keeps only its first row, so the files go newest first.
/// </summary>
internal static class ColumnDataset
{
    public static ResultTable Of(IReadOnlyList<ParquetColumnFile> files, string keyColumn)
    {
        var columns = new List<ResultColumn>();
        var index = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var c in files.SelectMany(f => f.Columns))
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

        // Where each file holds each dataset column (-1: not at all).
        var at = files.Select(f => columns.Select(c => f.Columns.IndexOf(f.Columns.FirstOrDefault(x => x.Name == c.Name)!)).ToArray()).ToArray();
        CellColumn Load(int c)
        {
            var parts = new CellColumn[files.Count];
            // The files' shares are read side by side (each file reads with its own reader): a merged
            // table of 10^6 rows is ~3 files, and a first load reads a dozen whole columns of each.
            Parallel.For(0, files.Count, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, i =>
                parts[i] = at[i][c] >= 0 ? files[i].Column(at[i][c]) : new EmptyCells(files[i].RowCount));
            return parts.Length == 1 ? parts[0] : new ConcatCells(parts);
        }

        bool? Filled(int c)
        {
            var said = files.Select((f, i) => at[i][c] >= 0 ? f.Filled(at[i][c]) : false).ToList();
            return said.Any(x => x == true) ? true : said.All(x => x == false) ? false : null;
        }

        // A few rows of a column (a page): each file reads only the row groups holding its share of them.
        var starts = new int[files.Count];
        for (var i = 1; i < files.Count; i++)
        {
            starts[i] = starts[i - 1] + files[i - 1].RowCount;
        }

        object?[][] Peek(int[] wanted, int[] rows)
        {
            var cells = wanted.Select(_ => new object?[rows.Length]).ToArray();
            for (var i = 0; i < files.Count; i++)
            {
                var mine = Enumerable.Range(0, rows.Length).Where(k => rows[k] >= starts[i] && rows[k] < starts[i] + files[i].RowCount).ToArray();
                var present = Enumerable.Range(0, wanted.Length).Where(w => at[i][wanted[w]] >= 0).ToArray();
                if (mine.Length == 0 || present.Length == 0)
                {
                    continue;
                }

                var read = files[i].CellsAt([.. present.Select(w => at[i][wanted[w]])], [.. mine.Select(k => rows[k] - starts[i])]);
                for (var w = 0; w < present.Length; w++)
                {
                    for (var k = 0; k < mine.Length; k++)
                    {
                        cells[present[w]][mine[k]] = read[w][k];
                    }
                }
            }

            return cells;
        }

        // A text column at a few rows (a plot's drawn ids): each file makes strings of its share of them only.
        string?[] Texts(int column, int[] rows)
        {
            var texts = new string?[rows.Length];
            for (var i = 0; i < files.Count; i++)
            {
                var mine = Enumerable.Range(0, rows.Length).Where(k => rows[k] >= starts[i] && rows[k] < starts[i] + files[i].RowCount).ToArray();
                if (mine.Length == 0 || at[i][column] < 0)
                {
                    continue;
                }

                var read = files[i].TextsAt(at[i][column], [.. mine.Select(k => rows[k] - starts[i])]);
                for (var k = 0; k < mine.Length; k++)
                {
                    texts[mine[k]] = read[k];
                }
            }

            return texts;
        }

        // A key's rows from the files' row-group indexes (null: a file has none, so every key is read).
        var keyAt = columns.FindIndex(c => c.Name == keyColumn);
        int[]? Find(int column, string value)
        {
            if (column != keyAt)
            {
                return null;
            }

            var found = new List<int>();
            for (var i = 0; i < files.Count; i++)
            {
                if (at[i][column] < 0)
                {
                    continue;
                }

                if (files[i].RowsWithId(at[i][column], value) is not { } rows)
                {
                    return null;
                }

                found.AddRange(rows.Select(r => r + starts[i]));
            }

            return [.. found];
        }

        var summary = TableSummary.Concat([.. files.Select(f => f.Summary)], columns);
        var key = columns.FindIndex(c => c.Name == keyColumn);
        var apart = files.Count < 2 || key < 0 || ChunksApart(files);
        // Rows found by key only where no key is dropped as a repeat (else the view below decides which row stays).
        var table = new ResultTable([.. columns], files.Sum(f => f.RowCount), Load, Filled, summary, Peek, apart ? Find : null, Texts);
        if (apart)
        {
            // One file holds each key once (a part, or a merged file); files of different chunks share no point.
            return table;
        }

        var ids = table.Cells(key);
        var seen = new HashSet<string>(StringComparer.Ordinal);
        return table.Where(r => ids.Text(r) is not { } id || seen.Add(id));
    }

    /// <summary>
    /// True when every file names its chunks and no chunk is named twice: a point belongs to one
    /// chunk, so no point is then in two files and the table needs no pass over every id (a chunk
    /// re-run after its rows were merged names its chunk again, and is then found the long way).
    /// </summary>
    private static bool ChunksApart(IReadOnlyList<ParquetColumnFile> files)
    {
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var file in files)
        {
            if (file.Chunks is not { } chunks || chunks.IsEmpty)
            {
                return false;
            }

            foreach (var chunk in chunks)
            {
                if (!seen.Add(chunk))
                {
                    return false;
                }
            }
        }

        return true;
    }
}
