using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Spectrum;

/// <summary>
/// The long-wave rays along a branch that stiffens: a chain with a folded angle bend, m w_T^2 = 4 T sin^2(phi/2) +
/// 8 k (1 - cos phi)^2 (3 + 2 cos phi) across it (derived in FoldedBendChainLowTemperatureTests; own derivation, common
/// practice, no source), the q^4 term equal to the q^2 one at phi = 0.1. The ray ends at phi = 0.6, short of where the
/// transverse branch overtakes the longitudinal one (0.7), so the sorted branches are smooth on it. Main fitted
/// omega / rho, c sqrt(1 + 100 phi^2) here, by a quintic in rho^2 and was off by up to several per cent.
/// </summary>
public class StiffeningRayTests
{
    private const double ANm = 0.3, MassAmu = 20, L = 10, T = 0.2, K = 2, PhiEnd = 0.6;

    private static double Transverse(double phi)
    {
        var c = Math.Cos(phi);
        var stiffness = (4 * T * Math.Pow(Math.Sin(phi / 2), 2)) + (8 * K * (1 - c) * (1 - c) * (3 + (2 * c)));
        return Math.Sqrt(stiffness / (MassAmu * PhysicalConstants.AtomicMassKg));
    }

    [Fact]
    public void Rays_follow_a_stiffening_transverse_branch_and_its_group_velocity()
    {
        var model = CrystalModel.Create(
            Lattice.Chain(ANm),
            [new Site("A", "A", Vec3.Zero, MassAmu)],
            [new ShellSpring("A", "A", 1, L, T)],
            bends: [new BendSpring("A", "A", 1, BendForm.Angle, K) { OtherShell = 2 }]);
        var solver = new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model)));
        var a = ANm * 1e-9;
        var ray = new CellRay(new Vec3(PhiEnd / a, 0, 0), 1, 0, 0, 0);
        var rays = RayDispersion.Measure(solver, new GroupVelocities(solver), ray, 1e-3 * 2 * Math.PI / a, fractions: false);
        foreach (var rho in Enumerable.Range(1, 40).Select(i => i / 40.0))
        {
            var phi = rho * PhiEnd;
            var h = 1e-5 * phi;
            var velocity = (Transverse(phi + h) - Transverse(phi - h)) / (2 * h / a);
            for (var k = 0; k < 2; k++)
            {
                Approx.Equal(Transverse(phi), rays.Omega(k, rho), 1e-6, $"omega of transverse branch {k} at rho {rho}");
                Approx.Equal(velocity, rays.Velocity(k, rho).X, 1e-5, $"group velocity of transverse branch {k} at rho {rho}");
            }
        }
    }
}
