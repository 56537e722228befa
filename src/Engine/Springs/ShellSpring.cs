namespace LatticeSweep.Engine.Springs;

/// <summary>
/// Springs to every neighbour of one shell between two site kinds. Shells are the distinct
/// distances from a site of <see cref="KindA"/> to sites of <see cref="KindB"/>, nearest first
/// (shell 1), grouped within the model's shell tolerance.
/// </summary>
/// <param name="LongitudinalNPerM">Constant along the bond (central force), N/m.</param>
/// <param name="TransverseNPerM">Constant across the bond, N/m (0 for purely central springs).</param>
public sealed record ShellSpring(string KindA, string KindB, int Shell, double LongitudinalNPerM, double TransverseNPerM = 0.0);
