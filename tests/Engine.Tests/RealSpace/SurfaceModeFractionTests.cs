using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>The surface-mode count of a film against its standing waves across the thickness.</summary>
public sealed class SurfaceModeFractionTests
{
    [Theory]
    [InlineData(6, 5)]
    [InlineData(7, 4)]
    public void A_four_layer_scalar_film_counts_the_modes_with_exactly_half_their_weight_on_the_surfaces(int n1, int n2)
    {
        // Scalar simple cubic, periodic in-plane, 4 free layers: the modes separate into in-plane waves
        // times the free chain's standing waves e_c(z) = sqrt((2 - delta_c0) / 4) cos(c pi (z + 1/2) / 4)
        // (own derivation from the free chain's modes). Their weight on the two surface layers,
        // 2 e_c(0)^2, is 1/2 for c = 0, cos^2(pi/8) = 0.854 for c = 1, exactly 1/2 for c = 2 and 0.146 for
        // c = 3, so at the default threshold 1/2 ("at least") three of the four subbands are surface modes:
        // (3 n1 n2 - 1) / (4 n1 n2 - 1) of the non-zero modes. Two of them sit exactly on the threshold,
        // where round-off alone used to decide.
        var result = PhononSolver.Solve(
            Crystals.ScalarSimpleCubic(),
            RealSpaceSample.Box(n1, n2, 4, Boundary.Periodic, Boundary.Periodic, Boundary.Free),
            new SolveOptions { TemperaturesK = [300], ReferenceTemperatureK = 300 });
        var cells = n1 * n2;
        Assert.Equal((3.0 * cells - 1) / ((4.0 * cells) - 1), result.Surface!.SurfaceModeFraction!.Value, 12);
    }
}
