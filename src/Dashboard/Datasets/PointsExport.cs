using System.Collections.Immutable;
using System.Globalization;
using System.Text;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// The filtered points table as a file: CSV with each column's unit in its header
/// (<c>cv_j_per_mol_k [J/(mol K)]</c>; plain names when asked), or Parquet with the column types
/// of the dataset and the units in the file's metadata (<c>latticesweep.units</c>, as the
/// dataset's own files), plus the sweep id and the filter that chose the rows. Every column of
/// points/ is written, not only those on screen. An undefined number is an empty cell.
/// </summary>
internal static class PointsExport
{
    public const string SweepKey = "latticesweep.sweep_id";
    public const string FilterKey = "latticesweep.filter";

    /// <summary>The CSV text: a header row, then one row per point; RFC 4180 quoting, invariant numbers (round-trip precision), UTC times.</summary>
    public static string Csv(ResultTable rows, ColumnCatalog names, bool unitsInHeader)
    {
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(names);
        var sb = new StringBuilder();
        sb.AppendJoin(',', rows.Columns.Select(c => Quote(unitsInHeader && names.RawUnit(c) is { Length: > 0 } u && u != "1" ? $"{c.Name} [{u}]" : c.Name))).Append('\n');
        foreach (var row in rows.Rows)
        {
            sb.AppendJoin(',', row.Select(Cell)).Append('\n');
        }

        return sb.ToString();
    }

    /// <summary>The Parquet file's bytes, written by the Worker's own table writer.</summary>
    public static async Task<byte[]> ParquetAsync(ResultTable rows, ColumnCatalog names, IReadOnlyDictionary<string, string> metadata, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(names);
        var defs = rows.Columns.Select(c => new ColumnDef(c.Name, TypeOf(c), names.RawUnit(c), names.Label(c.Name))).ToList();
        // Column by column into the Worker's typed arrays (a NaN from an old dataset written as empty).
        var values = defs.Select((d, c) => ColumnValues.As(d, Enumerable.Range(0, rows.Count).Select(r => rows.Cell(r, c) is var v && v is double.NaN ? null : v).ToArray())).ToList();
        using var stream = new MemoryStream();
        await ParquetPartWriter.WriteParquetAsync(stream, new TableRows(TableNames.Points, defs, rows.Rows.Length, values), metadata, ct).ConfigureAwait(false);
        return stream.ToArray();
    }

    private static ColumnType TypeOf(ResultColumn c) => c.ClrType switch
    {
        var t when t == typeof(double) || t == typeof(float) => ColumnType.Double,
        var t when t == typeof(int) => ColumnType.Int32,
        var t when t == typeof(long) => ColumnType.Int64,
        var t when t == typeof(bool) => ColumnType.Bool,
        var t when t == typeof(DateTime) || t == typeof(DateTimeOffset) => ColumnType.Timestamp,
        _ => ColumnType.Text,
    };

    private static string Cell(object? value) => value switch
    {
        null => "",
        double d when double.IsNaN(d) => "",
        double d => d.ToString("R", CultureInfo.InvariantCulture),
        float f => ((double)f).ToString("R", CultureInfo.InvariantCulture),
        bool b => b ? "true" : "false",
        DateTimeOffset t => t.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", CultureInfo.InvariantCulture),
        IFormattable x => x.ToString(null, CultureInfo.InvariantCulture),
        _ => Quote(value.ToString() ?? ""),
    };

    private static string Quote(string text) =>
        text.AsSpan().IndexOfAny(",\"\r\n") >= 0 || (text.Length > 0 && (char.IsWhiteSpace(text[0]) || char.IsWhiteSpace(text[^1])))
            ? "\"" + text.Replace("\"", "\"\"", StringComparison.Ordinal) + "\""
            : text;
}
