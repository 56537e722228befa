using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.QPointSets;

/// <summary>
/// Panelled face rules against their definition: the rays of a pyramid on each panel of a face carry
/// the panel's share of the cell, so any tiling of the faces integrates what the Gauss-Legendre product
/// is exact for. Polynomials in q are: on the pyramid over a face, q = rho (c + s e1 + t e2) and
/// d^dq = rho^(d-1) |det| d rho ds dt (common practice, no source). Cells of invented, skewed edges.
/// </summary>
public sealed class CentredCellRaysTests
{
    private static readonly Vec3[] Skewed3 = [new(1.0, 0.1, -0.2), new(0.3, 0.9, 0.05), new(-0.1, 0.2, 1.3)];
    private static readonly Vec3[] Skewed2 = [new(1.0, 0.0, 0.0), new(0.5, 0.866, 0.0)];

    [Fact]
    public void A_rule_of_whole_face_panels_gives_the_rays_of_the_uniform_rule()
    {
        var uniform = CentredCellRays.Build(3, Skewed3, 6);
        var panelled = CentredCellRays.Build(3, Skewed3, CellFaceRule.Panelled(6, Enumerable.Range(0, 3).Select(f => FacePanel.Whole(f, 3))));
        Assert.Equal(uniform.Rays.Count, panelled.Rays.Count);
        for (var r = 0; r < uniform.Rays.Count; r++)
        {
            Assert.True((uniform.Rays[r].End - panelled.Rays[r].End).Length < 1e-15, $"ray {r} ends elsewhere");
            Approx.Equal(uniform.Rays[r].Weight, panelled.Rays[r].Weight, 1e-14, $"weight of ray {r}");
        }
    }

    [Theory]
    [InlineData(3)]
    [InlineData(2)]
    public void Uneven_panels_integrate_the_mean_square_wave_vector_of_the_cell_exactly(int d)
    {
        var edges = d == 3 ? Skewed3 : Skewed2;
        var panels = new List<FacePanel>();
        for (var face = 0; face < d; face++)
        {
            // Each face cut unevenly: one half whole, the other cut again across the other direction.
            var (lower, upper) = FacePanel.Whole(face, d).Halves(0);
            panels.Add(lower);
            var (a, b) = upper.Halves(d == 3 ? 1 : 0);
            panels.Add(a);
            panels.Add(b);
        }

        var rays = CentredCellRays.Build(d, edges, CellFaceRule.Panelled(3, panels));
        Approx.Equal(1.0, rays.Rays.Sum(r => r.Weight), 1e-14, "weights add up to the cell");

        // Mean of |sum t_i e_i|^2 over t uniform in [-1/2, 1/2]^d is sum_i |e_i|^2 / 12; along a ray
        // int_0^1 rho^2 |End|^2 d rho^d = d / (d + 2) |End|^2.
        var expected = edges.Sum(e => e.Dot(e)) / 12;
        var actual = rays.Rays.Sum(r => r.Weight * d / (d + 2.0) * r.End.Dot(r.End));
        Approx.Equal(expected, actual, 1e-13, "mean |q|^2 over the cell");
        Assert.Equal(rays.Rays.Count, CellFaceRule.Panelled(3, panels).RayCount(d));
    }
}
