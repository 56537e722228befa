using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>Samples with free directions against closed forms, and the periodic case against today's solver.</summary>
public sealed class FreeBoundaryTests
{
    private static readonly SolveOptions Options = new() { TemperaturesK = [5, 50, 300], ModeListMaxModes = 1_000_000 };

    [Fact]
    public void A_free_chain_has_the_frequencies_2_sqrt_K_over_m_sin_n_pi_over_2N()
    {
        // Free ends: the path-graph Laplacian, eigenvalues 2 - 2 cos(pi n / N) = 4 sin^2(n pi / 2N), n = 0..N-1
        // (Brouwer and Haemers, Spectra of Graphs, sec. 1.4.4; exact).
        const int n = 40;
        var result = PhononSolver.Solve(Crystals.ScalarChain(), RealSpaceSample.Box(n, 1, 1, Boundary.Free), Options);
        var expected = Enumerable.Range(0, n).Select(k => Crystals.Thz(2 * Crystals.Omega0() * Math.Sin(k * Math.PI / (2 * n)))).ToArray();
        AssertModes(expected, result);
        Assert.Equal(1, result.Summary.RigidModesExcluded);
        Assert.Equal(result.Summary.RigidModesExcluded, result.Summary.ZeroModesExcluded); // none beyond the rigid ones: not floppy
        Approx.Equal(expected[1], result.Surface!.ConfinementGapThz!.Value, 1e-10, "confinement gap");
    }

    [Fact]
    public void A_light_end_atom_of_a_free_chain_carries_a_mode_above_the_band_at_the_closed_form_frequency()
    {
        // Semi-infinite chain (masses m, springs K) ending in a mass m0 < m/2: u_n = (-x)^n with x = m0 / (m - m0)
        // solves the bulk and end equations, so omega^2 = K m / (m0 (m - m0)), above the band top 4K/m (own
        // derivation from the equations of motion; the existence of such a mode from memory). A chain of 40 sites
        // with a light atom at each end has two such modes, split by about x^40 ~ 1e-15.
        const double k = 35, m = 20, m0 = 6;
        var masses = Enumerable.Repeat(m, 40).ToArray();
        masses[0] = masses[^1] = m0;
        var model = LayeredModelBuilder.Build(new LayeredModelSpec(LayeredHost.Chain, 0.25, 40, MassPattern.Repeated(masses), k, 0, DegreesOfFreedom.Scalar));
        var result = PhononSolver.Solve(model, RealSpaceSample.Box(1, 1, 1, Boundary.Free), Options);
        var expected = Crystals.Thz(Math.Sqrt(k * m / (m0 * (m - m0) * Units.PhysicalConstants.AtomicMassKg)));
        var top = result.Modes.SelectMany(l => Enumerable.Repeat(l.FrequencyThz, (int)l.Multiplicity)).OrderDescending().Take(3).ToArray();
        Approx.Equal(expected, top[0], 1e-12, "symmetric end mode");
        Approx.Equal(expected, top[1], 1e-12, "antisymmetric end mode");
        Assert.True(top[2] < Crystals.Thz(2 * Crystals.Omega0(k, m)), $"third mode {top[2]} THz lies in the band");
        Assert.Equal(2, result.Surface!.SurfaceSites); // the two end atoms, each missing a neighbour
    }

    [Fact]
    public void A_free_simple_cubic_box_has_squared_frequencies_that_are_sums_of_free_chain_values()
    {
        // The scalar nearest-neighbour model separates: D is the Kronecker sum of three path Laplacians,
        // so omega^2 = (4K/m) [sin^2(a pi / 2N1) + sin^2(b pi / 2N2) + sin^2(c pi / 2N3)] (exact).
        var (n1, n2, n3) = (4, 5, 6);
        var result = PhononSolver.Solve(Crystals.ScalarSimpleCubic(), RealSpaceSample.Box(n1, n2, n3, Boundary.Free, Boundary.Free, Boundary.Free), Options);
        var w2 = Crystals.Omega0() * Crystals.Omega0();
        var expected = (from a in Enumerable.Range(0, n1)
                        from b in Enumerable.Range(0, n2)
                        from c in Enumerable.Range(0, n3)
                        select Crystals.Thz(Math.Sqrt(4 * w2 * (Sin2(a, n1) + Sin2(b, n2) + Sin2(c, n3))))).ToArray();
        AssertModes(expected, result);
        Assert.Equal("dense", result.Surface!.Method);
        Assert.Equal(n1 * n2 * n3, result.Surface.AtomCount);
        Assert.Equal((n1 * n2 * n3) - ((n1 - 2) * (n2 - 2) * (n3 - 2)), result.Surface.SurfaceSites);
    }

    [Fact]
    public void A_film_periodic_in_plane_takes_exact_wave_vectors_and_free_chain_values_across()
    {
        // Periodic directions: 4 sin^2(pi k / N); the free one: 4 sin^2(pi c / 2N) (exact, separable).
        var (n1, n2, n3) = (6, 5, 7);
        var result = PhononSolver.Solve(Crystals.ScalarSimpleCubic(), RealSpaceSample.Box(n1, n2, n3, Boundary.Periodic, Boundary.Periodic, Boundary.Free), Options);
        var w2 = Crystals.Omega0() * Crystals.Omega0();
        static double P(int k, int n) => Math.Pow(Math.Sin(Math.PI * k / n), 2);
        var expected = (from a in Enumerable.Range(0, n1)
                        from b in Enumerable.Range(0, n2)
                        from c in Enumerable.Range(0, n3)
                        select Crystals.Thz(Math.Sqrt(4 * w2 * (P(a, n1) + P(b, n2) + Sin2(c, n3))))).ToArray();
        AssertModes(expected, result);
        Assert.Equal("dense per wave vector", result.Surface!.Method);
        Assert.Equal(1, result.Summary.RigidModesExcluded);
        Assert.Equal(2 * n1 * n2, result.Surface.SurfaceSites);
    }

    [Fact]
    public void Every_periodic_direction_gives_exactly_todays_finite_crystal()
    {
        var model = Crystals.RockSalt();
        var options = Options with { TemperaturesK = [10, 100, 300], DosBins = 120 };
        var today = PhononSolver.Solve(model, FiniteSample.Create(4, 3, 5), options);
        var real = PhononSolver.Solve(model, RealSpaceSample.Box(4, 3, 5), options);

        Assert.Equal(today.Summary.ModeCount, real.Summary.ModeCount);
        Assert.Equal(today.Summary.RigidModesExcluded, real.Summary.RigidModesExcluded);
        Assert.Equal(today.Modes.Length, real.Modes.Length);
        for (var i = 0; i < today.Modes.Length; i++)
        {
            Approx.Equal(today.Modes[i].FrequencyThz, real.Modes[i].FrequencyThz, 1e-10, $"mode level {i}", 1e-9);
            Assert.Equal(today.Modes[i].Multiplicity, real.Modes[i].Multiplicity);
        }

        for (var t = 0; t < today.Thermal.Length; t++)
        {
            Approx.Equal(today.Thermal[t].HeatCapacityJPerMolK, real.Thermal[t].HeatCapacityJPerMolK, 1e-10, "Cv");
            Approx.Equal(today.Thermal[t].EntropyJPerMolK, real.Thermal[t].EntropyJPerMolK, 1e-10, "S");
            Approx.Equal(today.Thermal[t].FreeEnergyJPerMol, real.Thermal[t].FreeEnergyJPerMol, 1e-10, "F");
        }

        for (var d = 0; d < today.Displacements.Length; d++)
        {
            Approx.Equal(today.Displacements[d].MsdXNm2!.Value, real.Displacements[d].MsdXNm2!.Value, 1e-9, "msd x");
        }

        Approx.Equal(today.Summary.MaxFrequencyThz, real.Summary.MaxFrequencyThz, 1e-12, "max freq");
        Assert.Equal(today.Summary.Gaps.Length, real.Summary.Gaps.Length);
        for (var g = 0; g < today.Summary.Gaps.Length; g++)
        {
            Approx.Equal(today.Summary.Gaps[g].LowerThz, real.Summary.Gaps[g].LowerThz, 1e-10, "gap lower");
            Approx.Equal(today.Summary.Gaps[g].UpperThz, real.Summary.Gaps[g].UpperThz, 1e-10, "gap upper");
        }

        Assert.Equal(today.Dos.Total.Length, real.Dos.Total.Length);
        for (var b = 0; b < today.Dos.Total.Length; b++)
        {
            Approx.Equal(today.Dos.Total[b], real.Dos.Total[b], 1e-9, $"dos bin {b}", 1e-9);
        }

        Assert.Equal(0, real.Surface!.SurfaceSites);
        Approx.Equal(1.0, real.Surface.PeriodicCvAtReferenceJPerMolK!.Value / real.Summary.HeatCapacityJPerMolK!.Value, 1e-10, "Cv ratio");
    }

    [Fact]
    public void A_free_3D_cluster_has_six_zero_modes_and_central_springs_are_rotationally_invariant()
    {
        var result = PhononSolver.Solve(Crystals.FccCentral(), RealSpaceSample.Sphere(1.0), Options);
        Assert.Equal(6, result.Summary.RigidModesExcluded);
        Assert.Equal(result.Summary.RigidModesExcluded, result.Summary.ZeroModesExcluded); // none beyond the rigid ones: not floppy
        Assert.Equal(3, result.Surface!.RigidRotations);
        Assert.Equal(0.0, result.Surface.RotationDefectThz); // below round-off: reported as exactly zero
        Assert.Equal(6, result.Modes[0].Multiplicity); // the zero level
        Assert.Equal(0.0, result.Modes[0].FrequencyThz);
    }

    [Fact]
    public void Transverse_springs_break_rotational_invariance_and_the_rotations_are_projected_out()
    {
        var result = PhononSolver.Solve(Crystals.RockSalt(), RealSpaceSample.Sphere(0.9), Options);
        Assert.Equal(6, result.Summary.RigidModesExcluded);
        Assert.Equal(result.Summary.RigidModesExcluded, result.Summary.ZeroModesExcluded); // none beyond the rigid ones: not floppy
        Assert.True(result.Surface!.RotationDefectThz > 0.01, $"rotation defect {result.Surface.RotationDefectThz} THz");
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(1.0)]
    public void A_flake_with_in_plane_motion_has_two_translations_and_its_turn_in_the_plane(double transverse)
    {
        // In-plane motion: the rigid motions are two translations and the rotation about the normal.
        // Central springs leave the turn free (an exact zero, not a floppy mode); transverse springs
        // resist it, so it is projected out and its frequency reported, as for a 3D cluster.
        var model = CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", Vec3.Zero, 20)],
            [new ShellSpring("A", "A", 1, 10, transverse), new ShellSpring("A", "A", 2, 4, 0)], degreesOfFreedom: DegreesOfFreedom.InPlane);
        var result = PhononSolver.Solve(model, RealSpaceSample.Sphere(1.0, dimension: 2), Options);
        Assert.Equal(3, result.Summary.RigidModesExcluded);
        Assert.Equal(3, result.Summary.ZeroModesExcluded);
        Assert.Equal(1, result.Surface!.RigidRotations);
        Assert.Equal(3, result.Modes[0].Multiplicity);
        if (transverse == 0)
        {
            Assert.Equal(0.0, result.Surface.RotationDefectThz);
        }
        else
        {
            Assert.True(result.Surface.RotationDefectThz > 0.01, $"rotation defect {result.Surface.RotationDefectThz} THz");
        }
    }

    [Fact]
    public void A_free_straight_chain_has_three_translations_and_two_rotations()
    {
        var model = CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10, 0)], [new BondSpring("A", "A", new IntVec3(2, 0, 0), 0, 2)]);
        var result = PhononSolver.Solve(model, RealSpaceSample.Box(12, 1, 1, Boundary.Free), Options);
        Assert.Equal(5, result.Summary.RigidModesExcluded);
        Assert.Equal(2, result.Surface!.RigidRotations);
        Assert.Equal(result.Summary.RigidModesExcluded, result.Summary.ZeroModesExcluded); // none beyond the rigid ones: not floppy
    }

    [Fact]
    public void Atoms_that_lost_no_nearest_neighbour_are_interior_even_where_no_hop_path_reaches_them()
    {
        // Three sites at 0, 0.25 and 0.65 of a 0.6 nm chain cell: a's and b's nearest neighbours are each other in
        // the same cell, c's is a in the next cell, so in ten free cells only the last c lost a nearest neighbour
        // (README, Surface and layers: counted by hand). The nearest-neighbour hops from it reach nobody; the random-case
        // audit (docs/outside-checks.md, Round 26) found the 29 unreached atoms put in the surface layer.
        var model = CrystalModel.Create(
            Lattice.Chain(0.6),
            [new Site("a", "a", Vec3.Zero, 20), new Site("b", "b", new Vec3(0.25, 0, 0), 30), new Site("c", "c", new Vec3(0.65, 0, 0), 40)],
            [new ShellSpring("a", "b", 1, 10), new ShellSpring("b", "c", 1, 8), new ShellSpring("c", "a", 1, 12)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);
        var result = PhononSolver.Solve(model, RealSpaceSample.Box(10, 1, 1, Boundary.Free), Options);
        Assert.Equal(1, result.Surface!.SurfaceSites);
        Assert.Equal(29, result.Surface.InteriorSites);
        Assert.Equal(2, result.Surface.LayerCount);
        Assert.NotNull(result.Surface.MsdInteriorNm2);
    }

    [Fact]
    public void A_free_chain_that_lost_no_nearest_neighbour_has_every_atom_interior_and_their_mean_displacement()
    {
        // Two sites 0.211 a apart: each atom's only nearest neighbour is its partner in the same cell, so four free
        // cells cut only second-shell (b-a across cells) and a-a springs; no atom lost a nearest neighbour (README,
        // Surface and layers). Reference: the exact mode sum of the 8 x 8 scalar spring matrix, the translation left
        // out, <u_i^2> = sum_k hbar / (2 omega_k) coth(hbar omega_k / 2 kT) e_ik^2 / m_i (common practice, no source;
        // NumPy eigh, docs/free-sample-msd-check/reference.py): mean over the 8 atoms 4.616011265594499e-4 nm^2 at 300 K, site a
        // 4.221538668652963e-4, site b 5.010483862536036e-4. Main left msd_interior_nm2 empty here.
        var model = CrystalModel.Create(
            Lattice.Chain(0.5),
            [new Site("a", "a", Vec3.Zero, 20), new Site("b", "b", new Vec3(0.211, 0, 0), 30)],
            [new ShellSpring("a", "b", 1, 10), new ShellSpring("a", "b", 2, 6), new ShellSpring("a", "a", 1, 3)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);
        var result = PhononSolver.Solve(model, RealSpaceSample.Box(4, 1, 1, Boundary.Free), Options with { TemperaturesK = [300], ReferenceTemperatureK = 300 });
        var s = result.Surface!;
        Assert.Equal(0, s.SurfaceSites);
        Assert.Equal(8, s.InteriorSites);
        Assert.Equal(0, s.LayerCount);
        Assert.Null(s.MsdSurfaceNm2);
        Approx.Equal(4.221538668652963e-4, result.Displacements.Single(d => d.Site == 0).MsdXNm2, 1e-9, "site a");
        Approx.Equal(5.010483862536036e-4, result.Displacements.Single(d => d.Site == 1).MsdXNm2, 1e-9, "site b");
        Approx.Equal(4.616011265594499e-4, s.MsdInteriorNm2, 1e-9, "interior = every atom");
    }

    [Fact]
    public void A_cut_with_fewer_atoms_of_one_site_weights_the_interior_mean_by_each_sites_atoms()
    {
        // Sites a, b, c at 0, 0.211 and 0.55 of a 0.5 nm chain cell; nearest neighbours a-b, b-a, c-b, all in one cell.
        // A sphere of 0.56 nm about 0.1055 a keeps a b c of cell -1, a b c of cell 0 and a b of cell 1: nobody lost a
        // nearest neighbour, and c has two atoms where a and b have three. Exact mode sum of the 8 x 8 scalar matrix
        // (springs a-b 10, b-c 6, c-a of the next cell 8 N/m; as in the test above, common practice, no source;
        // docs/free-sample-msd-check/reference.py): mean over the 8 atoms 7.106682440574467e-4 nm^2 at 300 K, site c
        // 4.900803373844632e-4 (the unweighted mean of the three sites' values would be 6.86e-4).
        var model = CrystalModel.Create(
            Lattice.Chain(0.5),
            [new Site("a", "a", Vec3.Zero, 20), new Site("b", "b", new Vec3(0.211, 0, 0), 30), new Site("c", "c", new Vec3(0.55, 0, 0), 40)],
            [new ShellSpring("a", "b", 1, 10), new ShellSpring("b", "c", 1, 6), new ShellSpring("c", "a", 1, 8)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);
        var sphere = RealSpaceSample.Sphere(0.56, dimension: 1) with { Shape = new SphereShape(0.56) { CentreFractional = new Vec3(0.1055, 0, 0) } };
        var result = PhononSolver.Solve(model, sphere, Options with { TemperaturesK = [300], ReferenceTemperatureK = 300 });
        var s = result.Surface!;
        Assert.Equal(8, s.AtomCount);
        Assert.Equal(0, s.SurfaceSites);
        Assert.Equal(0, s.LayerCount);
        Assert.Null(s.MsdSurfaceNm2);
        Approx.Equal(4.900803373844632e-4, result.Displacements.Single(d => d.Site == 2).MsdXNm2, 1e-9, "site c");
        Approx.Equal(7.106682440574467e-4, s.MsdInteriorNm2, 1e-9, "interior = every atom");
    }

    [Fact]
    public void A_wire_keeps_the_rotation_about_its_axis_as_a_fourth_zero_mode()
    {
        var result = PhononSolver.Solve(Crystals.FccCentral(), RealSpaceSample.Cylinder(0.45, axis: 2, cells: 6, Boundary.Periodic), Options);
        Assert.Equal(4, result.Summary.RigidModesExcluded);
        Assert.Equal(1, result.Surface!.RigidRotations);
        Assert.Equal(result.Summary.RigidModesExcluded, result.Summary.ZeroModesExcluded); // none beyond the rigid ones: not floppy
        Assert.Equal("cylinder", result.Surface.Shape);
    }

    [Fact]
    public void Layers_count_nearest_neighbour_hops_from_the_surface_and_each_layer_dos_holds_its_components()
    {
        var result = PhononSolver.Solve(Crystals.ScalarSimpleCubic(), RealSpaceSample.Box(5, 5, 5, Boundary.Free, Boundary.Free, Boundary.Free), Options);
        var s = result.Surface!;
        Assert.Equal(3, s.LayerCount);
        Assert.Equal([98L, 26L, 1L], s.LayerDos.Select(l => l.Sites));
        var width = result.Dos.FrequencyThz[1] - result.Dos.FrequencyThz[0];
        foreach (var layer in s.LayerDos)
        {
            Approx.Equal(1.0, layer.DensityPerThzPerAtom.Sum() * width, 1e-12, $"layer {layer.Layer} integral");
        }

        Approx.Equal(1.0, result.Dos.Total.Sum() * width, 1e-12, "total integral (branches)");

        // Every mode's weight is shared among the atoms, so the layers' densities, each times its atoms, add up
        // to the total per cell times the 125 cells, bin by bin (a sum rule, common practice, no source).
        var top = result.Dos.Total.Max() * 125;
        for (var b = 0; b < result.Dos.Total.Length; b++)
        {
            var sum = s.LayerDos.Sum(l => l.Sites * l.DensityPerThzPerAtom[b]);
            Tolerance.AssertClose(result.Dos.Total[b] * 125, sum, 0, 1e-12 * top, $"bin {b}");
        }
    }

    [Fact]
    public void Surface_atoms_vibrate_more_and_soft_surface_modes_raise_the_low_temperature_heat_capacity()
    {
        var result = PhononSolver.Solve(Crystals.FccCentral(), RealSpaceSample.Box(5, 5, 5, Boundary.Free, Boundary.Free, Boundary.Free), Options with { ReferenceTemperatureK = 300 });
        var s = result.Surface!;
        Assert.True(s.MsdSurfaceNm2 > 1.2 * s.MsdInteriorNm2, $"surface {s.MsdSurfaceNm2} vs interior {s.MsdInteriorNm2} nm^2");
        var ratioCold = result.Thermal[0].HeatCapacityJPerMolK / s.PeriodicCvJPerMolK[0]!.Value;
        var ratioHot = result.Thermal[2].HeatCapacityJPerMolK / s.PeriodicCvJPerMolK[2]!.Value;
        Assert.True(ratioCold > 1.5, $"Cv ratio at 5 K {ratioCold}");
        Assert.True(Math.Abs(ratioHot - 1) < 0.05, $"Cv ratio at 300 K {ratioHot}");
        Assert.True(s.SurfaceModeFraction is > 0 and < 1, $"surface-mode fraction {s.SurfaceModeFraction}");
        Assert.Equal("5x5x5", s.PeriodicCells);
    }

    private static double Sin2(int k, int n) => Math.Pow(Math.Sin(k * Math.PI / (2 * n)), 2);

    private static void AssertModes(double[] expectedThz, PointResult result)
    {
        var top = expectedThz.Max();
        var actual = result.Modes.SelectMany(l => Enumerable.Repeat(l.FrequencyThz, (int)l.Multiplicity)).Order().ToArray();
        var expected = expectedThz.Order().ToArray();
        Assert.Equal(expected.Length, actual.Length);
        for (var i = 0; i < expected.Length; i++)
        {
            Tolerance.AssertClose(expected[i], actual[i], 0, 1e-9 * top, $"mode {i}");
        }
    }
}
