namespace LatticeSweep.Worker.Catalog;

/// <summary>Where one point is. Stored as the lower-case name.</summary>
public enum PointState
{
    Waiting,
    Running,
    Done,
    Failed,
    Cancelled,
}
