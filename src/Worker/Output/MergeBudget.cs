namespace LatticeSweep.Worker.Output;

/// <summary>
/// How much decoded table the merge (<see cref="StreamingMerge"/>) may hold at once: the inputs'
/// current row groups together, and the row group being written. Rows are costed by their column
/// types as the typed arrays hold them (<see cref="ColumnValues"/>), so the budget holds for wide
/// and narrow tables alike and does not depend on how many rows or files a table has.
/// </summary>
/// <param name="InputBytes">decoded row groups of the inputs merged in one pass, together</param>
/// <param name="OutputGroupBytes">one row group being written</param>
internal sealed record MergeBudget(long InputBytes, long OutputGroupBytes)
{
    /// <summary>
    /// ~128 MiB of inputs and ~16 MiB of output: a merge's peak (~0.3-0.45 GB RSS for a points/ table
    /// of 150 columns, bench/README) stays near a run's peak while solving; a table of 10^6 points in
    /// parts of ~4,000 (the chunk planner's cap) needs two passes. Twice this took ~0.5-0.8 GB and ~20 % less CPU.
    /// </summary>
    public static readonly MergeBudget Default = new(128L << 20, 16L << 20);

    /// <summary>Bytes a row takes decoded: a nullable number 16 (8 for int, 2 for bool), a text ~64 (reference, header, a short id or label).</summary>
    public static long BytesPerRow(IReadOnlyList<ColumnDef> columns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        long bytes = 0;
        foreach (var column in columns)
        {
            bytes += column.Type switch
            {
                ColumnType.Text => 64,
                ColumnType.Int32 => 8,
                ColumnType.Bool => 2,
                _ => 16,
            };
        }

        return Math.Max(1, bytes);
    }

    /// <summary>Rows per row group of a merged file of these columns: what fits <see cref="OutputGroupBytes"/>, at most <see cref="MergedLayout.RowGroupRows"/>.</summary>
    public int FinalGroupRowsFor(IReadOnlyList<ColumnDef> columns) =>
        (int)Math.Clamp(OutputGroupBytes / BytesPerRow(columns), 1, MergedLayout.RowGroupRows);

    /// <summary>Rows per row group of an intermediate run: small enough that 16 runs fit a pass.</summary>
    public int RunGroupRowsFor(IReadOnlyList<ColumnDef> columns) =>
        (int)Math.Clamp(InputBytes / 16 / BytesPerRow(columns), 1, MergedLayout.RowGroupRows);
}
