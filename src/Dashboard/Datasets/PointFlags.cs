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

/// <summary>How many points of a sweep's points/ table are stable, unstable and floppy.</summary>
public sealed record StabilityCounts(long Rows, long Done, long Failed, long Unstable, long Floppy, bool KnowsFloppy)
{
    public static StabilityCounts Empty { get; } = new(0, 0, 0, 0, 0, false);

    internal static StabilityCounts Of(ResultTable points)
    {
        var flags = new PointFlags(points);
        return new StabilityCounts(
            points.Rows.Length,
            points.Rows.LongCount(r => flags.IsDone(r) && !flags.IsUnstable(r)),
            points.Rows.LongCount(r => flags.State(r) == "failed"),
            points.Rows.LongCount(flags.IsUnstable),
            points.Rows.LongCount(flags.IsFloppy),
            flags.KnowsFloppy);
    }
}
