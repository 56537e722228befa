using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>
/// The kernel polynomial method (Weisse, Wellein, Alvermann and Fehske, Rev. Mod. Phys. 78, 275 (2006))
/// against the dense solution of the same free cluster, within its reported statistical error.
/// </summary>
public sealed class KernelPolynomialTests
{
    private static readonly SolveOptions Options = new() { TemperaturesK = [50, 100, 300], ReferenceTemperatureK = 300, DosBins = 100 };

    [Fact]
    public void A_thousand_atom_cluster_matches_its_dense_solution_within_the_reported_error()
    {
        // 959 atoms of an invented fcc crystal with central springs, cut to a sphere of 1.56 nm.
        var sphere = RealSpaceSample.Sphere(1.56);
        var dense = PhononSolver.Solve(Crystals.FccCentral(), sphere with { Method = RealSpaceMethod.Dense }, Options);
        var kpm = PhononSolver.Solve(Crystals.FccCentral(), sphere with
        {
            Method = RealSpaceMethod.KernelPolynomial,
            Kpm = new KpmSettings { Moments = 2048, RandomVectors = 24, Seed = 3 },
        }, Options);

        Assert.Equal("kernel polynomial", kpm.Surface!.Method);
        Assert.Equal(24, kpm.Errors!.Samples);
        Assert.Equal(dense.Surface!.AtomCount, kpm.Surface.AtomCount);
        Assert.Equal(6, kpm.Summary.RigidModesExcluded);

        // Four standard errors, plus what the kernel's finite resolution leaves (a systematic part that
        // the statistical error does not cover: 0.1% for S, whose integrand has ln(omega)).
        for (var t = 0; t < Options.TemperaturesK.Length; t++)
        {
            var error = kpm.Errors.Thermal[t];
            Within(dense.Thermal[t].HeatCapacityJPerMolK, kpm.Thermal[t].HeatCapacityJPerMolK, error.HeatCapacityJPerMolK, 2e-4, $"Cv({Options.TemperaturesK[t]} K)");
            Within(dense.Thermal[t].EntropyJPerMolK, kpm.Thermal[t].EntropyJPerMolK, error.EntropyJPerMolK, 1e-3, $"S({Options.TemperaturesK[t]} K)");
            Within(dense.Thermal[t].InternalEnergyJPerMol, kpm.Thermal[t].InternalEnergyJPerMol, error.InternalEnergyJPerMol, 2e-4, $"U({Options.TemperaturesK[t]} K)");
        }

        Within(dense.Surface.MsdSurfaceNm2!.Value, kpm.Surface.MsdSurfaceNm2!.Value, kpm.Errors.MsdSurfaceNm2!.Value, 0.02, "surface <u^2>");
        Within(dense.Surface.MsdInteriorNm2!.Value, kpm.Surface.MsdInteriorNm2!.Value, kpm.Errors.MsdInteriorNm2!.Value, 0.02, "interior <u^2>");

        // The Lanczos extremes are converged: the top frequency and the confinement gap.
        Approx.Equal(dense.Summary.MaxFrequencyThz, kpm.Summary.MaxFrequencyThz, 1e-6, "top frequency");
        Approx.Equal(dense.Surface.ConfinementGapThz!.Value, kpm.Surface.ConfinementGapThz!.Value, 1e-4, "confinement gap");

        // Every state is in the density: three per atom, the rigid modes at zero as in the dense histogram.
        var width = kpm.Dos.FrequencyThz[1] - kpm.Dos.FrequencyThz[0];
        Approx.Equal(3.0, kpm.Dos.Total.Sum() * width, 2e-3, "integrated DOS");
        foreach (var layer in kpm.Surface.LayerDos)
        {
            Approx.Equal(3.0, layer.DensityPerThzPerAtom.Sum() * width, 0.05, $"layer {layer.Layer} integral");
        }
    }

    [Fact]
    public void A_free_sample_without_surface_atoms_has_the_interior_displacement_of_every_atom_and_its_error()
    {
        // A free 3D flake of two sites 0.211 a apart (each atom's nearest neighbour is its partner in its own cell, so
        // no atom lost one): no surface, every atom interior; the kernel polynomial method's interior mean and its
        // error come from the basis sites' displacement densities, weighted by their atoms, as the dense mean does.
        var model = CrystalModel.Create(
            Lattice.Square(0.5),
            [new Site("a", "a", Vec3.Zero, 20), new Site("b", "b", new Vec3(0.211, 0, 0), 30)],
            [new ShellSpring("a", "b", 1, 10, 2), new ShellSpring("a", "b", 2, 6, 1), new ShellSpring("a", "a", 1, 3, 1)]);
        var flake = RealSpaceSample.Box(8, 8, 1, Boundary.Free, Boundary.Free);
        var dense = PhononSolver.Solve(model, flake with { Method = RealSpaceMethod.Dense }, Options);
        var kpm = PhononSolver.Solve(model, flake with { Method = RealSpaceMethod.KernelPolynomial, Kpm = new KpmSettings { Moments = 2048, RandomVectors = 16, Seed = 5 } }, Options);
        Assert.Equal(0, kpm.Surface!.LayerCount);
        Assert.Null(kpm.Surface.MsdSurfaceNm2);
        Assert.Null(kpm.Errors!.MsdSurfaceNm2);
        Assert.True(kpm.Errors.MsdInteriorNm2 > 0, $"error {kpm.Errors.MsdInteriorNm2}");
        Within(dense.Surface!.MsdInteriorNm2!.Value, kpm.Surface.MsdInteriorNm2!.Value, kpm.Errors.MsdInteriorNm2!.Value, 0.02, "interior <u^2>");
    }

    [Fact]
    public void Auto_takes_the_kernel_polynomial_method_beyond_the_dense_limit()
    {
        var result = PhononSolver.Solve(Crystals.FccCentral(), RealSpaceSample.Sphere(1.0) with { DenseMaxAtoms = 100, Kpm = new KpmSettings { Moments = 256, RandomVectors = 4 } }, Options);
        Assert.Equal("kernel polynomial", result.Surface!.Method);
        Assert.Equal(256, result.Surface.KpmMoments);
        Assert.True(result.Surface.KpmResolutionThz > 0);
        Assert.Equal(Options.TemperaturesK.Length, result.Errors!.Thermal.Length);
    }

    [Fact]
    public void The_same_seed_gives_the_same_numbers()
    {
        var sample = RealSpaceSample.Sphere(0.9) with { Method = RealSpaceMethod.KernelPolynomial, Kpm = new KpmSettings { Moments = 128, RandomVectors = 3, Seed = 11 } };
        var a = PhononSolver.Solve(Crystals.FccCentral(), sample, Options);
        var b = PhononSolver.Solve(Crystals.FccCentral(), sample, Options);
        Assert.Equal(a.Summary.HeatCapacityJPerMolK, b.Summary.HeatCapacityJPerMolK);
        var c = PhononSolver.Solve(Crystals.FccCentral(), sample with { Kpm = sample.Kpm with { Seed = 12 } }, Options);
        Assert.NotEqual(a.Summary.HeatCapacityJPerMolK, c.Summary.HeatCapacityJPerMolK);
    }

    [Fact]
    public void Jackson_kernel_has_the_closed_form_values()
    {
        // g_0 = 1 and g_N-1 = sin(pi/(N+1)) cot(pi/(N+1)) ... evaluated from eq. 71 (Weisse et al. 2006).
        var g = KernelPolynomialDensity.JacksonKernel(8);
        Approx.Equal(1.0, g[0], 1e-15, "g_0");
        var q = Math.PI / 9;
        Approx.Equal((2 * Math.Cos(7 * q) + Math.Sin(7 * q) / Math.Tan(q)) / 9, g[7], 1e-14, "g_7");
        Assert.True(g.Zip(g.Skip(1)).All(p => p.First >= p.Second), "the kernel falls monotonically");
    }

    [Fact]
    public void A_flake_with_in_plane_motion_matches_its_dense_solution_within_the_reported_error()
    {
        // Two components per site: an invented square sheet with in-plane motion, cut to a disc of 317 atoms.
        var model = CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", Vec3.Zero, 20)],
            [new ShellSpring("A", "A", 1, 10, 1), new ShellSpring("A", "A", 2, 4, 0)], degreesOfFreedom: DegreesOfFreedom.InPlane);
        var disc = RealSpaceSample.Sphere(3.0, dimension: 2);
        var dense = PhononSolver.Solve(model, disc with { Method = RealSpaceMethod.Dense }, Options);
        var kpm = PhononSolver.Solve(model, disc with
        {
            Method = RealSpaceMethod.KernelPolynomial,
            Kpm = new KpmSettings { Moments = 1024, RandomVectors = 16, Seed = 3 },
        }, Options);

        Assert.Equal(3, kpm.Summary.RigidModesExcluded); // two translations and the turn in the plane
        for (var t = 0; t < Options.TemperaturesK.Length; t++)
        {
            Within(dense.Thermal[t].HeatCapacityJPerMolK, kpm.Thermal[t].HeatCapacityJPerMolK, kpm.Errors!.Thermal[t].HeatCapacityJPerMolK, 2e-4, $"Cv({Options.TemperaturesK[t]} K)");
        }

        var width = kpm.Dos.FrequencyThz[1] - kpm.Dos.FrequencyThz[0];
        Approx.Equal(2.0, kpm.Dos.Total.Sum() * width, 2e-3, "integrated DOS (two states per atom)");
    }

    [Fact]
    public void A_memory_limit_too_small_for_four_vectors_at_once_runs_one_at_a_time_with_the_same_numbers()
    {
        // Between the two memory models: the blocked recursion does not fit, the one-vector one does.
        var sphere = RealSpaceSample.Sphere(1.2) with
        {
            Method = RealSpaceMethod.KernelPolynomial,
            Kpm = new KpmSettings { Moments = 256, RandomVectors = 5, Seed = 8 },
        };
        var roomy = PhononSolver.Solve(Crystals.FccCentral(), sphere, Options);
        var atoms = roomy.Surface!.AtomCount;
        var springs = 12;
        var plain = atoms * RealSpaceKpmSolver.BytesPerAtom(springs, blocked: false);
        var blocked = atoms * RealSpaceKpmSolver.BytesPerAtom(springs, blocked: true);
        var tight = PhononSolver.Solve(Crystals.FccCentral(), sphere, Options with { MemoryLimitBytes = (plain + blocked) / 2 });
        for (var t = 0; t < Options.TemperaturesK.Length; t++)
        {
            Assert.Equal(roomy.Thermal[t].HeatCapacityJPerMolK, tight.Thermal[t].HeatCapacityJPerMolK);
        }

        var refused = Assert.ThrowsAny<Engine.Errors.ModelException>(() => PhononSolver.Solve(Crystals.FccCentral(), sphere, Options with { MemoryLimitBytes = plain / 2 }));
        Assert.Contains("memory_limit_gib", refused.Message, StringComparison.Ordinal);
    }

    private static void Within(double expected, double actual, double standardError, double relativeSystematic, string what)
    {
        var allowed = (4 * standardError) + (relativeSystematic * Math.Abs(expected));
        Assert.True(Math.Abs(actual - expected) <= allowed,
            $"{what}: dense {expected:G8}, kernel polynomial {actual:G8} +- {standardError:G3} (allowed {allowed:G3})");
    }
}
