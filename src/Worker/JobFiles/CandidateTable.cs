using System.Collections.Immutable;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// A candidates file read into memory: column names and rows of raw cells (strings from CSV;
/// numbers or strings from Parquet). <see cref="RowLines"/> gives each row's line in a CSV file
/// (or its 1-based row number in a Parquet file) for error messages.
/// </summary>
internal sealed record CandidateTable(
    string File,
    ImmutableArray<string> Columns,
    ImmutableArray<ImmutableArray<object?>> Rows,
    ImmutableArray<int> RowLines,
    string ContentHash)
{
    public int ColumnIndex(string name) => Columns.IndexOf(name, StringComparer.Ordinal);
}
