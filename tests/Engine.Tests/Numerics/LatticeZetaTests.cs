using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Numerics;

/// <summary>The lattice zeta values a mesh's q = 0 point needs (Z(-1), Z'(0)), against closed forms.</summary>
public class LatticeZetaTests
{
    [Fact]
    public void A_chain_gives_twice_the_Riemann_zeta_values()
    {
        // Z(s) = 2 zeta(s) a^-s: zeta(-1) = -1/12, zeta'(0) = -ln(2 pi) / 2 (Abramowitz and Stegun 23.2.14-15, 23.2.6).
        var (atMinusOne, slope) = LatticeZeta.Of(new double[,] { { 1 } });
        Approx.Equal(-1.0 / 6, atMinusOne, 1e-12, "Z(-1) of the integers");
        Approx.Equal(-Math.Log(2 * Math.PI), slope, 1e-12, "Z'(0) of the integers");

        // Scaled by a: Z(-1) a, Z'(0) + ln a (Z(0) = -1).
        var (scaled, scaledSlope) = LatticeZeta.Of(new double[,] { { 0.25 } });
        Approx.Equal(-1.0 / 12, scaled, 1e-12, "Z(-1) of the half-integers");
        Approx.Equal(-Math.Log(2 * Math.PI) + Math.Log(0.5), scaledSlope, 1e-12, "Z'(0) of the half-integers");
    }

    [Fact]
    public void The_square_lattice_slope_at_zero_matches_its_closed_form()
    {
        // Z(s) = 4 zeta(s/2) beta(s/2) (Dirichlet beta; from memory), so Z'(0) = zeta'(0) - beta'(0) with
        // beta'(0) = ln(Gamma(1/4)^2 / (2 pi sqrt 2)) (from memory); Gamma(1/4) = 3.6256099082219083 (A and S table 6.1).
        var gammaQuarter = 3.6256099082219083;
        var expected = (-0.5 * Math.Log(2 * Math.PI)) - Math.Log(gammaQuarter * gammaQuarter / (2 * Math.PI * Math.Sqrt(2)));
        var (_, slope) = LatticeZeta.Of(new double[,] { { 1, 0 }, { 0, 1 } });
        Approx.Equal(expected, slope, 1e-11, "Z'(0) of the square lattice");

        // A sheared basis of the same lattice gives the same values.
        var (a, b) = LatticeZeta.Of(new double[,] { { 1, 1 }, { 1, 2 } });
        var (a0, _) = LatticeZeta.Of(new double[,] { { 1, 0 }, { 0, 1 } });
        Approx.Equal(a0, a, 1e-12, "Z(-1) independent of the basis");
        Approx.Equal(expected, b, 1e-11, "Z'(0) independent of the basis");
    }

    [Fact]
    public void Incomplete_gamma_meets_its_closed_forms_on_both_sides_of_the_switch()
    {
        foreach (var u in new[] { 0.3, 1.2, 1.6, 4.0, 20.0 })
        {
            Approx.Equal(Math.Exp(-u), LatticeZeta.UpperGamma(1, u), 1e-13, $"Gamma(1, {u})");
            Approx.Equal((1 + u) * Math.Exp(-u), LatticeZeta.UpperGamma(2, u), 1e-13, $"Gamma(2, {u})");
        }

        // E1(1) = 0.21938393439552027 (A and S table 5.1).
        Approx.Equal(0.21938393439552027, LatticeZeta.UpperGamma(0, 1.0), 1e-13, "E1(1)");
        Approx.Equal(0.21938393439552027, LatticeZeta.UpperGamma(0, 1.0 - 1e-12), 1e-10, "E1 just below 1 by its series");
    }
}
