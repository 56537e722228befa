namespace LatticeSweep.Worker.Catalog;

/// <summary>Where one point is. Stored as the lower-case name.</summary>
public enum PointState
{
    Waiting,
    Running,
    Done,
    Failed,
    Cancelled,

    /// <summary>
    /// Solved, and the model is unstable (a negative eigenvalue beyond round-off). Terminal and with
    /// results, like done: its <c>points/</c> row says <c>stable = false</c> with the worst wave
    /// vector and the most negative frequency, and every number that means nothing for it is empty.
    /// <c>resume</c> does not run it again.
    /// </summary>
    Unstable,
}
