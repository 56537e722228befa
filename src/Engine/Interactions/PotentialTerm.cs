namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// A pair potential acting between every site of kind <see cref="KindA"/> and every site of kind
/// <see cref="KindB"/> closer than <see cref="CutoffNm"/>. With <see cref="ShiftAtCutoff"/> the
/// energy is phi(r) - phi(r_c), so it is continuous as neighbours cross the cutoff (the springs,
/// which are derivatives, do not change).
/// </summary>
public sealed record PotentialTerm(string KindA, string KindB, PairPotential Potential, double CutoffNm, bool ShiftAtCutoff = true);
