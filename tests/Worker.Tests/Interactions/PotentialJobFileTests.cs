using LatticeSweep.Engine.Interactions;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Interactions;

/// <summary>Pair potentials in job files: reading, sweeping, relaxing, and bad input located at file, line and key.</summary>
public sealed class PotentialJobFileTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>An invented Lennard-Jones fcc crystal; <paramref name="potential"/> replaces the potential's keys.</summary>
    internal static string LjJob(string potential = "", string sweep = "", string model = "", string output = "") => $"""
        [sweep]
        name = "lj"
        {sweep}

        [model]
        lattice = "fcc"
        constant_nm = 0.54
        {model}

        [[model.sites]]
        label = "X"
        mass_amu = 40.0

        [[model.potentials]]
        from = "X"
        to = "X"
        {(potential.Length > 0 ? potential : "form = \"lennard_jones\"\nwell_depth_ev = 0.0104\nsigma_nm = 0.34\ncutoff_nm = 0.85")}

        [sample]
        kind = "bulk"
        mesh = 4

        [output]
        temperatures_k = [50, 100]
        {output}
        """;

    private JobFileProblem Single(string text, string key)
    {
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems, p => p.Key == key);
        Assert.StartsWith($"{p.File}:{p.Line}:{p.Column}: {p.Key}: ", e.Message, StringComparison.Ordinal);
        return p;
    }

    [Fact]
    public void Umklapp_on_the_quasi_harmonic_Grueneisen_parameter_at_a_reference_of_0_K_is_bad_input_at_that_line()
    {
        // Every point failed when it ran ("undefined at the reference temperature"), and check said none would.
        const string Conductivity = "\n[output.expansion]\nvolumes = 7\n\n[output.conductivity]\numklapp = {}\nboundary = { length_nm = 1000.0 }";
        var text = LjJob(output: "reference_temperature_k = 0" + Conductivity);

        var p = Single(text, "output.reference_temperature_k");

        Assert.Equal(Some.LineOf(text, "reference_temperature_k = 0"), p.Line);
        Assert.Contains("give grueneisen_parameter, or a reference temperature above 0", p.Message, StringComparison.Ordinal);

        // A given gamma, or a reference above 0 K, is fine.
        Assert.NotNull(Some.Load(_dir, LjJob(output: "reference_temperature_k = 0" + Conductivity + "\ngrueneisen_parameter = 1.5")));
        Assert.NotNull(Some.Load(_dir, LjJob(output: "reference_temperature_k = 10" + Conductivity)));
    }

    [Fact]
    public void A_potential_is_read_swept_and_relaxed_to_its_static_minimum()
    {
        var plan = Some.Load(_dir, LjJob(sweep: """
            [[sweep.axes]]
            path = "model.potentials[0].sigma_nm"
            values = [0.33, 0.35]
            """, model: "relax = true"));
        var first = PointBinder.Bind(plan, plan.Points[0]).Model;
        var second = PointBinder.Bind(plan, plan.Points[1]).Model;
        Assert.Equal(new LennardJonesPotential(0.0104, 0.35), second.Potentials.Single().Potential);

        // Relaxed: the nearest-neighbour distance is near 1.09 sigma (the cutoff of 2.4-2.6 sigma shifts it a
        // little), whatever constant_nm was written, and the relaxed model is at its own static minimum.
        Assert.InRange(first.Lattice.ConstantNm / Math.Sqrt(2) / 0.33, 1.07, 1.11);
        Assert.InRange(second.Lattice.ConstantNm / Math.Sqrt(2) / 0.35, 1.07, 1.11);
        Assert.True(Math.Abs(StaticLattice.Analyse(first)!.EquilibriumScale - 1) < 1e-9);
    }

    [Fact]
    public void A_negative_well_depth_is_refused_at_its_line()
    {
        var text = LjJob("form = \"lennard_jones\"\nwell_depth_ev = -0.01\nsigma_nm = 0.34\ncutoff_nm = 0.85");
        var p = Single(text, "model.potentials[0].well_depth_ev");
        Assert.Equal(Some.LineOf(text, "well_depth_ev = -0.01"), p.Line);
        Assert.Contains("must be > 0", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_cutoff_shorter_than_the_nearest_neighbour_says_how_far_to_raise_it()
    {
        var text = LjJob("form = \"lennard_jones\"\nwell_depth_ev = 0.0104\nsigma_nm = 0.34\ncutoff_nm = 0.3");
        var p = Single(text, "model.potentials[0].cutoff_nm");
        Assert.Equal(Some.LineOf(text, "cutoff_nm = 0.3"), p.Line);
        Assert.Contains("shorter than the nearest X-X distance 0.381838 nm", p.Message, StringComparison.Ordinal);
        Assert.Contains("raise cutoff_nm above 0.3818 nm", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_potential_without_a_minimum_in_the_searched_range_is_refused()
    {
        // Born-Mayer repulsion alone: nothing holds the lattice together.
        var text = LjJob("form = \"buckingham\"\nrepulsion_ev = 1000.0\nrho_nm = 0.03\ndispersion_ev_nm6 = 0.0\ncutoff_nm = 0.85");
        var p = Single(text, "model.potentials");
        Assert.Equal(Some.LineOf(text, "[[model.potentials]]"), p.Line);
        Assert.Contains("no minimum", p.Message, StringComparison.Ordinal);
        Assert.Contains("dispersion_ev_nm6 > 0", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_morse_well_whose_minimum_lies_below_the_searched_range_is_told_to_move_the_lattice_constant_not_to_change_buckingham_keys()
    {
        // Many neighbours within the cutoff pull this Morse lattice in to about a = 0.36 nm, below 0.7 x 0.54 nm;
        // the energy falls on contraction across the whole range, but nothing collapses and the job has no
        // repulsion_ev or dispersion_ev_nm6 to change.
        var text = LjJob("form = \"morse\"\nwell_depth_ev = 0.35\nr0_nm = 0.29\nwidth_per_nm = 13.0\ncutoff_nm = 0.62");
        var p = Single(text, "model.potentials");
        Assert.Equal(Some.LineOf(text, "[[model.potentials]]"), p.Line);
        Assert.Contains("keeps falling as the lattice contracts", p.Message, StringComparison.Ordinal);
        Assert.Contains("Give a smaller constant_nm", p.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("repulsion_ev", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Parameters_of_another_form_and_relax_without_potentials_are_refused()
    {
        var text = LjJob("form = \"lennard_jones\"\nwell_depth_ev = 0.0104\nsigma_nm = 0.34\nr0_nm = 0.38\ncutoff_nm = 0.85");
        Assert.Contains("takes well_depth_ev, sigma_nm", Single(text, "model.potentials[0].r0_nm").Message, StringComparison.Ordinal);
        var noPotential = Some.ChainJob().Replace("constant_nm = 0.5", "constant_nm = 0.5\nrelax = true", StringComparison.Ordinal);
        Assert.Contains("needs [[model.potentials]]", Single(noPotential, "model.relax").Message, StringComparison.Ordinal);
        var unknownForm = LjJob("form = \"lennard-jones\"\nwell_depth_ev = 0.0104\nsigma_nm = 0.34\ncutoff_nm = 0.85");
        Assert.Contains("did you mean \"lennard_jones\"", Single(unknownForm, "model.potentials[0].form").Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_second_potential_on_the_same_pair_is_refused_at_its_line()
    {
        // Before, only the engine's model check saw it: `check` listed it in the forecast and `run` failed every point.
        var text = LjJob("""
            form = "lennard_jones"
            well_depth_ev = 0.0104
            sigma_nm = 0.34
            cutoff_nm = 0.85

            [[model.potentials]]
            from = "X"
            to = "X" # the second
            form = "morse"
            well_depth_ev = 0.01
            r0_nm = 0.38
            width_per_nm = 12.0
            cutoff_nm = 0.85
            """);
        var p = Single(text, "model.potentials[1].to");
        Assert.Contains("already has a potential (potentials[0])", p.Message, StringComparison.Ordinal);
        Assert.Equal(Some.LineOf(text, "to = \"X\" # the second"), p.Line);
    }
}
