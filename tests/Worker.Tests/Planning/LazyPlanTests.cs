using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>
/// A worker plans a sweep it did not submit lazily when the submit kept every point: ids computed
/// when asked for, the sweep's definition checked instead of every id. The lazy plan must be the
/// submitted one point for point, and must refuse what the full check refused.
/// </summary>
public sealed class LazyPlanTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private const string Grid = """
        [[sweep.axes]]
        path = "model.sites.A.mass_amu"
        values = [1, 2, 3, 4, 5, 6, 7]
        [[sweep.axes]]
        path = "sample.cells"
        values = [4, 5, 6]
        """;

    private const string Drawn = """
        combine = "latin_hypercube"
        count = 9
        seed = 3
        [[sweep.axes]]
        path = "model.sites.A.mass_amu"
        range = { from = 1.0, to = 9.0 }
        [[sweep.axes]]
        path = "model.springs[0].longitudinal_n_per_m"
        range = { from = 5.0, to = 50.0 }
        """;

    /// <summary>Points 1 and 3 the same: the planner collapses them.</summary>
    private const string Repeating = Some.RepeatingZipSweep;

    [Theory]
    [InlineData(Grid)]
    [InlineData(Drawn)]
    public void A_lazy_plan_has_the_submitted_points_ids_and_definition(string sweep)
    {
        var path = _dir.Write("job.toml", Some.ChainJob(sweep: sweep));
        var text = File.ReadAllText(path);
        var full = JobFileLoader.Load(path, text);
        var lazy = JobFileLoader.Load(path, text, lazy: true);

        Assert.NotNull(full.DefinitionHash);
        Assert.Equal(full.DefinitionHash, lazy.DefinitionHash);
        Assert.Equal("", lazy.SpecHash);
        Assert.Equal(full.Points.Count, lazy.Points.Count);
        Assert.Equal(full.Points.Select(p => (p.PointId, p.Index)), lazy.Points.Select(p => (p.PointId, p.Index)));
        Assert.Equal(full.Points.Select(p => string.Join(",", p.Parameters.Select(kv => $"{kv.Key}={kv.Value}"))),
            lazy.Points.Select(p => string.Join(",", p.Parameters.Select(kv => $"{kv.Key}={kv.Value}"))));
        Assert.Equal(full.Axes.Select(a => string.Join(",", a.Values)), lazy.Axes.Select(a => string.Join(",", a.Values)));
        Assert.Equal(full.Axes.Select(a => a.Drawn), lazy.Axes.Select(a => a.Drawn));

        // Found by its index; an id that is not the one at that index is not in the plan (no search of every id).
        Assert.True(lazy.Points.TryFind(full.Points[5].PointId, 5, out var found));
        Assert.Equal(full.Points[5].PointId, found.PointId);
        Assert.False(lazy.Points.TryFind(full.Points[5].PointId, 6, out _));
    }

    [Fact]
    public void The_definition_changes_with_a_value_the_base_model_or_the_number_of_points()
    {
        var baseline = Some.Load(_dir, Some.ChainJob(sweep: Grid), "a.toml").DefinitionHash;
        var value = Some.Load(_dir, Some.ChainJob(sweep: Grid.Replace("values = [4, 5, 6]", "values = [4, 5, 7]", StringComparison.Ordinal)), "b.toml").DefinitionHash;
        var model = Some.Load(_dir, Some.ChainJob(sweep: Grid).Replace("constant_nm = 0.5", "constant_nm = 0.6", StringComparison.Ordinal), "c.toml").DefinitionHash;
        var count = Some.Load(_dir, Some.ChainJob(sweep: Grid.Replace("values = [4, 5, 6]", "values = [4, 5]", StringComparison.Ordinal)), "d.toml").DefinitionHash;

        Assert.Equal(4, new[] { baseline, value, model, count }.Distinct().Count());
    }

    [Fact]
    public void A_plan_that_collapsed_points_has_no_definition_and_is_planned_in_full_by_workers()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: Repeating));

        Assert.Equal(1, plan.DuplicatePointsCollapsed);
        Assert.Null(plan.DefinitionHash);
    }

    [Fact]
    public void A_worker_refuses_a_sweep_whose_definition_differs_and_plans_one_that_matches_lazily()
    {
        var path = _dir.Write("job.toml", Some.ChainJob(sweep: Grid));
        var submitted = JobFileLoader.Load(path);
        SweepRecord Record(string? definition) => RecordOf(submitted, "test-chain-" + submitted.SpecHash[..8]) with { DefinitionHash = definition, SourcePath = path };

        var plan = new JobFilePlanSource().Get(Record(submitted.DefinitionHash));
        Assert.Equal(submitted.SpecHash, plan.SpecHash);
        Assert.Equal(submitted.Points.Select(p => p.PointId), plan.Points.Select(p => p.PointId));

        var refused = Assert.Throws<PlanUnavailableException>(() => new JobFilePlanSource().Get(Record("0000000000000000")));
        Assert.Contains("differs on this machine from the submitted one", refused.Message, StringComparison.Ordinal);

        // Without a definition (a sweep submitted by an earlier version) every point is planned and the spec hash compared.
        var full = new JobFilePlanSource().Get(Record(null));
        Assert.Equal(submitted.SpecHash, full.SpecHash);
        var wrongSpec = Record(null) with { SpecHash = "0000000000000000" };
        Assert.Throws<PlanUnavailableException>(() => new JobFilePlanSource().Get(wrongSpec));
    }

    [Theory]
    [InlineData(Grid)]
    [InlineData(Drawn)]
    public void The_submitting_process_keeps_a_lazy_plan_that_takes_ids_as_registered_and_has_every_point(string sweep)
    {
        var path = _dir.Write("job.toml", Some.ChainJob(sweep: sweep));
        var submitted = JobFileLoader.Load(path);
        var source = new JobFilePlanSource();
        source.AddSubmitted("the-sweep", submitted);
        var kept = source.Get(RecordOf(submitted, "the-sweep") with { SpecHash = "not read: the plan was added", SourcePath = "/nowhere/job.toml", SpecText = "" });

        Assert.NotSame(submitted, kept);
        Assert.Equal(submitted.SpecHash, kept.SpecHash);
        Assert.Equal(submitted.DefinitionHash, kept.DefinitionHash);
        for (var i = 0; i < submitted.Points.Count; i++)
        {
            // Found at its index with the id the catalog hands over (the submitted plan's), with the submitted parameters.
            Assert.True(kept.Points.TryFind(submitted.Points[i].PointId, i, out var found));
            Assert.Equal((submitted.Points[i].PointId, i), (found.PointId, found.Index));
            Assert.Equal(submitted.Points[i].Parameters.Select(kv => $"{kv.Key}={kv.Value}"), found.Parameters.Select(kv => $"{kv.Key}={kv.Value}"));

            // The ids it computes itself, where it must (a failure's candidates row), are the submitted ones.
            Assert.Equal(submitted.Points[i].PointId, kept.Points.IdAt(i));
        }

        Assert.False(kept.Points.TryFind(submitted.Points[0].PointId, submitted.Points.Count, out _));
        Assert.False(kept.Points.TryFind(submitted.Points[0].PointId, -1, out _));
    }

    [Fact]
    public void A_submitted_plan_that_collapsed_points_is_kept_as_it_is()
    {
        var path = _dir.Write("job.toml", Some.ChainJob(sweep: Repeating));
        var submitted = JobFileLoader.Load(path);
        var source = new JobFilePlanSource();
        source.AddSubmitted("the-sweep", submitted);

        Assert.Same(submitted, source.Get(RecordOf(submitted, "the-sweep") with { SourcePath = path }));
    }

    /// <summary>The catalog's record of <paramref name="plan"/> submitted as <paramref name="sweepId"/> (no definition hash).</summary>
    private SweepRecord RecordOf(SweepPlan plan, string sweepId) => new()
    {
        SweepId = sweepId,
        Name = plan.SweepName,
        Description = "",
        State = SweepState.Queued,
        SpecHash = plan.SpecHash,
        SourcePath = plan.SourcePath,
        SpecText = plan.SpecText,
        OutputFolder = _dir.Path,
        Axes = plan.Axes,
        Tables = ["points"],
        EngineVersion = "9.9.9-test",
        CreatedAt = DateTimeOffset.UnixEpoch,
        ChunkCount = 1,
        Counts = SweepCounts.Empty,
    };
}
