namespace LatticeSweep.Worker.Commands;

/// <summary>
/// The one line that <c>run</c>, <c>resume</c>, <c>work</c> and <c>solve</c> close with: their numbers come from a
/// harmonic ball-and-spring model and are screening estimates, not design values (README, Cautions).
/// </summary>
internal static class EstimateNote
{
    public const string Line = "Model estimates (harmonic ball-and-spring screening): check them against measurements before design decisions; see README, Cautions.";
}
