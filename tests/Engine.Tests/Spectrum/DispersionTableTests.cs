using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Spectrum;

/// <summary>The dispersion table at q = 0 and at the reciprocal lattice vectors (issue 10 item 10).</summary>
public class DispersionTableTests
{
    [Fact]
    public void Rigid_translations_at_q_zero_and_at_reciprocal_lattice_vectors_are_exactly_zero()
    {
        // Acoustic sum rule: D(0) annihilates a uniform translation, and D(q + G) has the eigenvalues of
        // D(q) (Maradudin et al., Theory of Lattice Dynamics in the Harmonic Approximation, ch. 2; common
        // practice). The eigen-solver's round-off printed them as +-8e-8 THz.
        var path = new DispersionPath([new PathCorner("G", Vec3.Zero), new PathCorner("X", new Vec3(0.5, 0, 0.5)), new PathCorner("G'", new Vec3(1, 0, 1))], 8);
        var result = PhononSolver.Solve(Crystals.RockSalt(), BulkSample.Uniform(3, 4), new SolveOptions { TemperaturesK = [300], Dispersion = path });
        var corners = result.Dispersion.Where(r => r.CornerLabel is "G" or "G'").ToList();
        Assert.Equal(12, corners.Count); // two points x six branches
        foreach (var row in corners)
        {
            if (row.Branch < 3)
            {
                Assert.Equal(0.0, row.FrequencyThz);
                Assert.Equal(0.0, row.GroupVelocityXMPerS);
                Assert.Equal(0.0, row.GroupVelocityYMPerS);
                Assert.Equal(0.0, row.GroupVelocityZMPerS);
            }
            else
            {
                Assert.True(row.FrequencyThz > 1, $"optical branch {row.Branch} at {row.CornerLabel}: {row.FrequencyThz} THz");
            }
        }

        // Elsewhere nothing is touched: the first point off q = 0 is a small positive acoustic frequency.
        Assert.All(result.Dispersion.Where(r => r.PathIndex == 1 && r.Branch < 3), r => Assert.True(r.FrequencyThz > 0));
        var optical = corners.Where(r => r.Branch >= 3).OrderBy(r => r.Branch).ToList();
        Approx.Equal(optical[0].FrequencyThz, optical[1].FrequencyThz, 1e-10, "q and q + G have the same optical frequency");
    }
}
