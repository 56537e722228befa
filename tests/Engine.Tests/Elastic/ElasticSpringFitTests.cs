using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Elastic;

public class ElasticSpringFitTests
{
    [Fact]
    public void Fcc_nearest_neighbour_central_springs_reproduce_C11_and_C12_equal_C44_equal_half_C11()
    {
        // fcc, central nearest-neighbour springs K: C11 = 2K/a, C12 = C44 = K/a (Born and Huang, ch. 3; from memory).
        const double a = 0.4, c11 = 100;
        var fit = ElasticSpringFit.Fit(LatticeKind.FaceCentredCubic, a, 50, new CubicElasticConstants(c11, c11 / 2, c11 / 2), includeNextNearest: false);
        Assert.True(fit.RelativeResidual < 1e-12, $"residual {fit.RelativeResidual}");
        Approx.Equal(c11 * 1e9 * a * 1e-9 / 2, fit.NearestNPerM, 1e-12, "K = C11 a / 2");
        Approx.Equal(c11 / 2, fit.Reproduced.C44Gpa, 1e-12, "C44");
    }

    [Fact]
    public void Fitted_model_acoustic_slopes_give_the_Christoffel_sound_speeds()
    {
        // Long-wave limit of the lattice model equals elasticity: Christoffel speeds along [100], [110], [111] (Kittel ch. 3).
        var model = ElasticSpringFit.BuildModel(LatticeKind.FaceCentredCubic, 0.36, 63.5, new CubicElasticConstants(170, 120, 75), true, DegreesOfFreedom.Cartesian, out var fit);
        var result = PhononSolver.Solve(model, BulkSample.Uniform(3, 4), new SolveOptions { TemperaturesK = [300], MeanSquareDisplacement = false, PartialDos = false });
        Assert.True(fit.RelativeResidual > 0.01, "C12 != C44 cannot be met by central springs: the residual says so");
        foreach (var expected in fit.SoundSpeeds)
        {
            var actual = result.Summary.SoundSpeeds.Single(s => s.Direction == expected.Direction);
            for (var k = 0; k < 3; k++)
            {
                Approx.Equal(expected.SpeedsMPerS[k], actual.SpeedsMPerS[k], 1e-5, $"{expected.Direction} branch {k}");
            }
        }
    }

    [Fact]
    public void Next_nearest_springs_fit_C11_and_C44_of_a_simple_cubic_crystal()
    {
        // sc: nearest springs give only C11 = K1/a; next-nearest add C11 += 2K2/a, C12 = C44 = K2/a (same long-wave sums).
        var fit = ElasticSpringFit.Fit(LatticeKind.SimpleCubic, 0.3, 30, new CubicElasticConstants(200, 50, 50), includeNextNearest: true);
        Assert.True(fit.RelativeResidual < 1e-12);
        Approx.Equal(50, fit.Reproduced.C12Gpa, 1e-12, "C12");
        Approx.Equal(200, fit.Reproduced.C11Gpa, 1e-12, "C11");
    }

    [Fact]
    public void The_fit_reaches_the_point_result_with_its_residual_and_Christoffel_speeds()
    {
        // Issue 10 item 9. Christoffel speeds of a cubic crystal (Kittel ch. 3): [100] longitudinal
        // sqrt(C11 / rho), transverse sqrt(C44 / rho); [110] also sqrt((C11 - C12) / 2 rho); [111]
        // longitudinal sqrt((C11 + 2 C12 + 4 C44) / 3 rho). rho = m / V with V = a^3 / 4 for fcc.
        var given = new CubicElasticConstants(170, 120, 75);
        var model = ElasticSpringFit.BuildModel(LatticeKind.FaceCentredCubic, 0.36, 63.5, given, true, DegreesOfFreedom.Cartesian, out var fit);
        var result = PhononSolver.Solve(model, BulkSample.Uniform(3, 4), new SolveOptions { TemperaturesK = [300], MeanSquareDisplacement = false, PartialDos = false });
        var reported = result.ElasticFit ?? throw new Xunit.Sdk.XunitException("the result carries no elastic fit");
        Assert.Equal(fit.RelativeResidual, reported.RelativeResidual);
        Assert.True(reported.RelativeResidual > 0.01);
        var rho = 63.5 * Units.PhysicalConstants.AtomicMassKg / (Math.Pow(0.36e-9, 3) / 4);
        double V(double gpa) => Math.Sqrt(gpa * 1e9 / rho);
        var s100 = reported.GivenSoundSpeeds.Single(s => s.Direction == "[100]").SpeedsMPerS;
        Approx.Equal(V(given.C11Gpa), s100[2], 1e-12, "[100] longitudinal");
        Approx.Equal(V(given.C44Gpa), s100[0], 1e-12, "[100] transverse");
        var s110 = reported.GivenSoundSpeeds.Single(s => s.Direction == "[110]").SpeedsMPerS;
        Assert.Contains(s110, v => Math.Abs(v - V((given.C11Gpa - given.C12Gpa) / 2)) < 1e-9 * v);
        var s111 = reported.GivenSoundSpeeds.Single(s => s.Direction == "[111]").SpeedsMPerS;
        Approx.Equal(V((given.C11Gpa + 2 * given.C12Gpa + 4 * given.C44Gpa) / 3), s111[2], 1e-12, "[111] longitudinal");
        Assert.Null(PhononSolver.Solve(Crystals.FccCentral(), BulkSample.Uniform(3, 4), new SolveOptions { TemperaturesK = [300] }).ElasticFit);
    }
}
