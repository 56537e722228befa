using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>
/// Where the thermal waves reach just past the q = 0 cell, one sample per neighbouring cell could not
/// follow the kinetic integrand: a diatomic chain's kappa was 7.4e-2 low at 1 K on mesh 64 and 0.10 low
/// at 5 K on mesh 16. The hand-over (<see cref="LongWaveHandover"/>) makes it mesh-independent.
/// </summary>
public class LongWaveHandoverTests
{
    /// <summary>
    /// Own reference: the chain's closed-form dispersion omega^2 = K s -+ K sqrt(s^2 - 4 sin^2(qa/2) / (m1 m2)),
    /// s = 1/m1 + 1/m2 (Kittel, Introduction to Solid State Physics, ch. 4), with analytic d omega / dq, and
    /// kappa = (tau / (a A)) times the zone mean of C v^2 (Ziman, Electrons and Phonons, ch. 8), by composite
    /// Gauss-Legendre quadrature (NumPy, 48 and 32 nodes per panel agree to 1e-8). Measured within 2.6e-6 on
    /// meshes 16, 64 and 256 (before the hand-over: -7.4e-2 at 1 K on 64, -0.10 at 5 K on 16).
    /// </summary>
    [Theory]
    [InlineData(16)]
    [InlineData(64)]
    [InlineData(256)]
    public void Diatomic_chain_kappa_is_the_zone_integral_on_every_mesh_at_low_temperature(int mesh)
    {
        (double T, double Kappa)[] reference = [(0.3, 1.7620372378e-01), (1, 5.8732348403e-01), (2, 1.1744938119e+00), (5, 2.9335319562e+00), (10, 5.8472721597e+00), (30, 1.6615226809e+01)];
        var chain = CrystalModel.Create(
            Lattice.Chain(0.5),
            [new Site("A", "A", Vec3.Zero, 12), new Site("B", "B", new Vec3(0.5, 0, 0), 31)],
            [new ShellSpring("A", "B", 1, 22)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);
        var result = Kappa.Compute(chain, BulkSample.Uniform(1, mesh),
            new ConductivityOptions { Constant = new ConstantScattering(5), CrossSectionNm2 = 0.1 }, [.. reference.Select(r => r.T)]);
        foreach (var (row, (t, kappa)) in result.ByTemperature.Zip(reference))
        {
            Approx.Equal(kappa, row.KappaWPerMK, 2e-5, $"kappa at {t} K, mesh {mesh}");
        }
    }
}
