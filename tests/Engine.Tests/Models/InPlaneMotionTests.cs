using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Models;

/// <summary>In-plane motion for 2D lattices (issue 10 item 8).</summary>
public class InPlaneMotionTests
{
    private const double K1 = 10, K2 = 3, MassAmu = 20, SpacingNm = 0.3;

    private static CrystalModel CentralSquare(DegreesOfFreedom motion) =>
        CrystalModel.Create(Lattice.Square(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)],
            [new ShellSpring("A", "A", 1, K1), new ShellSpring("A", "A", 2, K2)], degreesOfFreedom: motion);

    [Fact]
    public void Square_sheet_with_central_springs_has_its_closed_form_zone_boundary_frequencies()
    {
        // Central springs K1 (nearest, along x and y) and K2 (next nearest, along the diagonals), motion in
        // the plane: D_xx = (2K1/m)(1 - cos x) + (2K2/m)(1 - cos x cos y), D_xy = (2K2/m) sin x sin y with
        // x = q_x a, y = q_y a (the central-force dynamical matrix, Ashcroft and Mermin ch. 22, summed
        // here over the eight neighbours). At X = (pi, 0): omega = 2 sqrt((K1 + K2)/m) and 2 sqrt(K2/m);
        // at M = (pi, pi): 2 sqrt(K1/m) twice.
        var path = new DispersionPath([new PathCorner("G", Vec3.Zero), new PathCorner("X", new Vec3(0.5, 0, 0)), new PathCorner("M", new Vec3(0.5, 0.5, 0))], 4);
        var result = PhononSolver.Solve(CentralSquare(DegreesOfFreedom.InPlane), BulkSample.Uniform(2, 16), new SolveOptions { TemperaturesK = [300], Dispersion = path });
        Assert.Equal(2, result.Summary.BranchCount);
        var m = MassAmu * PhysicalConstants.AtomicMassKg;
        double F(double k) => Crystals.Thz(2 * Math.Sqrt(k / m));
        var x = result.Dispersion.Where(r => r.CornerLabel == "X").OrderBy(r => r.Branch).ToList();
        Approx.Equal(F(K2), x[0].FrequencyThz, 1e-12, "transverse at X");
        Approx.Equal(F(K1 + K2), x[1].FrequencyThz, 1e-12, "longitudinal at X");
        Assert.All(result.Dispersion.Where(r => r.CornerLabel == "M"), r => Approx.Equal(F(K1), r.FrequencyThz, 1e-12, "at M"));
        Assert.Equal(2, result.Summary.SoundSpeeds[0].SpeedsMPerS.Length);
    }

    [Fact]
    public void In_plane_branches_are_those_of_3d_motion_when_every_spring_lies_in_the_plane()
    {
        // With all bonds in the plane, D has no xz or yz element: in-plane and out-of-plane motion
        // decouple (common practice, no source), so the two in-plane branches of a 3D-motion sheet (here
        // held out of plane by a transverse constant) are the in-plane model's.
        var flat = CrystalModel.Create(Lattice.Hexagonal(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)],
            [new ShellSpring("A", "A", 1, K1, 2)], degreesOfFreedom: DegreesOfFreedom.InPlane);
        var full = CrystalModel.Create(Lattice.Hexagonal(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)],
            [new ShellSpring("A", "A", 1, K1, 2)]);
        var path = new DispersionPath([new PathCorner("A", new Vec3(0.1, 0.27, 0)), new PathCorner("B", new Vec3(0.41, 0.05, 0))], 3);
        var options = new SolveOptions { TemperaturesK = [300], Dispersion = path };
        var inPlane = PhononSolver.Solve(flat, BulkSample.Uniform(2, 8), options).Dispersion;
        var threeD = PhononSolver.Solve(full, BulkSample.Uniform(2, 8), options).Dispersion;
        foreach (var point in inPlane.GroupBy(r => r.PathIndex))
        {
            var all = threeD.Where(r => r.PathIndex == point.Key).Select(r => r.FrequencyThz).ToList();
            foreach (var row in point)
            {
                Assert.Contains(all, f => Math.Abs(f - row.FrequencyThz) <= 1e-10 * Math.Abs(f));
            }
        }
    }

    [Fact]
    public void Three_d_motion_of_a_sheet_with_only_in_plane_central_springs_is_refused_with_the_in_plane_hint()
    {
        var e = Assert.Throws<ModelException>(() => PhononSolver.Solve(CentralSquare(DegreesOfFreedom.Cartesian), BulkSample.Uniform(2, 8), new SolveOptions()));
        Assert.Equal(ModelProblemKind.UnconnectedSite, e.Kind);
        Assert.Contains("motion = \"in_plane\"", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void In_plane_motion_needs_a_2D_lattice()
    {
        var e = Assert.Throws<ModelException>(() => CrystalModel.Create(Lattice.SimpleCubic(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)],
            [new ShellSpring("A", "A", 1, K1)], degreesOfFreedom: DegreesOfFreedom.InPlane));
        var problem = Assert.Single(e.Problems);
        Assert.Equal("motion", problem.Where);
        Assert.Contains("2D lattice", problem.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void In_plane_thermal_functions_reach_two_degrees_of_freedom_per_atom()
    {
        // Dulong-Petit in the plane: Cv -> 2R per mole of atoms at high temperature (equipartition).
        var result = PhononSolver.Solve(CentralSquare(DegreesOfFreedom.InPlane), FiniteSample.Create(8, 8), new SolveOptions { TemperaturesK = [1e6] });
        Approx.Equal(2 * PhysicalConstants.GasConstantJPerMolK * (2 * 64 - result.Summary.ZeroModesExcluded) / (2 * 64), result.Thermal[0].HeatCapacityJPerMolK, 1e-8, "Cv at 1e6 K");
        Assert.Equal(2, result.Summary.RigidModesExcluded);
        Assert.All(result.Displacements, d => Assert.Null(d.MsdZNm2));
    }
}
