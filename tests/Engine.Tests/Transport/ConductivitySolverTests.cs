using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>Conductivity through the solver facade: attached to the result and the summary only when asked.</summary>
public class ConductivitySolverTests
{
    private static readonly SolveOptions Options = new()
    {
        TemperaturesK = [50, 300],
        PartialDos = false,
        MeanSquareDisplacement = false,
        Conductivity = new ConductivityOptions
        {
            Boundary = new BoundaryScattering(),
            Umklapp = new UmklappScattering(),
            GrueneisenParameter = 1.6,
        },
    };

    [Fact]
    public void Solve_attaches_conductivity_and_its_summary_numbers()
    {
        var result = PhononSolver.Solve(Crystals.RockSalt(), FiniteSample.Create(4, 4, 4), Options);
        var c = Assert.IsType<ConductivityResult>(result.Conductivity);
        Assert.Equal(2, c.ByTemperature.Length);
        Assert.Equal("finite", c.SampleKind);
        Assert.Equal(c.AtReference.KappaWPerMK, result.Summary.KappaWPerMK);
        Assert.Equal(c.KappaMinWPerMK, result.Summary.KappaMinWPerMK);
        Assert.True(c.KappaMinWPerMK > 0 && c.KappaMinWPerMK < c.KappaMinHighTemperatureWPerMK);
        Assert.True(c.SlackKappaAtDebyeTemperatureWPerMK > 0);
        Approx.Equal(c.SlackKappaAtDebyeTemperatureWPerMK * c.AcousticDebyeTemperatureK / 300, c.SlackKappaAtReferenceWPerMK, 1e-12, "Slack ~ 1/T");
        Approx.Equal(4 * 0.56 * Math.Sqrt(0.5), c.BoundaryLengthNm, 1e-9, "L_eff = 4 |a_i| of the fcc cell");
    }

    [Fact]
    public void Without_conductivity_options_nothing_is_computed()
    {
        var result = PhononSolver.Solve(Crystals.RockSalt(), FiniteSample.Create(3, 3, 3), Options with { Conductivity = null });
        Assert.Null(result.Conductivity);
        Assert.Null(result.Summary.KappaWPerMK);
        Assert.Null(result.Summary.KappaMinWPerMK);
    }

    [Fact]
    public void Acoustic_averages_of_the_monatomic_scalar_cubic_model_are_its_closed_form_speed()
    {
        // The scalar simple-cubic model is isotropic at long wavelength with v = a sqrt(K/m) (closed
        // form), and theta_a = hbar v (6 pi^2 / a^3)^(1/3) / kB (Kittel ch. 5).
        var c = Kappa.Compute(Crystals.ScalarSimpleCubic(), FiniteSample.Create(4, 4, 4), new ConductivityOptions { Constant = new ConstantScattering(1) }, 300);
        var v = Crystals.SpacingNm * 1e-9 * Crystals.Omega0();
        Approx.Equal(v, c.DebyeAverageSoundSpeedMPerS, 1e-5, "v_D");
        Approx.Equal(v, c.MeanSoundSpeedsMPerS.Single(), 1e-5, "mean speed");
        var theta = Units.PhysicalConstants.HbarJS * v * Math.Cbrt(6 * Math.PI * Math.PI) / (Crystals.SpacingNm * 1e-9) / Units.PhysicalConstants.BoltzmannJPerK;
        Approx.Equal(theta, c.AcousticDebyeTemperatureK, 1e-5, "theta_a");
    }

    [Fact]
    public void Acoustic_averages_of_a_strongly_anisotropic_crystal_meet_a_converged_direction_average()
    {
        // Simple cubic, 3D motion, central springs 40 N/m (nearest) and 0.5 N/m (next-nearest), 25 amu,
        // a = 0.3 nm: the slow transverse branch is 4.7 times slower along [100] than the fastest speed, and
        // sorting the branches per direction puts kinks in its speed. Reference: own NumPy direction
        // average of the same long-wave slopes on 96 x 192 (and 128 x 256) Gauss-Legendre x uniform
        // points of the hemisphere, agreeing to 1e-9 (docs/outside-checks.md, Round 12); the Debye
        // average and theta_a as in Kittel, ch. 5. The fixed 8 x 16 rule gave v_D 7.9 % high.
        var model = CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 25)],
            [new ShellSpring("A", "A", 1, 40), new ShellSpring("A", "A", 2, 0.5)]);
        var c = Kappa.Compute(model, FiniteSample.Create(4, 4, 4), new ConductivityOptions { Constant = new ConstantScattering(1) }, 300);
        Approx.Equal(2169.6940, c.DebyeAverageSoundSpeedMPerS, 5e-5, "v_D");
        Approx.Equal(215.32136, c.AcousticDebyeTemperatureK, 5e-5, "theta_a");
        double[] branchMeans = [2333.16, 4445.97, 7863.51];
        for (var k = 0; k < 3; k++)
        {
            Approx.Equal(branchMeans[k], c.MeanSoundSpeedsMPerS[k], 1e-4, $"mean speed of branch {k}");
        }
    }

    [Fact]
    public void An_unstable_model_gets_NaN_conductivity_not_a_number_that_hides_it()
    {
        var unstable = CrystalModel.Create(Lattice.FaceCentredCubic(0.4), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10), new ShellSpring("A", "A", 2, -8)]);
        var c = Kappa.Compute(unstable, FiniteSample.Create(4, 4, 4), new ConductivityOptions { Constant = new ConstantScattering(1) }, 300);
        Assert.False(c.Stable);
        Assert.True(double.IsNaN(c.AtReference.KappaWPerMK));
    }
}
