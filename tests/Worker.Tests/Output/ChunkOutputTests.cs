using System.Text.Json;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;
using Serilog;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>Part files of chunks, read back by DuckDB (an independent Parquet reader).</summary>
public sealed class ChunkOutputTests : IDisposable
{
    private readonly TempFolder _dir = new();
    private readonly SqliteSweepCatalog _catalog;
    private readonly MemoryPlanSource _plans = new();

    public ChunkOutputTests()
    {
        _catalog = new SqliteSweepCatalog(_dir.Combine("store.db"), new SteppingTime());
    }

    public void Dispose()
    {
        _catalog.Dispose();
        _dir.Dispose();
    }

    [Fact]
    public async Task Points_table_has_typed_columns_and_units_metadata()
    {
        var (sweep, chunks, _) = Setup();
        var solver = new FakeSolver { FailModel = [sweep.Plan.Points[1].PointId] };
        await Runner(solver).RunAsync(sweep.Id, chunks[0], default);

        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(sweep.Folder, "points"));
        var types = db.Types(points);
        Assert.Equal("VARCHAR", types["point_id"]);
        Assert.Equal("DOUBLE", types[SomeSweep.MassColumn]);
        Assert.Equal("BIGINT", types[SomeSweep.CellsColumn]);
        Assert.Equal("DOUBLE", types["cv_j_per_mol_k"]);
        Assert.Equal("INTEGER", types["attempt"]);
        Assert.Equal("BOOLEAN", types["stable"]);
        Assert.Equal("TIMESTAMP WITH TIME ZONE", types["started_at"]);
        Assert.Equal("VARCHAR", types["error"]);

        var units = JsonSerializer.Deserialize<Dictionary<string, string>>((string)db.Scalar(
            $"SELECT decode(value) FROM parquet_kv_metadata('{Path.Combine(sweep.Folder, "points", "part-" + chunks[0] + ".parquet")}') WHERE decode(key) = 'latticesweep.units'")!)!;
        Assert.Equal("J/(mol K)", units["cv_j_per_mol_k"]);
        Assert.Equal("THz", units["max_freq_thz"]);
        Assert.Equal("amu", units[SomeSweep.MassColumn]);

        var rows = db.Rows($"SELECT point_id, state, failure_kind, error, cv_j_per_mol_k, {SomeSweep.MassColumn}, gap_count, largest_gap_width_thz, engine_version FROM {points} ORDER BY point_index");
        Assert.Equal(2, rows.Count);
        Assert.Equal("done", rows[0][1]);
        Assert.Equal(20 + 10.0 / 100, (double)rows[0][4]!, 12);
        Assert.Equal(10.0, rows[0][5]);
        Assert.Equal(2, rows[0][6]);
        Assert.Equal("9.9.9-test", rows[0][8]);
        Assert.Equal("failed", rows[1][1]);
        Assert.Equal("model", rows[1][2]);
        Assert.Contains("invented model problem", (string)rows[1][3]!, StringComparison.Ordinal);
        Assert.Null(rows[1][4]);
    }

    [Fact]
    public async Task A_points_part_carries_its_column_summary_and_first_rows_and_they_say_what_DuckDB_reads_from_the_part()
    {
        var (sweep, chunks, _) = Setup();
        var solver = new FakeSolver { FailModel = [sweep.Plan.Points[1].PointId] };
        await Runner(solver).RunAsync(sweep.Id, chunks[0], default);

        using var db = new DuckDb();
        var part = Path.Combine(sweep.Folder, "points", "part-" + chunks[0] + ".parquet");
        var file = "read_parquet('" + part.Replace("'", "''", StringComparison.Ordinal) + "')";
        using var json = JsonDocument.Parse((string)db.Scalar($"SELECT decode(value) FROM parquet_kv_metadata('{part}') WHERE decode(key) = '{ColumnSummary.Key}'")!);
        var root = json.RootElement;
        Assert.Equal(Convert.ToInt64(db.Scalar($"SELECT count(*) FROM {file}"), System.Globalization.CultureInfo.InvariantCulture), root.GetProperty("rows").GetInt64());
        foreach (var (name, type) in db.Types(file))
        {
            var facts = root.GetProperty("columns").GetProperty(name);
            Assert.Equal(Convert.ToInt64(db.Scalar($"SELECT count(\"{name}\") FROM {file}"), System.Globalization.CultureInfo.InvariantCulture), facts.GetProperty("count").GetInt64());
            if (type is "DOUBLE" or "INTEGER" or "BIGINT")
            {
                var row = db.Rows($"SELECT count(\"{name}\"), min(\"{name}\"), max(\"{name}\") FROM {file} WHERE isfinite(\"{name}\"::DOUBLE)").Single();
                Assert.Equal(Convert.ToInt64(row[0], System.Globalization.CultureInfo.InvariantCulture), facts.GetProperty("finite").GetInt64());
                if (facts.GetProperty("finite").GetInt64() > 0)
                {
                    Assert.Equal(Convert.ToDouble(row[1], System.Globalization.CultureInfo.InvariantCulture), facts.GetProperty("min").GetDouble());
                    Assert.Equal(Convert.ToDouble(row[2], System.Globalization.CultureInfo.InvariantCulture), facts.GetProperty("max").GetDouble());
                }
            }

            if (!type.StartsWith("TIMESTAMP", StringComparison.Ordinal))
            {
                // Every distinct value is listed here (two rows), in row order (the part is sorted by point id).
                var distinct = db.Rows($"SELECT \"{name}\" FROM {file} WHERE \"{name}\" IS NOT NULL ORDER BY point_id").Select(r => Convert.ToString(r[0], System.Globalization.CultureInfo.InvariantCulture)).Distinct().ToList();
                Assert.Equal(distinct, facts.GetProperty("distinct").EnumerateArray().Select(v => v.ValueKind == JsonValueKind.String ? v.GetString() : Convert.ToString(v.ValueKind switch
                {
                    JsonValueKind.True => true,
                    JsonValueKind.False => false,
                    _ => type == "DOUBLE" ? v.GetDouble() : (object)v.GetInt64(),
                }, System.Globalization.CultureInfo.InvariantCulture)).ToList());
                Assert.False(facts.GetProperty("more").GetBoolean());
            }
        }

        // One done and one failed point: the rows per state and flags.
        var marks = root.GetProperty("marks").EnumerateArray().Select(m => (m[0].GetString(), m[3].GetInt64())).OrderBy(m => m.Item1, StringComparer.Ordinal).ToList();
        Assert.Equal(db.Rows($"SELECT state, count(*) FROM {file} GROUP BY state ORDER BY state").Select(r => ((string?)r[0], Convert.ToInt64(r[1], System.Globalization.CultureInfo.InvariantCulture))).ToList(), marks);

        // The part's first rows in plan order: their plan indexes, ids and cells as DuckDB orders the part.
        using var first = JsonDocument.Parse((string)db.Scalar($"SELECT decode(value) FROM parquet_kv_metadata('{part}') WHERE decode(key) = '{PartFirstRows.Key}'")!);
        var planned = db.Rows($"SELECT point_index, point_id, state, {SomeSweep.MassColumn}, cv_j_per_mol_k FROM {file} ORDER BY point_index LIMIT {FirstLoadFacts.PageRowsKept}");
        Assert.Equal(planned.Select(r => Convert.ToInt64(r[0], System.Globalization.CultureInfo.InvariantCulture)), first.RootElement.GetProperty("point_index").EnumerateArray().Select(v => v.GetInt64()));
        var page = first.RootElement.GetProperty("first_page");
        var ids = db.Rows($"SELECT point_id FROM {file}").Select(r => (string)r[0]!).ToList();
        Assert.Equal(planned.Select(r => (string)r[1]!), page.GetProperty("rows").EnumerateArray().Select(v => ids[v.GetInt32()]));
        Assert.Equal(planned.Select(r => (string)r[1]!), page.GetProperty("columns").GetProperty("point_id").EnumerateArray().Select(v => v.GetString()));
        Assert.Equal(planned.Select(r => (string)r[2]!), page.GetProperty("columns").GetProperty("state").EnumerateArray().Select(v => v.GetString()));
        Assert.Equal(planned.Select(r => (double)r[3]!), page.GetProperty("columns").GetProperty(SomeSweep.MassColumn).EnumerateArray().Select(v => v.GetDouble()));
        Assert.Equal(planned.Select(r => r[4] is double d ? d : (double?)null), page.GetProperty("columns").GetProperty("cv_j_per_mol_k").EnumerateArray().Select(v => v.ValueKind == JsonValueKind.Null ? null : (double?)v.GetDouble()));

        // Tables other than points/ carry none (their parts are not summed anywhere).
        Assert.All(Directory.GetFiles(sweep.Folder, "part-*.parquet", SearchOption.AllDirectories).Where(f => !f.Contains(Path.DirectorySeparatorChar + "points" + Path.DirectorySeparatorChar, StringComparison.Ordinal)),
            f => Assert.Empty(db.Rows($"SELECT 1 FROM parquet_kv_metadata('{f}') WHERE decode(key) IN ('{ColumnSummary.Key}', '{PartFirstRows.Key}')")));
    }

    [Fact]
    public async Task Thermal_dos_and_mode_tables_carry_point_ids_parameters_and_scaled_units()
    {
        var (sweep, chunks, _) = Setup();
        await Runner(new FakeSolver()).RunAsync(sweep.Id, chunks[0], default);

        using var db = new DuckDb();
        var thermal = DuckDb.Glob(Path.Combine(sweep.Folder, "thermal"));
        var types = db.Types(thermal);
        Assert.Equal("DOUBLE", types["cv_j_per_kg_k"]);
        Assert.Equal("DOUBLE", types["cv_j_per_cell_k"]);
        var row = db.Rows($"SELECT cv_j_per_mol_k, cv_j_per_kg_k, cv_j_per_cell_k, debye_temperature_k FROM {thermal} WHERE point_id = '{sweep.Plan.Points[0].PointId}' AND temperature_k = 300").Single();
        var perMol = (double)row[0]!;
        // per kg = per mol / molar mass (10 g/mol here); per cell = per mol x 2 sites / Avogadro (CODATA 2018 exact N_A)
        Assert.Equal(perMol / 0.010, (double)row[1]!, 9);
        Assert.Equal(1.0, (double)row[2]! / (perMol * 2 / 6.02214076e23), 12);
        Assert.Null(row[3]);

        var dos = DuckDb.Glob(Path.Combine(sweep.Folder, "dos"));
        Assert.Equal(2L * 15, db.Scalar($"SELECT count(*) FROM {dos}"));
        Assert.Equal(2L * 5, db.Scalar($"SELECT count(*) FROM {dos} WHERE curve = 'total' AND site IS NULL"));
        Assert.Equal(2L * 2, db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(sweep.Folder, "modes"))}"));
        Assert.Equal(2L, db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(sweep.Folder, "sound_speeds"))}"));
        Assert.False(Directory.Exists(Path.Combine(sweep.Folder, "dispersion")));
    }

    [Fact]
    public async Task A_chunk_executed_twice_leaves_no_duplicate_rows()
    {
        var (sweep, chunks, _) = Setup();
        var solver = new FakeSolver();

        // First run of chunk 0 writes its parts, then the process dies before the catalog hears of it.
        using (var crashing = new CrashBeforeCompleteCatalog(_catalog))
        {
            var dying = new ChunkRunner(crashing, _plans, solver, new SteppingTime(), new LoggerConfiguration().CreateLogger(), FastRetry, "dies:1");
            await Assert.ThrowsAsync<SimulatedCrashException>(() => dying.RunAsync(sweep.Id, chunks[0], default));
        }

        Assert.True(File.Exists(Path.Combine(sweep.Folder, "points", $"part-{chunks[0]}.parquet")));

        // The queue hands chunk 0 out again: it runs again and replaces its parts.
        await Runner(solver).RunAsync(sweep.Id, chunks[0], default);
        await Runner(solver).RunAsync(sweep.Id, chunks[1], default);
        Assert.Equal(2, solver.Calls[sweep.Plan.Points[0].PointId]);

        // A further delivery after the chunk finished is refused by the catalog: nothing recomputed.
        await Runner(solver).RunAsync(sweep.Id, chunks[0], default);
        Assert.Equal(2, solver.Calls[sweep.Plan.Points[0].PointId]);
        Assert.Equal(1, solver.Calls[sweep.Plan.Points[2].PointId]);

        using var db = new DuckDb();
        foreach (var table in new[] { "points", "thermal", "dos", "modes", "mean_square_displacements", "sound_speeds" })
        {
            var glob = DuckDb.Glob(Path.Combine(sweep.Folder, table));
            var perPoint = db.Rows($"SELECT point_id, count(*) FROM {glob} GROUP BY point_id");
            Assert.Equal(4, perPoint.Count);
            Assert.Single(perPoint.Select(r => (long)r[1]!).Distinct());
        }

        Assert.Equal(4L, db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(sweep.Folder, "points"))}"));
        Assert.Equal(2, db.Scalar($"SELECT attempt FROM {DuckDb.Glob(Path.Combine(sweep.Folder, "points"))} WHERE point_id = '{sweep.Plan.Points[0].PointId}'"));
        Assert.Empty(Directory.EnumerateFiles(sweep.Folder, "*.tmp", SearchOption.AllDirectories));
    }

    [Fact]
    public async Task A_chunk_run_again_removes_what_a_killed_writer_of_it_left_and_nothing_of_other_chunks()
    {
        var (sweep, chunks, _) = Setup();
        var writing = Directory.CreateDirectory(Path.Combine(sweep.Folder, "points", ParquetPartWriter.WritingFolderName)).FullName;
        var left = Path.Combine(writing, $".part-{chunks[0]}.{Guid.NewGuid():N}.tmp");
        var otherChunks = Path.Combine(writing, $".part-{chunks[1]}.{Guid.NewGuid():N}.tmp");
        File.WriteAllText(left, "half a part");
        File.WriteAllText(otherChunks, "another chunk's part in flight");

        await Runner(new FakeSolver()).RunAsync(sweep.Id, chunks[0], default);

        Assert.False(File.Exists(left));
        Assert.True(File.Exists(otherChunks));
        Assert.True(File.Exists(Path.Combine(sweep.Folder, "points", $"part-{chunks[0]}.parquet")));
        Assert.Empty(Directory.EnumerateFiles(Path.Combine(sweep.Folder, "points"), "*.tmp"));
        using var db = new DuckDb();
        Assert.Equal(2L, db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(sweep.Folder, "points"))}"));
    }

    [Fact]
    public async Task Model_and_engine_failures_are_recorded_once_and_not_retried()
    {
        var (sweep, chunks, _) = Setup();
        var solver = new FakeSolver { FailModel = [sweep.Plan.Points[0].PointId], FailEngine = [sweep.Plan.Points[1].PointId] };
        await Runner(solver).RunAsync(sweep.Id, chunks[0], default);

        Assert.Equal(1, solver.Calls[sweep.Plan.Points[0].PointId]);
        Assert.Equal(1, solver.Calls[sweep.Plan.Points[1].PointId]);
        var points = _catalog.GetChunkPoints(sweep.Id, chunks[0]);
        Assert.Equal(FailureKind.Model, points[0].FailureKind);
        Assert.Equal(FailureKind.Engine, points[1].FailureKind);
        Assert.Contains("InvalidOperationException: invented engine defect", points[1].Error, StringComparison.Ordinal);
        Assert.Equal(FailureOrigin.Solver, FailureText.Split(points[1].Error).Origin);
        Assert.DoesNotContain(chunks[0], _catalog.RequeueUnfinished(sweep.Id));
    }

    [Fact]
    public async Task A_NaN_in_a_result_fails_that_point_alone_as_an_engine_error_without_retrying_the_chunk()
    {
        var (sweep, chunks, _) = Setup();
        var bad = sweep.Plan.Points[1].PointId;
        var solver = new FakeSolver { NaNResult = [bad] };

        // The chunk ends normally (no exception for the queue to retry) and each point is solved once.
        await Runner(solver).RunAsync(sweep.Id, chunks[0], default);

        Assert.All(solver.Calls.Values, n => Assert.Equal(1, n));
        var points = _catalog.GetChunkPoints(sweep.Id, chunks[0]);
        Assert.Equal(PointState.Done, points[0].State);
        Assert.Equal(PointState.Failed, points[1].State);
        Assert.Equal(FailureKind.Engine, points[1].FailureKind);
        Assert.Contains("NaN", points[1].Error, StringComparison.Ordinal);
        Assert.Contains("points/ column cv_j_per_mol_k", points[1].Error, StringComparison.Ordinal);
        Assert.Equal(FailureOrigin.Solver, FailureText.Split(points[1].Error).Origin);
        Assert.DoesNotContain(chunks[0], _catalog.RequeueUnfinished(sweep.Id));

        using var db = new DuckDb();
        var rows = db.Rows($"SELECT point_id, state, failure_kind, cv_j_per_mol_k FROM {DuckDb.Glob(Path.Combine(sweep.Folder, "points"))} ORDER BY point_index");
        Assert.Equal(2, rows.Count);
        Assert.Equal("done", rows[0][1]);
        Assert.Equal(bad, rows[1][0]);
        Assert.Equal("failed", rows[1][1]);
        Assert.Equal("engine", rows[1][2]);
        Assert.Null(rows[1][3]);
    }

    [Fact]
    public async Task Transient_io_faults_are_retried_a_bounded_number_of_times()
    {
        var (sweep, chunks, _) = Setup();
        var solver = new FakeSolver();
        solver.IoFaults[sweep.Plan.Points[0].PointId] = 2;   // recovers on the third try
        solver.IoFaults[sweep.Plan.Points[1].PointId] = 99;  // never recovers
        await Runner(solver).RunAsync(sweep.Id, chunks[0], default);

        var retry = FastRetry;
        Assert.Equal(3, solver.Calls[sweep.Plan.Points[0].PointId]);
        Assert.Equal(retry.Retries + 1, solver.Calls[sweep.Plan.Points[1].PointId]);
        var points = _catalog.GetChunkPoints(sweep.Id, chunks[0]);
        Assert.Equal(PointState.Done, points[0].State);
        Assert.Equal(FailureKind.Io, points[1].FailureKind);
    }

    [Fact]
    public async Task An_unwritable_results_folder_fails_the_chunk_cleanly_and_resume_finishes_it()
    {
        if (OperatingSystem.IsWindows() || Environment.UserName == "root")
        {
            // root ignores folder permissions; the CLI test covers the message, the disk-full case is in the many-machines suite.
            return;
        }

        var (sweep, chunks, _) = Setup();
        Directory.CreateDirectory(sweep.Folder);
        File.SetUnixFileMode(sweep.Folder, UnixFileMode.UserRead | UnixFileMode.UserExecute);
        await Runner(new FakeSolver()).RunAsync(sweep.Id, chunks[0], default);
        Assert.All(_catalog.GetChunkPoints(sweep.Id, chunks[0]), p => Assert.Equal(FailureKind.Io, p.FailureKind));

        File.SetUnixFileMode(sweep.Folder, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute);
        Assert.Contains(chunks[0], _catalog.RequeueUnfinished(sweep.Id));
        await Runner(new FakeSolver()).RunAsync(sweep.Id, chunks[0], default);
        Assert.All(_catalog.GetChunkPoints(sweep.Id, chunks[0]), p => Assert.Equal(PointState.Done, p.State));
    }

    [Fact]
    public async Task Writing_into_a_file_instead_of_a_folder_fails_with_an_io_reason()
    {
        // Works as root too: a results folder path that is a file cannot be created.
        var (sweep, chunks, _) = Setup();
        Directory.CreateDirectory(Path.GetDirectoryName(sweep.Folder)!);
        File.WriteAllText(sweep.Folder, "not a folder");
        await Runner(new FakeSolver()).RunAsync(sweep.Id, chunks[0], default);

        var points = _catalog.GetChunkPoints(sweep.Id, chunks[0]);
        Assert.All(points, p => Assert.Equal(FailureKind.Io, p.FailureKind));
        Assert.All(points, p => Assert.Contains("results could not be written", p.Error, StringComparison.Ordinal));
    }

    private static RetryPolicy FastRetry => new(3, TimeSpan.FromMilliseconds(1));

    private ChunkRunner Runner(FakeSolver solver) =>
        new(_catalog, _plans, solver, new SteppingTime(), new LoggerConfiguration().CreateLogger(), FastRetry, "test:1");

    private ((string Id, string Folder, LatticeSweep.Worker.Planning.SweepPlan Plan) Sweep, IReadOnlyList<string> Chunks, string Root) Setup()
    {
        var plan = SomeSweep.Plan();
        var root = _dir.Combine("results");
        var (id, chunks) = TestCatalog.Register(_catalog, plan, root);
        _plans.Add(id, plan);
        return ((id, _catalog.FindSweep(id)!.OutputFolder, plan), chunks, root);
    }
}
