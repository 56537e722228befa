using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// A harmonic many-body energy E = (1/2) kappa L^2 with L = sum_n g_n . u_n, a linear form in the
/// displacements of a few atoms (site, cell offset). Translation invariance is sum_n g_n = 0; then
/// the force constants Phi(m, n) = kappa g_m g_n^T become, pair by pair, blocks K_mn = -kappa g_m g_n^T
/// whose self-terms sum to kappa g_m g_m^T: the acoustic sum rule holds by construction. When L
/// vanishes for every infinitesimal rigid rotation (u_n = w x r_n), so does the energy: that is
/// how the bending terms keep rotational invariance.
/// </summary>
internal readonly record struct LinearFormTerm(double KappaNPerM, (int Site, IntVec3 Offset, Vec3 Gradient)[] Atoms)
{
    public void AddTo(CouplingAccumulator blocks)
    {
        for (var m = 0; m < Atoms.Length; m++)
        {
            for (var n = m + 1; n < Atoms.Length; n++)
            {
                var (sm, om, gm) = Atoms[m];
                var (sn, on, gn) = Atoms[n];
                var offset = new IntVec3(on.N1 - om.N1, on.N2 - om.N2, on.N3 - om.N3);
                blocks.Add(sm, sn, offset, Matrix3.Outer(gm, gn, -KappaNPerM));
            }
        }
    }

    /// <summary>L for the given displacements (m) of the atoms, in order: for tests of invariance.</summary>
    public double Evaluate(IReadOnlyList<Vec3> displacements)
    {
        var sum = 0.0;
        for (var n = 0; n < Atoms.Length; n++)
        {
            sum += Atoms[n].Gradient.Dot(displacements[n]);
        }

        return sum;
    }
}
