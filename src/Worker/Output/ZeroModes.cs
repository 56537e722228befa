using LatticeSweep.Engine.Results;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// The zero-frequency modes a solve left out of its thermal sums, as the tables and commands report
/// them: every one of them (the rigid translations at q = 0 and any other), and whether there are
/// more than the rigid ones, which makes the model floppy (some motion meets no spring at some
/// wave vectors, e.g. central springs only on a simple cubic lattice).
/// </summary>
internal static class ZeroModes
{
    /// <summary>Every zero-frequency mode left out: the rigid translations plus the others.</summary>
    public static long Total(PointSummary s) => s.RigidModesExcluded + s.ZeroModesExcluded;

    /// <summary>More zero modes than rigid-body modes.</summary>
    public static bool Floppy(PointSummary s) => s.ZeroModesExcluded > 0;
}
