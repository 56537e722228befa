using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// The long tables built straight into column arrays (<see cref="LongTableColumns"/>) hold the same
/// cells, in the same order and array types, as the generic row path they stand in for.
/// </summary>
public sealed class LongTableColumnsTests : IDisposable
{
    // Invented demo model: a two-site chain moving in 3D, swept over a mass (double), the sample
    // kind (text) and the cell count (whole number), partial DOS on.
    private const string Job = $$"""
        [sweep]
        name = "typed-columns"

        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        values = [12.0, 30.0]

        [[sweep.axes]]
        path = "sample.kind"
        values = ["finite", "bulk"]

        [[sweep.axes]]
        path = "sample.cells"
        values = [8, 12]

        {{SweepJobs.ChainModel}}

        [sample]
        kind = "finite"
        cells = 8
        mesh = 16

        [output]
        temperatures_k = [10, 300]
        dos_bins = 20
        partial_dos = true
        """;

    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void Typed_long_tables_equal_the_generic_row_path_cell_by_cell()
    {
        var plan = Some.Load(_dir, Job);
        var outcomes = Outcomes(plan);
        var schemas = new ResultSchemas(plan.Axes);
        var outputs = new OutputSelection(Dos: true, Thermal: true, Dispersion: false, Modes: true, Displacements: true, CumulativeKappa: false, Layers: false, LayerDos: false, Expansion: false);

        var typed = ChunkTables.Build(schemas, outputs, outcomes, typedColumns: true);
        var generic = ChunkTables.Build(schemas, outputs, outcomes, typedColumns: false);

        AssertSameCells(generic, typed);

        // The typed builders did build these tables (no fall-back to the generic path).
        var solved = outcomes.Where(o => o.State == PointState.Done).ToList();
        Assert.NotNull(LongTableColumns.Dos(schemas.Dos, solved));
        Assert.NotNull(LongTableColumns.Thermal(schemas.Thermal, solved));
        Assert.NotNull(LongTableColumns.Displacements(schemas.Displacements, solved));
        Assert.NotNull(LongTableColumns.SoundSpeeds(schemas.SoundSpeeds, solved));
        Assert.NotNull(LongTableColumns.Modes(schemas.Modes, outcomes.Where(o => o.Result is not null).ToList()));

        // Every long table is non-trivial here: several points, partial curves, the sweep's three kinds of axis.
        var dos = typed.Single(t => t.Table == TableNames.Dos);
        Assert.Contains("site", (string?[])dos.Values[dos.Columns.ToList().FindIndex(c => c.Name == "curve")]);
        Assert.All(new[] { TableNames.Dos, TableNames.Modes, TableNames.MeanSquareDisplacements, TableNames.SoundSpeeds, TableNames.Thermal }, name =>
            Assert.True(typed.Single(t => t.Table == name).RowCount > outcomes.Count, name));
    }

    /// <summary>
    /// thermal/'s optional columns (conductivity, a film's confined conductivity, the ordered crystal's
    /// Cv and the standard errors of a disordered sample) are filled by the typed builder as by the row
    /// path: example jobs of jobs/ that compute them, their first four points (one marked unstable,
    /// one failed, as above).
    /// </summary>
    [Theory]
    [InlineData("thin-film-size.toml", "kappa_w_per_m_k")]
    [InlineData("film-thickness.toml", "kappa_confined_w_per_m_k")]
    [InlineData("isotope-mixture.toml", "ordered_cv_j_per_mol_k")]
    [InlineData("isotope-mixture.toml", "cv_stderr_j_per_mol_k")]
    public void Typed_thermal_table_equals_the_row_path_where_its_optional_columns_are_filled(string job, string filledColumn)
    {
        var plan = JobFileLoader.Load(Path.Combine(Support.Cli.JobsFolder, job));
        var outcomes = Outcomes(plan, take: 4);
        var schemas = new ResultSchemas(plan.Axes);
        var solved = outcomes.Where(o => o.State == PointState.Done).ToList();

        var typed = LongTableColumns.Thermal(schemas.Thermal, solved);
        var generic = schemas.Thermal.Rows(solved.SelectMany(o => Enumerable.Range(0, o.Result!.Thermal.Length)
            .Select(i => new RowOf<ThermalValue>(o, ChunkTables.ThermalAt(o.Result, i)))));

        Assert.NotNull(typed);
        AssertSameCells([generic], [typed]);
        var column = typed.Columns.ToList().FindIndex(c => c.Name == filledColumn);
        Assert.Contains(((double?[])typed.Values[column]), v => v is not null);
    }

    [Fact]
    public void A_table_with_a_column_the_typed_builder_does_not_know_is_left_to_the_generic_path()
    {
        var plan = Some.Load(_dir, Job);
        var outcomes = Outcomes(plan).Where(o => o.Result is not null).ToList();
        var schemas = new ResultSchemas(plan.Axes);
        var extended = schemas.Modes with
        {
            Columns = [.. schemas.Modes.Columns, new TableColumn<RowOf<Engine.Results.ModeLevel>, double?>(new ColumnDef("twice_freq_thz", ColumnType.Double, "THz", "test column"), r => 2 * r.Item.FrequencyThz)],
        };

        Assert.Null(LongTableColumns.Modes(extended, outcomes));
        Assert.NotNull(LongTableColumns.Modes(schemas.Modes, outcomes));
    }

    internal static void AssertSameCells(IReadOnlyList<TableRows> generic, IReadOnlyList<TableRows> typed)
    {
        Assert.Equal(generic.Select(t => t.Table), typed.Select(t => t.Table));
        foreach (var (g, t) in generic.Zip(typed))
        {
            Assert.Equal(g.Columns.Select(c => c.Name), t.Columns.Select(c => c.Name));
            Assert.Equal(g.RowCount, t.RowCount);
            for (var c = 0; c < g.Columns.Count; c++)
            {
                Assert.Equal(g.Values[c].GetType(), t.Values[c].GetType());
                for (var r = 0; r < g.RowCount; r++)
                {
                    Assert.True(Equals(g.Cell(r, c), t.Cell(r, c)), $"{g.Table}.{g.Columns[c].Name} row {r}: {g.Cell(r, c)} against {t.Cell(r, c)}");
                }
            }
        }
    }

    /// <summary>Every point (or the first <paramref name="take"/>) solved by the Engine, in point-id order as a chunk passes them; one marked unstable and one failed without a result, so the tables' point filters are crossed too.</summary>
    internal static List<PointOutcome> Outcomes(SweepPlan plan, int? take = null)
    {
        var start = new DateTimeOffset(2026, 1, 2, 3, 4, 5, TimeSpan.Zero);
        var outcomes = new List<PointOutcome>();
        for (var i = 0; i < Math.Min(take ?? int.MaxValue, plan.Points.Length); i++)
        {
            var point = plan.Points[i];
            var result = EnginePointSolver.Instance.Solve(plan, point, default);
            var state = i == 1 ? PointState.Unstable : i == 2 ? PointState.Failed : PointState.Done;
            outcomes.Add(new PointOutcome
            {
                Point = point,
                Attempt = 1,
                State = state,
                FailureKind = state == PointState.Failed ? FailureKind.Engine : null,
                Error = state == PointState.Failed ? "invented failure" : null,
                StartedAt = start.AddMilliseconds(i),
                FinishedAt = start.AddMilliseconds(i + 1),
                DurationSeconds = 0.001,
                Result = state == PointState.Failed ? null : result,
                EngineVersion = "test",
                ChunkId = "c0000",
            });
        }

        return [.. outcomes.OrderBy(o => o.Point.PointId, StringComparer.Ordinal)];
    }
}
