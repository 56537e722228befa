namespace LatticeSweep.Worker.Output;

/// <summary>
/// How much decoded table the merge (<see cref="StreamingMerge"/>) may hold at once: what the inputs
/// merged in one pass hold together, and the row group being written. Rows are costed by their column
/// types as the typed arrays hold them (<see cref="ColumnValues"/>), so the budget holds for wide
/// and narrow tables alike and does not depend on how many rows or files a table has. Inputs laid out
/// as the Worker writes them are merged by columns (an input holds its point ids and one column, the
/// output one column: <see cref="BytesHeldByColumns"/>, <see cref="FinalGroupRowsByColumns"/>); old
/// parts without a row-group index by rows (a row group of every column per input and for the output).
/// </summary>
/// <param name="InputBytes">decoded data of the inputs merged in one pass, together</param>
/// <param name="OutputGroupBytes">the row group being written (by columns: one column of it)</param>
internal sealed record MergeBudget(long InputBytes, long OutputGroupBytes)
{
    /// <summary>
    /// ~128 MiB of inputs and ~16 MiB of output. By columns a table of 10^6 points in parts of ~4,000 rows
    /// (the chunk planner's cap) merges in one pass holding a few tens of MB of decoded data (bench/README, round 16);
    /// by rows it took two passes and ~0.3-0.45 GB RSS for a points/ table of 150 columns.
    /// </summary>
    public static readonly MergeBudget Default = new(128L << 20, 16L << 20);

    /// <summary>
    /// Whether the merge checks <see cref="Queue.HeapCeiling"/> after each column written (a full collection once the
    /// heap has grown 16 MiB): what keeps a large table's merge flat (bench/README, round 20). <see cref="TableMerger"/>
    /// turns it off for a table whose inputs are small, where those collections only cost time (round 21).
    /// </summary>
    public bool WatchHeap { get; init; } = true;

    /// <summary>
    /// The most bytes of decoded columns a pass by columns keeps for input row groups that go on into the next output group,
    /// so that each is decoded once (<see cref="StreamingMerge"/>, round 27); a pass whose inputs' largest groups need more
    /// decodes such a group again for each output group, as before. 0: never kept (tests compare both ways).
    /// </summary>
    public long CarriedBytes { get; init; } = 32L << 20;

    /// <summary>Bytes a row takes decoded: a nullable number 16 (8 for int, 2 for bool), a text ~64 (reference, header, a short id or label).</summary>
    public static long BytesPerRow(IReadOnlyList<ColumnDef> columns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        return Math.Max(1, columns.Sum(c => CellBytes(c.Type)));
    }

    /// <summary>Bytes one cell of a column of this type takes decoded (see <see cref="BytesPerRow"/>).</summary>
    public static long CellBytes(ColumnType type) => type switch
    {
        ColumnType.Text => 64,
        ColumnType.Int32 => 8,
        ColumnType.Bool => 2,
        _ => 16,
    };

    /// <summary>Bytes one point id takes while a merge by columns picks the order: its 8-byte key (<see cref="MergeIds"/>; an id that is not one keeps its text besides).</summary>
    public const long HeldIdBytes = 16;

    /// <summary>
    /// What one input holds in a merge by columns (<see cref="StreamingMerge"/>): the point ids of one of its
    /// row groups beside its open file (a 4 KiB read buffer and its footer, ~1 KiB per column chunk). Its columns
    /// are decoded one source at a time into buffers the pass shares, and the ids of row groups it has
    /// moved past are kept only until the output group is written (at most that group's rows in all, so
    /// they count with the output: <see cref="FinalGroupRowsByColumns"/>).
    /// </summary>
    public static long BytesHeldByColumns(long rowsHeld, IReadOnlyList<ColumnDef> columns, int rowGroups)
    {
        ArgumentNullException.ThrowIfNull(columns);
        return (rowsHeld * HeldIdBytes) + (1L << 12) + (1024L * columns.Count * Math.Max(1, rowGroups));
    }

    private static long WidestCell(IReadOnlyList<ColumnDef> columns) => columns.Count == 0 ? 1 : columns.Max(c => CellBytes(c.Type));

    /// <summary>Rows per row group of a merged file of these columns: what fits <see cref="OutputGroupBytes"/>, at most <see cref="MergedLayout.RowGroupRows"/>.</summary>
    public int FinalGroupRowsFor(IReadOnlyList<ColumnDef> columns) =>
        (int)Math.Clamp(OutputGroupBytes / BytesPerRow(columns), 1, MergedLayout.RowGroupRows);

    /// <summary>Rows per row group of an intermediate run: small enough that 16 runs fit a pass.</summary>
    public int RunGroupRowsFor(IReadOnlyList<ColumnDef> columns) =>
        (int)Math.Clamp(InputBytes / 16 / BytesPerRow(columns), 1, MergedLayout.RowGroupRows);

    /// <summary>
    /// Rows per row group of a merged file written by columns: one column of the group fits <see cref="OutputGroupBytes"/>
    /// (and the point ids of input row groups the merge has moved past while picking it, at most as much again), at most <see cref="MergedLayout.RowGroupRows"/>.
    /// </summary>
    public int FinalGroupRowsByColumns(IReadOnlyList<ColumnDef> columns) =>
        (int)Math.Clamp(OutputGroupBytes / WidestCell(columns), 1, MergedLayout.RowGroupRows);

    /// <summary>Rows per row group of an intermediate run written by columns: small enough that 16 runs fit a pass.</summary>
    public int RunGroupRowsByColumns(IReadOnlyList<ColumnDef> columns) =>
        (int)Math.Clamp(InputBytes / 16 / (CellBytes(ColumnType.Text) + (2 * WidestCell(columns))), 1, MergedLayout.RowGroupRows);
}
