using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// One spring seen from site <see cref="I"/>: the partner <see cref="J"/> sits at
/// <see cref="SeparationM"/> = R + r_J - r_I, with spring tensor K (N/m). The dynamical matrix
/// gets -K e^{iq.d} / sqrt(m_I m_J) off the diagonal and +K on the I self-term, which makes the
/// acoustic sum rule hold by construction.
/// </summary>
internal readonly record struct PairCoupling(int I, int J, Vec3 SeparationM, Matrix3 SpringNPerM);
