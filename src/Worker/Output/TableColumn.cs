namespace LatticeSweep.Worker.Output;

/// <summary>A column and how to take its value from one row's source.</summary>
internal sealed record TableColumn<TRow>(ColumnDef Def, Func<TRow, object?> Get);

/// <summary>A result table: its name (the folder) and its columns in order.</summary>
internal sealed record TableSpec<TRow>(string Name, IReadOnlyList<TableColumn<TRow>> Columns)
{
    public IReadOnlyList<ColumnDef> Defs => Columns.Select(c => c.Def).ToList();

    public TableRows Rows(IEnumerable<TRow> sources)
    {
        var rows = new List<object?[]>();
        foreach (var source in sources)
        {
            var row = new object?[Columns.Count];
            for (var i = 0; i < row.Length; i++)
            {
                row[i] = Columns[i].Get(source);
            }

            rows.Add(row);
        }

        return new TableRows(Name, Defs, rows);
    }
}

/// <summary>The rows of one table for one chunk, ready to write.</summary>
internal sealed record TableRows(string Table, IReadOnlyList<ColumnDef> Columns, IReadOnlyList<object?[]> Rows);
