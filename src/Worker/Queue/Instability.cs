using System.Globalization;
using LatticeSweep.Engine.Results;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The one-line description of an unstable model that the catalog keeps for <c>status</c> and the
/// dashboard (the numbers themselves are in the point's <c>points/</c> row).
/// </summary>
public static class Instability
{
    public static string Describe(PointSummary summary) => $"unstable model: {Where(summary)} (no thermal numbers)";

    /// <summary>"most negative frequency -13.53 THz at reduced wave vector (0.5, 0, 0)".</summary>
    public static string Where(PointSummary summary)
    {
        ArgumentNullException.ThrowIfNull(summary);
        var q = summary.WorstQReduced is { } w
            ? string.Create(CultureInfo.InvariantCulture, $" at reduced wave vector ({w.X:G4}, {w.Y:G4}, {w.Z:G4})")
            : "";
        return string.Create(CultureInfo.InvariantCulture, $"most negative frequency {summary.MinFrequencyThz:G4} THz{q}");
    }
}
