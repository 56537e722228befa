namespace LatticeSweep.Worker.Planning;

/// <summary>
/// One point of a sweep: its stable id (a hash of its canonical parameters), its position in the
/// plan, and the value of every swept parameter keyed by the parameter's column name. Values are
/// double, long, string or bool.
/// </summary>
public sealed record PlannedPoint(string PointId, int Index, PointParameters Parameters);
