using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>
/// Bond-bending terms on samples with free surfaces and cut shapes: a bend whose centre or end the
/// cut removes vanishes as a whole. Checked against force constants made independently, by finite
/// differences of the nonlinear energy summed over the triples the sample keeps.
/// </summary>
public sealed class BendingAtSurfacesTests
{
    private static readonly SolveOptions Options = new() { TemperaturesK = [50, 300], ModeListMaxModes = 1_000_000 };

    private const double Stretch = 50;
    private const double Bend = 5;

    public static TheoryData<string> CutSamples => ["free box", "sphere", "wire", "film", "periodic box with substitutes", "sphere with substitutes"];

    [Theory]
    [MemberData(nameof(CutSamples))]
    public void Keating_force_constants_of_a_cut_sample_are_those_of_the_triples_it_keeps(string which)
    {
        var model = BondedCrystals.Tetrahedral(Stretch, Bend);
        AssertMatchesFiniteDifferences(model, SampleOf(which), KeatingEnergy);
    }

    [Theory]
    [MemberData(nameof(CutSamples))]
    public void Angle_force_constants_of_a_cut_sample_are_those_of_the_triples_it_keeps(string which)
    {
        var model = TetrahedralWith(BendForm.Angle);
        AssertMatchesFiniteDifferences(model, SampleOf(which), AngleEnergy);
    }

    [Fact]
    public void A_free_cluster_of_a_bond_bending_crystal_has_six_zero_modes_and_bending_keeps_rotations_free()
    {
        // Keating's energy depends on bond lengths and angles only, so it is invariant under rigid
        // rotations (Keating, Phys. Rev. 145, 637 (1966)); a cluster must keep six exact zero modes.
        var model = BondedCrystals.Tetrahedral(Stretch, Bend);
        var result = PhononSolver.Solve(model, RealSpaceSample.Box(3, 3, 3, Boundary.Free, Boundary.Free, Boundary.Free), Options);
        Assert.Equal(6, result.Summary.RigidModesExcluded);
        Assert.Equal(6, result.Summary.ZeroModesExcluded); // not floppy: the bends hold every angle
        Assert.Equal(3, result.Surface!.RigidRotations);
        Assert.Equal(0.0, result.Surface.RotationDefectThz);
        Assert.True(result.Summary.Stable);
        Assert.Equal(6, result.Modes[0].Multiplicity);
        Assert.Equal(0.0, result.Modes[0].FrequencyThz);
    }

    [Fact]
    public void A_free_flake_of_a_sheet_with_flexural_bends_keeps_its_six_rigid_motions_free()
    {
        // In-plane Keating and out-of-plane (flexural) bends of a honeycomb sheet are invariant under
        // every rigid rotation, the two tilts out of the plane included: six zero modes, no more.
        var result = PhononSolver.Solve(BondedCrystals.Honeycomb(), RealSpaceSample.Sphere(0.7, dimension: 2), Options);
        Assert.Equal(6, result.Summary.RigidModesExcluded);
        Assert.Equal(6, result.Summary.ZeroModesExcluded);
        Assert.Equal(0.0, result.Surface!.RotationDefectThz);
    }

    [Theory]
    [InlineData(4.0)]
    [InlineData(0.25)]
    public void Substitutes_with_their_own_spring_factor_scale_each_bend_as_a_whole_so_a_cluster_stays_stable_and_rotation_free(double factor)
    {
        // Scaling a bend's three pair blocks by three different pair factors would break it (imaginary
        // modes, rotations that cost energy); scaled as a whole it stays a positive, rotation-invariant term.
        var model = BondedCrystals.Tetrahedral(Stretch, Bend);
        var sample = RealSpaceSample.Box(3, 3, 3, Boundary.Free, Boundary.Free, Boundary.Free) with
        {
            Disorder = new Disorder([new SiteSubstitution("A", 28.0, 0.5, factor)], 2, Seed: 3),
        };
        var result = PhononSolver.Solve(model, sample, Options);
        Assert.True(result.Summary.Stable);
        Assert.Equal(6, result.Summary.ZeroModesExcluded);
        Assert.Equal(0.0, result.Surface!.RotationDefectThz);
        Assert.True(result.Ordered!.Summary.Stable); // the virtual crystal, whose basis sites have different mean factors
    }

    [Fact]
    public void Every_atom_substituted_with_a_spring_factor_is_the_crystal_with_every_spring_and_bend_times_that_factor()
    {
        // c = 1 on both sites: every spring and every bend x f exactly (the closed-form limit).
        var model = BondedCrystals.Tetrahedral(Stretch, Bend);
        var expected = PhononSolver.Solve(BondedCrystals.Tetrahedral(2.5 * Stretch, 2.5 * Bend), FiniteSample.Create(3, 3, 3), Options);
        var sample = RealSpaceSample.Box(3, 3, 3) with
        {
            Disorder = new Disorder([new SiteSubstitution("A", 28.0, 1.0, 2.5), new SiteSubstitution("B", 28.0, 1.0, 2.5)], 1, Seed: 3),
        };
        var disordered = PhononSolver.Solve(model, sample, Options);
        for (var t = 0; t < expected.Thermal.Length; t++)
        {
            Approx.Equal(expected.Thermal[t].HeatCapacityJPerMolK, disordered.Thermal[t].HeatCapacityJPerMolK, 1e-9, $"Cv at {expected.Thermal[t].TemperatureK} K");
        }
    }

    [Fact]
    public void A_film_solved_with_exact_in_plane_wave_vectors_matches_the_wrapped_supercell()
    {
        // Two routes through the cut bends: the ordered film is one cell thick in plane with Bloch
        // phases, a zero-concentration disordered film is the whole supercell wrapped at q = 0. The
        // same crystal, so the heat capacities agree to round-off (common practice, no source).
        var model = BondedCrystals.Tetrahedral(Stretch, Bend);
        var film = RealSpaceSample.Box(3, 3, 3, Boundary.Periodic, Boundary.Periodic, Boundary.Free);
        var ordered = PhononSolver.Solve(model, film, Options);
        var wrapped = PhononSolver.Solve(model, film with { Disorder = new Disorder([new SiteSubstitution("A", 28.0, 0.0)], 1, Seed: 3) }, Options);
        for (var t = 0; t < ordered.Thermal.Length; t++)
        {
            Approx.Equal(ordered.Thermal[t].HeatCapacityJPerMolK, wrapped.Thermal[t].HeatCapacityJPerMolK, 1e-9, $"Cv at {ordered.Thermal[t].TemperatureK} K");
        }

        Assert.Equal(3, ordered.Summary.RigidModesExcluded);
        Assert.Equal(3, ordered.Summary.ZeroModesExcluded);
    }

    [Fact]
    public void A_periodic_real_space_box_of_a_bond_bending_crystal_matches_the_finite_crystal()
    {
        // All directions periodic: nothing is cut, and the real-space block is the same crystal as the
        // exact-wave-vector finite sum (common practice, no source: the two routes must agree to round-off).
        var model = BondedCrystals.Tetrahedral(Stretch, Bend);
        var real = PhononSolver.Solve(model, RealSpaceSample.Box(2, 2, 2, Boundary.Periodic, Boundary.Periodic, Boundary.Periodic), Options);
        var finite = PhononSolver.Solve(model, FiniteSample.Create(2, 2, 2), Options);
        Assert.Equal(finite.Summary.HeatCapacityJPerMolK!.Value, real.Summary.HeatCapacityJPerMolK!.Value, 1e-9 * finite.Summary.HeatCapacityJPerMolK!.Value);
    }

    private static RealSpaceSample SampleOf(string which) => which switch
    {
        "free box" => RealSpaceSample.Box(2, 2, 2, Boundary.Free, Boundary.Free, Boundary.Free),
        "sphere" => RealSpaceSample.Sphere(0.6),
        "wire" => RealSpaceSample.Cylinder(0.45, axis: 2, cells: 3, Boundary.Periodic),
        "film" => RealSpaceSample.Box(3, 3, 2, Boundary.Periodic, Boundary.Periodic, Boundary.Free) with { Disorder = new Disorder([new SiteSubstitution("A", 28.0, 0.0)], 1, Seed: 1) },
        "periodic box with substitutes" => RealSpaceSample.Box(3, 3, 3) with { Disorder = Substitutes },
        _ => RealSpaceSample.Sphere(0.6) with { Disorder = Substitutes },
    };

    /// <summary>Half the A sites stiffer (x 4) and some B sites softer (x 0.3): bends then span atoms of different factors.</summary>
    private static Disorder Substitutes => new([new SiteSubstitution("A", 28.0, 0.5, 4.0), new SiteSubstitution("B", 28.0, 0.3, 0.3)], 2, Seed: 7);

    private static CrystalModel TetrahedralWith(BendForm form) => CrystalModel.Create(
        Lattice.FaceCentredCubic(BondedCrystals.DiamondConstantNm),
        [new Site("A", "A", Vec3.Zero, 28), new Site("B", "B", new Vec3(0.25, 0.25, 0.25), 28)],
        [new ShellSpring("A", "B", 1, Stretch)],
        bends: [new BendSpring("A", "B", 1, form, Bend), new BendSpring("B", "A", 1, form, Bend)]);

    /// <summary>Keating's bend energy of one triple: (1/2) k [r_ij . r_ik - r0_ij . r0_ik]^2 / (d_ij d_ik).</summary>
    private static double KeatingEnergy(Vec3 rj, Vec3 rk, Vec3 r0j, Vec3 r0k) =>
        0.5 * Bend * Math.Pow(rj.Dot(rk) - r0j.Dot(r0k), 2) / (r0j.Length * r0k.Length);

    /// <summary>The angle form of one triple: (1/2) k d_ij d_ik (theta - theta0)^2.</summary>
    private static double AngleEnergy(Vec3 rj, Vec3 rk, Vec3 r0j, Vec3 r0k)
    {
        static double Angle(Vec3 a, Vec3 b) => Math.Acos(Math.Clamp(a.Dot(b) / (a.Length * b.Length), -1, 1));
        return 0.5 * Bend * r0j.Length * r0k.Length * Math.Pow(Angle(rj, rk) - Angle(r0j, r0k), 2);
    }

    /// <summary>
    /// The block's force constants (mass-weighted D times sqrt(m_i m_j)) against a Hessian made from the
    /// nonlinear energy: a central stretch (1/2) L (|r| - d0)^2 on every nearest-neighbour pair the
    /// sample keeps and the bend energy on every triple (centre and two of its nearest neighbours) it
    /// keeps, each term differentiated by central differences (common practice, no source).
    /// </summary>
    private static void AssertMatchesFiniteDifferences(CrystalModel model, RealSpaceSample sample, Func<Vec3, Vec3, Vec3, Vec3, double> bendEnergy)
    {
        var crystal = CompiledCrystal.From(model);
        var block = RealSpaceLattice.Build(crystal, sample, bloch: false);
        var properties = sample.Disorder is { } disorder ? SiteProperties.Random(block, disorder, 0) : SiteProperties.Ordered(block);
        var g = properties.SpringScale;
        var op = new RealSpaceOperator(block, properties);
        var n = op.Size;
        var d = new double[n * n];
        op.BuildReal(d);

        var atoms = block.Sites;
        var position = block.PositionM;
        var nearest = Math.Sqrt(3) / 4 * BondedCrystals.DiamondConstantNm * 1e-9;
        var neighbours = Enumerable.Range(0, atoms).Select(i => new List<(int J, Vec3 R)>()).ToArray();
        for (var i = 0; i < atoms; i++)
        {
            for (var j = 0; j < atoms; j++)
            {
                // Periodic directions wrap: the nearest image of j.
                foreach (var r in Images(block, position[j] - position[i], sample))
                {
                    if (Math.Abs(r.Length - nearest) < 1e-6 * nearest)
                    {
                        neighbours[i].Add((j, r));
                    }
                }
            }
        }

        var expected = new double[n * n];
        for (var i = 0; i < atoms; i++)
        {
            foreach (var (j, r) in neighbours[i])
            {
                var stretch = (IReadOnlyList<Vec3> u) => 0.5 * Stretch * Math.Pow((r + u[1] - u[0]).Length - nearest, 2);
                AddHessian(expected, n, [i, j], stretch, 0.5 * g[i] * g[j]); // each pair is met from both ends; sqrt(f_i f_j)
            }

            var list = neighbours[i];
            for (var p = 0; p < list.Count; p++)
            {
                for (var q = p + 1; q < list.Count; q++)
                {
                    var (j, rj) = list[p];
                    var (k, rk) = list[q];
                    var bend = (IReadOnlyList<Vec3> u) => bendEnergy(rj + u[1] - u[0], rk + u[2] - u[0], rj, rk);
                    AddHessian(expected, n, [i, j, k], bend, Math.Cbrt(Math.Pow(g[i] * g[j] * g[k], 2))); // (f_i f_j f_k)^(1/3)
                }
            }
        }

        var scale = expected.Max(Math.Abs);
        var masses = properties.MassKg;
        for (var a = 0; a < n; a++)
        {
            for (var b = 0; b < n; b++)
            {
                var phi = d[(a * n) + b] * Math.Sqrt(masses[a / 3] * masses[b / 3]);
                Assert.True(Math.Abs(phi - expected[(a * n) + b]) <= 1e-6 * scale, $"Phi[{a},{b}] = {phi} N/m, expected {expected[(a * n) + b]} N/m ({sample.Shape.Name})");
            }
        }
    }

    /// <summary>The separations of j's images from i that the sample holds: itself, plus wrapped images along periodic directions.</summary>
    private static IEnumerable<Vec3> Images(RealSpaceLattice block, Vec3 r, RealSpaceSample sample)
    {
        var lattice = block.Crystal.Lattice;
        var ranges = Enumerable.Range(0, 3).Select(i => sample.BoundaryOf(i) == Boundary.Periodic ? new[] { -1, 0, 1 } : [0]).ToArray();
        foreach (var a in ranges[0])
        {
            foreach (var b in ranges[1])
            {
                foreach (var c in ranges[2])
                {
                    var shift = new Vec3(a * sample.Cells(0), b * sample.Cells(1), c * sample.Cells(2));
                    var image = r + lattice.ToCartesianM(shift);
                    if (image.Length > 0)
                    {
                        yield return image;
                    }
                }
            }
        }
    }

    /// <summary>Adds weight x the Hessian of energy(u of the given atoms) at u = 0, by central differences.</summary>
    private static void AddHessian(double[] hessian, int n, int[] atoms, Func<IReadOnlyList<Vec3>, double> energy, double weight)
    {
        var h = 1e-4 * BondedCrystals.DiamondConstantNm * 1e-9;
        var dofs = atoms.Length * 3;
        double E(int x, double sx, int y, double sy)
        {
            var u = new Vec3[atoms.Length];
            u[x / 3] += Axis(x % 3) * (sx * h);
            u[y / 3] += Axis(y % 3) * (sy * h);
            return energy(u);
        }

        for (var x = 0; x < dofs; x++)
        {
            for (var y = 0; y < dofs; y++)
            {
                var second = (E(x, 1, y, 1) - E(x, 1, y, -1) - E(x, -1, y, 1) + E(x, -1, y, -1)) / (4 * h * h);
                hessian[(((atoms[x / 3] * 3) + (x % 3)) * n) + (atoms[y / 3] * 3) + (y % 3)] += weight * second;
            }
        }
    }

    private static Vec3 Axis(int i) => i switch { 0 => new Vec3(1, 0, 0), 1 => new Vec3(0, 1, 0), _ => new Vec3(0, 0, 1) };
}
