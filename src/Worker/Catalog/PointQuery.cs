namespace LatticeSweep.Worker.Catalog;

/// <summary>Which points of a sweep to list: optionally one state, a page of them in plan order.</summary>
public sealed record PointQuery(PointState? State = null, int Offset = 0, int Limit = 1000);
