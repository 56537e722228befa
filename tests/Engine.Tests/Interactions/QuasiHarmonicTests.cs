using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QuasiHarmonic;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Interactions;

public class QuasiHarmonicTests
{
    // An invented Lennard-Jones fcc crystal relaxed to its static minimum; a finite 4 x 4 x 4 crystal has exact modes.
    private static CrystalModel Lj(double massAmu = 40)
    {
        var given = CrystalModel.Create(Lattice.FaceCentredCubic(0.53), [new Site("X", "X", Vec3.Zero, massAmu)],
            potentials: [new PotentialTerm("X", "X", new LennardJonesPotential(0.0104, 0.34), 0.85)]);
        return given.Scaled(StaticLattice.Analyse(given)!.EquilibriumScale);
    }

    private static readonly FiniteSample Crystal = FiniteSample.Create(4, 4, 4);

    private static SolveOptions Options(params double[] temperatures) => new()
    {
        TemperaturesK = [.. temperatures],
        ReferenceTemperatureK = temperatures[^1],
        PartialDos = false,
        MeanSquareDisplacement = false,
        Expansion = new ExpansionOptions(),
    };

    /// <summary>All mode frequencies (rad/s, ascending, zero modes left out) of the finite crystal at a lattice scale (same pairs as at the minimum).</summary>
    private static double[] Modes(CrystalModel model, double scale)
    {
        var result = PhononSolver.Solve(model.Scaled(scale, scaleCutoffs: true), Crystal, new SolveOptions { TemperaturesK = [10], ModeListMaxModes = 100_000, PartialDos = false, MeanSquareDisplacement = false });
        return [.. result.Modes.SelectMany(m => Enumerable.Repeat(m.FrequencyThz * 2e12 * Math.PI, (int)m.Multiplicity)).Where(w => w > 1e-3 * 2e12 * Math.PI).Order()];
    }

    /// <summary>Mode Grueneisen parameters -d ln omega / d ln V by central differences at scale s (modes paired by rank).</summary>
    private static (double[] Omega, double[] Gamma) ModeGammas(CrystalModel model, double s)
    {
        const double h = 1e-4;
        var (minus, centre, plus) = (Modes(model, s * (1 - h)), Modes(model, s), Modes(model, s * (1 + h)));
        var dLnV = 3 * (Math.Log(1 + h) - Math.Log(1 - h));
        return (centre, [.. centre.Select((_, i) => -(Math.Log(plus[i]) - Math.Log(minus[i])) / dLnV)]);
    }

    private static double ModeHeatCapacity(double omega, double t)
    {
        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * t);
        return x * x * Math.Exp(x) / Math.Pow(Math.Exp(x) - 1, 2);
    }

    [Fact]
    public void Alpha_V_equals_gamma_Cv_over_B_T_V_against_the_directly_minimised_volume()
    {
        // Quasi-harmonic identity alpha_V = gamma Cv / (B_T V), gamma the Cv-weighted mean of the mode Grueneisen
        // parameters (Grueneisen's relation; Ashcroft and Mermin, ch. 25, from memory). alpha_V here comes from the
        // minimised volumes at T -+ 1 K, gamma from the modes themselves at V(T): two independent routes.
        const double t = 40;
        var model = Lj();
        var result = PhononSolver.Solve(model, Crystal, Options(t - 1, t, t + 1));
        var rows = result.Expansion!.Rows;
        Assert.All(rows, r => Assert.Null(r.Breakdown));
        var alphaDirect = (Math.Log(rows[2].VolumeRatio!.Value) - Math.Log(rows[0].VolumeRatio!.Value)) / 2;

        var row = rows[1];
        var scale = row.LatticeConstantNm!.Value / model.Lattice.ConstantNm;
        var (omega, gamma) = ModeGammas(model, scale);
        var weights = omega.Select(w => ModeHeatCapacity(w, t)).ToArray();
        var gammaModes = weights.Zip(gamma, (c, g) => c * g).Sum() / weights.Sum();

        var volumePerMol = Math.Pow(row.LatticeConstantNm.Value * 1e-9, 3) / 4 * PhysicalConstants.AvogadroPerMol;
        var predicted = gammaModes * row.CvJPerMolK!.Value / (row.IsothermalBulkModulusGpa!.Value * 1e9 * volumePerMol);
        Approx.Equal(gammaModes, row.Grueneisen!.Value, 1e-3, "thermal Grueneisen parameter = Cv-weighted mode mean");
        Approx.Equal(alphaDirect, predicted, 1e-3, "alpha_V from dV/dT against gamma Cv / (B_T V)");
        Approx.Equal(row.VolumeExpansionPerK!.Value, alphaDirect, 1e-3, "reported alpha_V against dV/dT");
        Approx.Equal(row.VolumeExpansionPerK.Value / 3, row.LinearExpansionPerK!.Value, 1e-12, "alpha_L = alpha_V / 3");
        Assert.True(row.CpJPerMolK > row.CvJPerMolK);
        Assert.Equal(7, result.Expansion.ScalesSolved.Length);
        Assert.Equal(7, result.Expansion.VolumesUsed);
    }

    [Fact]
    public void At_high_temperature_the_classical_limits_hold()
    {
        // Classical limit (T >> theta_D): Cv -> 3R per mole of atoms (Dulong-Petit) and the thermal Grueneisen
        // parameter -> the plain mean of the mode parameters, since every mode weighs kB (Ashcroft and Mermin,
        // ch. 23 and 25, from memory). A mass of 4e5 amu puts theta_D near 1 K, so 25 K is deep in that limit
        // while the expansion stays small (kB T about 0.2 eps).
        const double t = 25;
        var model = Lj(4e5);
        var row = PhononSolver.Solve(model, Crystal, Options(t)).Expansion!.AtReference;
        Assert.Null(row.Breakdown);
        Approx.Equal(3 * PhysicalConstants.GasConstantJPerMolK * 63 / 64, row.CvJPerMolK!.Value, 1e-4, "Cv (3 rigid translations of 192 modes left out)");
        var (_, gamma) = ModeGammas(model, row.LatticeConstantNm!.Value / model.Lattice.ConstantNm);
        Approx.Equal(gamma.Average(), row.Grueneisen!.Value, 2e-3, "gamma -> plain mean of the mode parameters");
    }

    [Fact]
    public void At_zero_temperature_there_is_no_expansion_and_the_zero_point_motion_expands_the_lattice()
    {
        var result = PhononSolver.Solve(Lj(), Crystal, Options(0, 10));
        var zero = result.Expansion!.Rows[0];
        Assert.Equal(0, zero.VolumeExpansionPerK);
        Assert.Equal(0, zero.CvJPerMolK!.Value, 12);
        Assert.Equal(zero.CvJPerMolK, zero.CpJPerMolK);
        Assert.Null(zero.Grueneisen);
        Assert.True(zero.VolumeRatio > 1, "zero-point motion pushes the volume above the static minimum");
        Assert.True(result.Expansion.Rows[1].VolumeRatio > zero.VolumeRatio);
    }

    [Fact]
    public void Volumes_are_added_while_a_minimum_lies_beyond_them_and_a_runaway_is_reported_not_extrapolated()
    {
        // Zero-point motion alone stretches this light crystal by about 1.3 %; at 60 K it is 3.7 %, beyond a grid
        // that ends at +2 %: volumes are added (one step at a time, up to three times that) and find the same
        // state as a grid that reaches it. At 80 K F(V) has no minimum up to the limit: the lattice runs away
        // (the quasi-harmonic approximation fails well below the melting of such a soft crystal).
        var narrow = PhononSolver.Solve(Lj(), Crystal, Options(10, 60, 80) with { Expansion = new ExpansionOptions { LargestLinearStrain = 0.02 } }).Expansion!;
        var wide = PhononSolver.Solve(Lj(), Crystal, Options(10, 60)).Expansion!;
        Approx.Equal(wide.Rows[1].VolumeRatio!.Value, narrow.Rows[1].VolumeRatio!.Value, 1e-5, "V(60 K)");
        Approx.Equal(wide.Rows[1].VolumeExpansionPerK!.Value, narrow.Rows[1].VolumeExpansionPerK!.Value, 3e-3, "alpha_V(60 K): the fits differ with the spacing");
        Assert.Equal(7, wide.ScalesSolved.Length);
        Assert.Equal(17, narrow.ScalesSolved.Length);
        Approx.Equal(1.06, narrow.ScalesSolved[^1] / narrow.ScalesSolved[1], 1e-12, "extended to three times the largest strain");

        var runaway = narrow.Rows[2];
        Assert.Contains("no minimum of F(V) up to +6.0% linear strain from the static minimum", runaway.Breakdown, StringComparison.Ordinal);
        Assert.Null(runaway.LatticeConstantNm);
        Assert.Null(runaway.VolumeExpansionPerK);
        Assert.Null(runaway.IsothermalBulkModulusGpa);
        Assert.Null(runaway.Grueneisen);
        Assert.Null(runaway.CpJPerMolK);
        Assert.Null(narrow.Rows[0].Breakdown);
    }

    [Fact]
    public void An_unstable_lattice_as_given_gets_no_quasi_harmonic_numbers_but_the_way_to_them()
    {
        // Stretched 18 % past the static minimum the nearest pairs sit beyond the inflection of the
        // potential (phi'' < 0 past r = (26/7)^(1/6) sigma, about 1.24 sigma; common practice, no source): the point is
        // unstable, and its expansion rows say so instead of showing the state around the minimum.
        var stretched = CrystalModel.Create(Lattice.FaceCentredCubic(0.62), [new Site("X", "X", Vec3.Zero, 40)],
            potentials: [new PotentialTerm("X", "X", new LennardJonesPotential(0.0104, 0.34), 0.85)]);
        var conductivity = new ConductivityOptions { Umklapp = new UmklappScattering(), CheckMeshConvergence = false };
        var result = PhononSolver.Solve(stretched, Crystal, Options(20, 40) with { Conductivity = conductivity });
        Assert.False(result.Summary.Stable);
        Assert.Equal(2, result.Expansion!.Rows.Length);
        Assert.All(result.Expansion.Rows, r =>
        {
            Assert.StartsWith("not computed: the lattice as given is unstable; relax = true", r.Breakdown, StringComparison.Ordinal);
            Assert.Null(r.LatticeConstantNm);
            Assert.Null(r.CpJPerMolK);
            Assert.Null(r.Grueneisen);
        });
        Assert.Equal(0, result.Expansion.VolumesUsed);
        Assert.Equal(1.0, Assert.Single(result.Expansion.ScalesSolved));
        Assert.Null(result.Conductivity);
    }

    [Fact]
    public void Expansion_needs_potentials()
    {
        var e = Assert.Throws<ModelException>(() => PhononSolver.Solve(Crystals.FccCentral(), Crystal, Options(100)));
        Assert.Equal("output.expansion", e.Problems.Single().Where);
    }

    [Fact]
    public void The_conductivity_takes_the_computed_Grueneisen_parameter_when_none_is_given_and_says_so()
    {
        var model = Lj();
        var conductivity = new ConductivityOptions { Umklapp = new UmklappScattering(), CheckMeshConvergence = false };
        var options = Options(50) with { Conductivity = conductivity };
        var computed = PhononSolver.Solve(model, BulkSample.Uniform(3, 6), options);
        var gamma = computed.Expansion!.AtReference.Grueneisen!.Value;
        Assert.Equal("quasi_harmonic", computed.Conductivity!.GrueneisenSource);
        Assert.Equal(gamma, computed.Conductivity.GrueneisenParameter);
        Assert.InRange(gamma, 1.5, 4.0);

        // The same as giving that value by hand.
        var given = PhononSolver.Solve(model, BulkSample.Uniform(3, 6), options with { Expansion = null, Conductivity = conductivity with { GrueneisenParameter = gamma } });
        Assert.Equal(given.Conductivity!.AtReference.KappaWPerMK, computed.Conductivity.AtReference.KappaWPerMK, 10);
        Assert.Equal("given", given.Conductivity.GrueneisenSource);

        // At 0 K there is no thermal Grueneisen parameter: the Umklapp channel cannot run and says what to give.
        var cold = Assert.Throws<ModelException>(() => PhononSolver.Solve(model, BulkSample.Uniform(3, 6), Options(0) with { Conductivity = conductivity }));
        Assert.Equal("output.conductivity.grueneisen_parameter", cold.Problems.Single().Where);
    }

    [Fact]
    public void Mode_Grueneisen_parameters_along_the_path_match_finite_differences_of_the_frequencies()
    {
        // gamma_i = -d ln omega_i / d ln V at a general wave vector (no degeneracy): against the frequencies of the
        // lattice scaled by 1 -+ 1e-3 at the same reduced q (common practice, no source).
        var model = Lj();
        var path = new DispersionPath([new PathCorner("A", new Vec3(0.11, 0.23, 0.31)), new PathCorner("B", new Vec3(0.5, 0, 0.5))], 3);
        var options = Options(50) with { Dispersion = path, Expansion = new ExpansionOptions { ModeGrueneisen = true } };
        var rows = PhononSolver.Solve(model, Crystal, options).Dispersion.Where(r => r.PathIndex == 0).OrderBy(r => r.Branch).ToList();
        double[] Frequencies(double s)
        {
            var r = PhononSolver.Solve(model.Scaled(s, scaleCutoffs: true), Crystal, new SolveOptions { TemperaturesK = [50], Dispersion = path, PartialDos = false, MeanSquareDisplacement = false });
            return [.. r.Dispersion.Where(x => x.PathIndex == 0).OrderBy(x => x.Branch).Select(x => x.FrequencyThz)];
        }

        const double h = 1e-3;
        var (minus, plus) = (Frequencies(1 - h), Frequencies(1 + h));
        for (var b = 0; b < 3; b++)
        {
            var numeric = -(Math.Log(plus[b]) - Math.Log(minus[b])) / (3 * (Math.Log(1 + h) - Math.Log(1 - h)));
            Approx.Equal(numeric, rows[b].ModeGrueneisen!.Value, 1e-5, $"branch {b}");
        }

        var gammaPoint = PhononSolver.Solve(model, Crystal, options with { Dispersion = new DispersionPath([new PathCorner("G", Vec3.Zero), new PathCorner("X", new Vec3(0.5, 0, 0.5))], 2) })
            .Dispersion.Where(r => r.PathIndex == 0);
        Assert.All(gammaPoint, r => Assert.Null(r.ModeGrueneisen));
    }
}
