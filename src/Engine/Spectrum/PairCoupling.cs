using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// One spring seen from site <see cref="I"/>: the partner <see cref="J"/> sits at
/// <see cref="SeparationM"/> = R + r_J - r_I, with block K (N/m), so that the force constant is
/// Phi(I, J+R) = -K. The dynamical matrix gets -K e^{iq.d} / sqrt(m_I m_J) off the diagonal and
/// +K on the I self-term, which makes the acoustic sum rule hold by construction. K is symmetric
/// for pair springs but not for three-body (bond-bending) terms: the reverse coupling (J, I, -d)
/// always carries K^T, so anything that assembles force constants from couplings must take each
/// block as given for its direction, never assume K = K^T.
/// </summary>
internal readonly record struct PairCoupling(int I, int J, Vec3 SeparationM, Matrix3 SpringNPerM);
