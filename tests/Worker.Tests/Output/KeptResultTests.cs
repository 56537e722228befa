using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// What a chunk keeps of each solved point (<see cref="KeptResult"/>) builds the same rows of every table
/// the sweep writes as the Engine's whole result, and leaves out the arrays of the tables it does not write.
/// </summary>
public sealed class KeptResultTests
{
    /// <summary>No table, every table, and each table alone beside points/ and sound_speeds/.</summary>
    public static TheoryData<string, int> Selections()
    {
        var data = new TheoryData<string, int>();
        foreach (var job in new[] { "quickstart.toml", "isotope-mixture.toml", "nanocrystal-surfaces.toml", "thin-film-size.toml", "potential-expansion.toml" })
        {
            for (var selection = -1; selection <= TableCount; selection++)
            {
                data.Add(job, selection);
            }
        }

        return data;
    }

    private const int TableCount = 9;

    [Theory]
    [MemberData(nameof(Selections))]
    public void Rows_from_the_kept_results_equal_the_rows_from_the_whole_results(string job, int selection)
    {
        var plan = JobFileLoader.Load(Path.Combine(Support.Cli.JobsFolder, job));
        var outcomes = LongTableColumnsTests.Outcomes(plan, take: 3);
        var outputs = Selection(selection);
        var kept = outcomes.Select(o => o.Result is null ? o : o with { Result = KeptResult.For(o.Result, outputs) }).ToList();
        var schemas = new ResultSchemas(plan.Axes);

        LongTableColumnsTests.AssertSameCells(ChunkTables.Build(schemas, outputs, outcomes), ChunkTables.Build(schemas, outputs, kept));
    }

    [Fact]
    public void A_sweep_that_writes_no_long_table_keeps_none_of_their_arrays()
    {
        var plan = JobFileLoader.Load(Path.Combine(Support.Cli.JobsFolder, "quickstart.toml"));
        var whole = LongTableColumnsTests.Outcomes(plan, take: 1).Single().Result!;

        var kept = KeptResult.For(whole, Selection(-1));

        // The whole result has every array (so the test leaves something out).
        Assert.NotEmpty(whole.Dos.FrequencyThz);
        Assert.NotEmpty(whole.Thermal);
        Assert.NotEmpty(whole.Modes);
        Assert.NotEmpty(whole.Displacements);
        Assert.Empty(kept.Dos.FrequencyThz);
        Assert.Empty(kept.Dos.Total);
        Assert.Empty(kept.Dos.PartialBySite);
        Assert.Empty(kept.Thermal);
        Assert.Empty(kept.Modes);
        Assert.Empty(kept.Displacements);
        Assert.Empty(kept.Dispersion);

        // What points/ and sound_speeds/ read stays.
        Assert.Same(whole.Summary, kept.Summary);
        Assert.Equal(whole.Dos.Method, kept.Dos.Method);
    }

    /// <summary>-1 no table but points/ and sound_speeds/, <see cref="TableCount"/> every table, otherwise table <paramref name="selection"/> alone.</summary>
    private static OutputSelection Selection(int selection)
    {
        bool On(int table) => selection == TableCount || selection == table;
        return new OutputSelection(Dos: On(0), Thermal: On(1), Dispersion: On(2), Modes: On(3), Displacements: On(4), CumulativeKappa: On(5), Layers: On(6), LayerDos: On(7), Expansion: On(8));
    }
}
