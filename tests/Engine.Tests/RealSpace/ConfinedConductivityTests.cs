using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>Conductivity of films and wires from their confined modes, against the separable closed form.</summary>
public sealed class ConfinedConductivityTests
{
    [Fact]
    public void A_scalar_simple_cubic_film_conducts_in_plane_as_its_separable_modes_say()
    {
        // Periodic x, y (N1, N2), free z (N3): omega^2 = w0^2 [4 sin^2(kx a/2) + 4 sin^2(ky a/2) + 4 sin^2(c pi/2N3)],
        // v_x = w0^2 a sin(kx a) / omega (exact, separable); kappa_xx = (1/V) sum C(omega) v_x^2 tau with a
        // constant tau (Ziman, Electrons and Phonons, ch. 8).
        var (n1, n2, n3) = (6, 5, 4);
        const double tauPs = 2.0;
        var options = new SolveOptions
        {
            TemperaturesK = [20, 300],
            ReferenceTemperatureK = 300,
            Conductivity = new ConductivityOptions { Constant = new ConstantScattering(tauPs) },
        };
        var result = PhononSolver.Solve(Crystals.ScalarSimpleCubic(), RealSpaceSample.Box(n1, n2, n3, Boundary.Periodic, Boundary.Periodic, Boundary.Free), options);
        var confined = result.ConfinedConductivity!;
        Assert.Equal("in the a1-a2 plane", confined.Directions);

        var a = Crystals.SpacingNm * 1e-9;
        var w2 = Crystals.Omega0() * Crystals.Omega0();
        var volume = n1 * n2 * n3 * a * a * a;
        for (var t = 0; t < options.TemperaturesK.Length; t++)
        {
            double xx = 0, yy = 0;
            for (var i = 0; i < n1; i++)
            {
                for (var j = 0; j < n2; j++)
                {
                    for (var c = 0; c < n3; c++)
                    {
                        var kx = 2 * Math.PI * i / (n1 * a);
                        var ky = 2 * Math.PI * j / (n2 * a);
                        var omega = Math.Sqrt(4 * w2 * (Sq(Math.Sin(kx * a / 2)) + Sq(Math.Sin(ky * a / 2)) + Sq(Math.Sin(c * Math.PI / (2 * n3)))));
                        if (omega < 1e-6 * Crystals.Omega0())
                        {
                            continue;
                        }

                        var heat = HeatCapacity(omega, options.TemperaturesK[t]);
                        xx += heat * Sq(w2 * a * Math.Sin(kx * a) / omega) * tauPs * 1e-12;
                        yy += heat * Sq(w2 * a * Math.Sin(ky * a) / omega) * tauPs * 1e-12;
                    }
                }
            }

            Approx.Equal(xx / volume, confined.ByTemperature[t].KappaXxWPerMK, 1e-9, $"kappa_xx at {options.TemperaturesK[t]} K");
            Approx.Equal(yy / volume, confined.ByTemperature[t].KappaYyWPerMK, 1e-9, $"kappa_yy at {options.TemperaturesK[t]} K");
            Approx.Equal((xx + yy) / 2 / volume, confined.ByTemperature[t].KappaWPerMK, 1e-9, "in-plane mean");
        }

        // Today's boundary-scattering estimate of the same point stands beside it.
        Assert.NotNull(result.Conductivity);
    }

    [Fact]
    public void A_thin_film_at_low_temperature_conducts_as_its_three_gapless_branches_whatever_their_speeds()
    {
        // A film's subbands with omega -> 0 at k = 0 are 2D waves. For omega = c k and a constant tau,
        // kappa_xx = (tau / h) int d^2k / (2 pi)^2 C v_x^2 = tau kB (kB T / hbar)^2 6 zeta(3) / (4 pi h), whatever c
        // (own derivation from the kinetic formula, Ziman, Electrons and Phonons, ch. 8; h = volume / area).
        // Transverse springs make all three branches linear (the flexural one too, as they resist rotation).
        // Two (111) layers of an fcc crystal, 160 x 160 in-plane cells, at 10 K: the first gapped subband
        // is far above kT and the thermal waves span about 14 grid steps; an own exact mode sum of the same
        // film gives 0.4419139 W/(m K), 1.9e-3 above the law (dispersion and grid).
        const double tauPs = 5.0;
        const double temperatureK = 10.0;
        const double aNm = 0.4;
        var model = CrystalModel.Create(Lattice.FaceCentredCubic(aNm), [new Site("A", "A", Vec3.Zero, 30.0)], [new ShellSpring("A", "A", 1, 25.0, 2.0)]);
        var options = new SolveOptions
        {
            TemperaturesK = [temperatureK],
            ReferenceTemperatureK = temperatureK,
            Conductivity = new ConductivityOptions { Constant = new ConstantScattering(tauPs) },
        };
        var result = PhononSolver.Solve(model, RealSpaceSample.Box(160, 160, 2, Boundary.Periodic, Boundary.Periodic, Boundary.Free), options);

        var thicknessM = 2 * aNm * 1e-9 / Math.Sqrt(3); // two (111) planes, a / sqrt 3 apart
        var zeta3 = 1.2020569031595942;
        var thermal = PhysicalConstants.BoltzmannJPerK * temperatureK / PhysicalConstants.HbarJS;
        var perBranch = tauPs * 1e-12 * PhysicalConstants.BoltzmannJPerK * thermal * thermal * 6 * zeta3 / (4 * Math.PI * thicknessM);
        var confined = result.ConfinedConductivity!.AtReference;
        Approx.Equal(3 * perBranch, confined.KappaXxWPerMK, 4e-3, "kappa along a1");
        Approx.Equal(3 * perBranch, confined.KappaYyWPerMK, 4e-3, "kappa across a1 in the plane");
    }

    [Fact]
    public void A_wire_conducts_along_its_axis_only()
    {
        var options = new SolveOptions
        {
            TemperaturesK = [300],
            Conductivity = new ConductivityOptions { Constant = new ConstantScattering(1.0) },
        };
        var result = PhononSolver.Solve(Crystals.FccCentral(), RealSpaceSample.Cylinder(0.45, axis: 2, cells: 8, Boundary.Periodic), options);
        var confined = result.ConfinedConductivity!;
        Assert.Equal("along a3", confined.Directions);
        Assert.True(confined.AtReference.KappaWPerMK > 0);
        Assert.True(double.IsNaN(confined.AtReference.KappaYyWPerMK));
    }

    [Fact]
    public void Boundary_scattering_without_a_length_takes_the_distance_between_the_free_surfaces()
    {
        // The walls are where the sample is free: a film's thickness across its free direction (N3 times
        // the spacing of the (111) planes, a / sqrt 3, for an fcc film of primitive cells; not N3 |a3| =
        // N3 a / sqrt 2), a round wire's diameter (Casimir, Physica 5, 495 (1938)). A periodic direction has
        // no walls, however few its cells. Before, both took the smallest N_i |a_i| over all directions.
        var options = new SolveOptions
        {
            TemperaturesK = [300],
            Conductivity = new ConductivityOptions { Boundary = new BoundaryScattering(), Constant = new ConstantScattering(1.0) },
        };
        const double aNm = 0.4;
        var film = PhononSolver.Solve(Crystals.FccCentral(aNm: aNm), RealSpaceSample.Box(3, 3, 4, Boundary.Periodic, Boundary.Periodic, Boundary.Free), options);
        var thicknessNm = 4 * aNm / Math.Sqrt(3);
        Approx.Equal(thicknessNm, film.Conductivity!.BoundaryLengthNm, 1e-12, "the film's estimate: L = its thickness, not the 3-cell periodic edge");
        var confined = film.ConfinedConductivity!;
        Approx.Equal(
            PhononSolver.Solve(
                Crystals.FccCentral(aNm: aNm),
                RealSpaceSample.Box(3, 3, 4, Boundary.Periodic, Boundary.Periodic, Boundary.Free),
                options with { Conductivity = options.Conductivity with { Boundary = new BoundaryScattering { LengthNm = thicknessNm } } })
            .ConfinedConductivity!.AtReference.KappaWPerMK,
            confined.AtReference.KappaWPerMK,
            1e-12,
            "the confined modes' kappa uses the same length as the thickness given by hand");

        var wire = PhononSolver.Solve(Crystals.FccCentral(aNm: aNm), RealSpaceSample.Cylinder(0.45, axis: 2, cells: 8, Boundary.Periodic), options);
        Approx.Equal(0.9, wire.Conductivity!.BoundaryLengthNm, 1e-12, "a round wire: its diameter");

        var rod = PhononSolver.Solve(Crystals.FccCentral(aNm: aNm), RealSpaceSample.Cylinder(0.6, axis: 2, cells: 2, Boundary.Free), options);
        Approx.Equal(2 * aNm / Math.Sqrt(3), rod.Conductivity!.BoundaryLengthNm, 1e-12, "a rod of two cells along a free axis: its length across the (111) planes");

        var periodic = PhononSolver.Solve(Crystals.FccCentral(aNm: aNm), RealSpaceSample.Box(3, 3, 4, Boundary.Periodic, Boundary.Periodic, Boundary.Periodic), options);
        Approx.Equal(3 * aNm / Math.Sqrt(2), periodic.Conductivity!.BoundaryLengthNm, 1e-12, "no free surface: the smallest edge N_i |a_i| as before");
    }

    private static double Sq(double x) => x * x;

    private static double HeatCapacity(double omega, double temperatureK)
    {
        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * temperatureK);
        return PhysicalConstants.BoltzmannJPerK * x * x * Math.Exp(x) / Sq(Math.Exp(x) - 1);
    }
}
