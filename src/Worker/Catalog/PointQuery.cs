namespace LatticeSweep.Worker.Catalog;

/// <summary>Which points of a sweep to list: optionally one state, a page of them in plan order.</summary>
/// <param name="Error">With <paramref name="Kind"/>: only the failed points of this failure group (its whole error text), whatever <paramref name="State"/> says.</param>
public sealed record PointQuery(PointState? State = null, int Offset = 0, int Limit = 1000, string? Error = null, FailureKind? Kind = null);
