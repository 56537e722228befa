using System.Collections.Immutable;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// Reads a points/ row's state and stability marks: unstable (its own state, or a row written
/// with <c>stable = false</c> by an engine from before that state), floppy (more zero modes than
/// rigid-body motions), done. Each mark is false where the table has no such column.
/// </summary>
internal sealed class PointFlags
{
    public const string StateColumn = "state";
    public const string StableColumn = "stable";
    public const string FloppyColumn = "floppy";
    public const string Done = "done";
    public const string Unstable = "unstable";

    private readonly int _state;
    private readonly int _stable;
    private readonly int _floppy;

    public PointFlags(ResultTable table)
    {
        ArgumentNullException.ThrowIfNull(table);
        _state = table.IndexOf(StateColumn);
        _stable = table.IndexOf(StableColumn);
        _floppy = table.IndexOf(FloppyColumn);
    }

    /// <summary>True when the table can tell floppy models apart (it has the column).</summary>
    public bool KnowsFloppy => _floppy >= 0;

    public string? State(ImmutableArray<object?> row) => _state >= 0 ? row[_state] as string : null;

    public bool IsDone(ImmutableArray<object?> row) => State(row) == Done;

    public bool IsUnstable(ImmutableArray<object?> row) => State(row) == Unstable || (_stable >= 0 && row[_stable] is false);

    public bool IsStable(ImmutableArray<object?> row) => !IsUnstable(row) && _stable >= 0 && row[_stable] is true;

    public bool IsFloppy(ImmutableArray<object?> row) => _floppy >= 0 && row[_floppy] is true;
}

/// <summary>
/// The marks of <see cref="PointFlags"/> read by position from a table's columns (no row boxed).
/// Each column is read when first asked; a table whose files' footers count no unstable (or no
/// floppy) row answers false for every row without reading state and stable (or floppy), and so
/// does every view of it (a filter's rows).
/// </summary>
internal sealed class ColumnFlags
{
    private readonly Lazy<ColumnView?> _state;
    private readonly Lazy<ColumnView?> _stable;
    private readonly Lazy<ColumnView?> _floppy;
    private readonly bool _noneUnstable;
    private readonly bool _noneFloppy;

    public ColumnFlags(ResultTable table)
    {
        ArgumentNullException.ThrowIfNull(table);
        _state = new(() => table.IndexOf(PointFlags.StateColumn) is var s and >= 0 ? table.Cells(s) : null);
        _stable = new(() => table.IndexOf(PointFlags.StableColumn) is var t and >= 0 ? table.Cells(t) : null);
        _floppy = new(() => table.IndexOf(PointFlags.FloppyColumn) is var f and >= 0 ? table.Cells(f) : null);
        KnowsFloppy = table.Has(PointFlags.FloppyColumn);
        // A view's rows are rows of its whole table: none unstable there, none in the view.
        if ((table.Summary ?? table.Whole?.Summary)?.Marks is { } marks)
        {
            var counts = StabilityCounts.FromMarks(table.Summary is null ? table.Whole! : table, marks);
            _noneUnstable = counts.Unstable == 0;
            _noneFloppy = counts.Floppy == 0;
        }
    }

    public bool KnowsFloppy { get; }

    public string? State(int row) => _state.Value?.Text(row);

    public bool IsDone(int row) => State(row) == PointFlags.Done;

    public bool IsUnstable(int row) => !_noneUnstable && (State(row) == PointFlags.Unstable || (_stable.Value?.IsFalse(row) ?? false));

    public bool IsStable(int row) => !IsUnstable(row) && (_stable.Value?.IsTrue(row) ?? false);

    public bool IsFloppy(int row) => !_noneFloppy && (_floppy.Value?.IsTrue(row) ?? false);
}

/// <summary>How many points of a sweep's points/ table are stable, unstable and floppy.</summary>
public sealed record StabilityCounts(long Rows, long Done, long Failed, long Unstable, long Floppy, bool KnowsFloppy)
{
    public static StabilityCounts Empty { get; } = new(0, 0, 0, 0, 0, false);

    internal static StabilityCounts Of(ResultTable points)
    {
        ArgumentNullException.ThrowIfNull(points);
        return TableFacts.Of(points, "stability counts", points =>
        {
            if (points.Summary?.Marks is { } marks)
            {
                return FromMarks(points, marks);
            }

            var flags = new ColumnFlags(points);
            long done = 0, failed = 0, unstable = 0, floppy = 0;
            for (var r = 0; r < points.Count; r++)
            {
                var isUnstable = flags.IsUnstable(r);
                done += flags.IsDone(r) && !isUnstable ? 1 : 0;
                failed += flags.State(r) == "failed" ? 1 : 0;
                unstable += isUnstable ? 1 : 0;
                floppy += flags.IsFloppy(r) ? 1 : 0;
            }

            return new StabilityCounts(points.Count, done, failed, unstable, floppy, flags.KnowsFloppy);
        });
    }

    /// <summary>The counts from the merged files' rows per state and flags, by the marks <see cref="ColumnFlags"/> reads (a column the table lacks reads as empty).</summary>
    internal static StabilityCounts FromMarks(ResultTable points, IEnumerable<TableSummary.Mark> marks)
    {
        ArgumentNullException.ThrowIfNull(points);
        ArgumentNullException.ThrowIfNull(marks);
        var hasState = points.Has(PointFlags.StateColumn);
        var hasStable = points.Has(PointFlags.StableColumn);
        var hasFloppy = points.Has(PointFlags.FloppyColumn);
        long done = 0, failed = 0, unstable = 0, floppy = 0;
        foreach (var m in marks)
        {
            var state = hasState ? m.State : null;
            var isUnstable = state == PointFlags.Unstable || (hasStable && m.Stable == false);
            done += state == PointFlags.Done && !isUnstable ? m.Rows : 0;
            failed += state == "failed" ? m.Rows : 0;
            unstable += isUnstable ? m.Rows : 0;
            floppy += hasFloppy && m.Floppy == true ? m.Rows : 0;
        }

        return new StabilityCounts(points.Count, done, failed, unstable, floppy, hasFloppy);
    }
}
