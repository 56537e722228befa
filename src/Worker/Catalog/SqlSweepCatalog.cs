using System.Collections.Immutable;
using System.Data.Common;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The catalog on a SQL database, written in the SQL that SQLite and PostgreSQL share
/// (<c>INSERT ... ON CONFLICT</c>, <c>@name</c> parameters, BIGINT and TEXT columns). Each back-end
/// supplies its connections and its way to serialise schema creation.
/// </summary>
/// <remarks>
/// Concurrency: every write that changes point states first locks the sweep's row (an UPDATE,
/// which both databases treat as a row or database write lock), then changes the points and adds
/// the change to the sweep's counts (<c>latsweep_sweep_counts</c>) in the same transaction, so
/// the counts stay exact and when two chunks finish at once exactly one of them sees the sweep finished.
/// </remarks>
public abstract partial class SqlSweepCatalog : ISweepCatalog
{
    private readonly TimeProvider _time;

    protected SqlSweepCatalog(TimeProvider time)
    {
        _time = time;
    }

    /// <summary>Opens a new connection (pooled by the provider).</summary>
    protected abstract DbConnection Open();

    /// <summary>Runs inside the schema transaction before the DDL (PostgreSQL takes an advisory lock so concurrent workers do not race).</summary>
    protected virtual void BeforeSchema(DbConnection connection, DbTransaction transaction)
    {
    }

    /// <summary>Runs before a sweep's points are inserted (SQLite enlarges its page cache: a million rows go into three indexes).</summary>
    protected virtual void BeforeBulkInsert(DbConnection connection)
    {
    }

    /// <summary>
    /// Point rows per INSERT statement when a sweep is registered: many, where a statement costs a
    /// round trip to a server; few where the provider binds parameters by name at a cost that
    /// grows with their number (see <see cref="SqliteSweepCatalog"/>).
    /// </summary>
    protected virtual int PointRowsPerInsert => 128;

    /// <summary>Creates the catalog tables when missing. Call once after construction.</summary>
    protected void EnsureSchema()
    {
        using var c = Open();
        using var tx = c.BeginTransaction();
        BeforeSchema(c, tx);
        foreach (var statement in CatalogSchema.Statements)
        {
            Execute(c, tx, statement);
        }

        CountOlderSweeps(c, tx);
        tx.Commit();
    }

    public bool Register(NewSweep sweep)
    {
        ArgumentNullException.ThrowIfNull(sweep);

        // A point id twice is refused by the points' primary key (the whole registration rolls back).
        using var c = Open();
        BeforeBulkInsert(c);
        using var tx = c.BeginTransaction();
        var inserted = Execute(c, tx, """
            INSERT INTO latsweep_sweeps (sweep_id, name, description, state, spec_hash, source_path, spec_text,
                output_folder, axes_json, tables_csv, engine_version, created_ms, started_ms, finished_ms, point_count, chunk_count)
            VALUES (@id, @name, @description, @state, @hash, @source, @spec, @out, @axes, @tables, @engine, @now, NULL, NULL, @points, @chunks)
            ON CONFLICT (sweep_id) DO NOTHING
            """,
            ("id", sweep.SweepId), ("name", sweep.Name), ("description", sweep.Description), ("state", Text(SweepState.Queued)),
            ("hash", sweep.SpecHash), ("source", sweep.SourcePath), ("spec", sweep.SpecText), ("out", sweep.OutputFolder),
            ("axes", CatalogJson.WriteAxes(sweep.Axes)), ("tables", string.Join(',', sweep.Tables)), ("engine", sweep.EngineVersion),
            ("now", Ms(_time.GetUtcNow())), ("points", (long)sweep.Points.Count),
            ("chunks", (long)(sweep.ChunkCount ?? sweep.Points.Select(p => p.ChunkId).Distinct(StringComparer.Ordinal).Count())));
        if (inserted == 0)
        {
            tx.Rollback();
            return false;
        }

        var waiting = Text(PointState.Waiting);
        InsertPoints(c, tx, sweep, waiting);
        AddCountChange(c, tx, sweep.SweepId, new Dictionary<string, long>(), new Dictionary<string, long> { [waiting] = sweep.Points.Count });
        tx.Commit();
        return true;
    }

    /// <summary>Inserts every point of <paramref name="sweep"/> as waiting, inside the registration's transaction.</summary>
    protected virtual void InsertPoints(DbConnection c, DbTransaction tx, NewSweep sweep, string waiting)
    {
        ArgumentNullException.ThrowIfNull(sweep);

        // Many rows per statement: a statement call costs more than the row it inserts (a million points).
        var rowsPerStatement = PointRowsPerInsert;
        DbCommand? full = null;
        try
        {
            for (var start = 0; start < sweep.Points.Count; start += rowsPerStatement)
            {
                var count = Math.Min(rowsPerStatement, sweep.Points.Count - start);
                var insert = count == rowsPerStatement ? full ??= InsertPointsCommand(c, tx, count) : InsertPointsCommand(c, tx, count);
                for (var i = 0; i < count; i++)
                {
                    var point = sweep.Points[sweep.InsertOrder is { } order ? order[start + i] : start + i];
                    var p = insert.Parameters;
                    p[(i * 6) + 0].Value = sweep.SweepId;
                    p[(i * 6) + 1].Value = point.PointId;
                    p[(i * 6) + 2].Value = (long)point.Index;
                    p[(i * 6) + 3].Value = point.ChunkId;
                    p[(i * 6) + 4].Value = waiting;
                    p[(i * 6) + 5].Value = CatalogJson.WriteParameters(point.Parameters);
                }

                insert.ExecuteNonQuery();
                if (insert != full)
                {
                    insert.Dispose();
                }
            }
        }
        finally
        {
            full?.Dispose();
        }
    }

    /// <summary>A prepared INSERT of <paramref name="rows"/> point rows (6 parameters each).</summary>
    private static DbCommand InsertPointsCommand(DbConnection c, DbTransaction tx, int rows)
    {
        var sql = new System.Text.StringBuilder("INSERT INTO latsweep_points (sweep_id, point_id, point_index, chunk_id, state, parameters_json, attempts) VALUES ");
        var cmd = Command(c, tx, "");
        for (var i = 0; i < rows; i++)
        {
            sql.Append(i == 0 ? "" : ", ").Append($"(@s{i}, @p{i}, @i{i}, @c{i}, @t{i}, @j{i}, 0)");
            foreach (var name in new[] { "s", "p", "i", "c", "t", "j" })
            {
                Add(cmd, name + i.ToString(System.Globalization.CultureInfo.InvariantCulture), DBNull.Value);
            }
        }

        cmd.CommandText = sql.ToString();
        cmd.Prepare();
        return cmd;
    }

    public IReadOnlyList<string> RequeueUnfinished(string sweepId)
    {
        using var c = Open();
        using var tx = c.BeginTransaction();
        LockSweep(c, tx, sweepId);
        var chunks = new List<string>();
        using (var cmd = Command(c, tx, $"""
            SELECT DISTINCT chunk_id FROM latsweep_points
            WHERE sweep_id = @sweep AND NOT ({HasResultSql})
            ORDER BY chunk_id
            """))
        {
            Add(cmd, "sweep", sweepId);
            using var r = cmd.ExecuteReader();
            while (r.Read())
            {
                chunks.Add(r.GetString(0));
            }
        }

        // The whole chunk goes back: its part files are rewritten as one (see ChunkRunner).
        foreach (var chunk in chunks)
        {
            var before = ChunkStates(c, tx, sweepId, chunk);
            AddCountChange(c, tx, sweepId, before, new Dictionary<string, long> { [Text(PointState.Waiting)] = before.Values.Sum() });
            Execute(c, tx, """
                UPDATE latsweep_points SET state = @waiting, failure_kind = NULL, error = NULL
                WHERE sweep_id = @sweep AND chunk_id = @chunk
                """,
                ("waiting", Text(PointState.Waiting)), ("sweep", sweepId), ("chunk", chunk));
        }

        if (chunks.Count > 0)
        {
            Execute(c, tx, "UPDATE latsweep_sweeps SET state = @queued, finished_ms = NULL WHERE sweep_id = @sweep",
                ("queued", Text(SweepState.Queued)), ("sweep", sweepId));
        }

        tx.Commit();
        return chunks;
    }

    public ChunkClaim BeginChunk(string sweepId, string chunkId, string workerName)
    {
        using var c = Open();
        using var tx = c.BeginTransaction();
        LockSweep(c, tx, sweepId);
        var sweepState = ReadSweepState(c, tx, sweepId);
        if (sweepState is null)
        {
            tx.Rollback();
            return new ChunkClaim(ChunkDecision.Unknown, []);
        }

        var points = ReadChunkStates(c, tx, sweepId, chunkId);
        if (points.Count == 0)
        {
            tx.Rollback();
            return new ChunkClaim(ChunkDecision.Unknown, []);
        }

        var before = ChunkStates(c, tx, sweepId, chunkId);
        if (sweepState == SweepState.Cancelled)
        {
            var waitingOrRunning = before.GetValueOrDefault(Text(PointState.Waiting)) + before.GetValueOrDefault(Text(PointState.Running));
            var after = new Dictionary<string, long>(before, StringComparer.Ordinal)
            {
                [Text(PointState.Waiting)] = 0,
                [Text(PointState.Running)] = 0,
                [Text(PointState.Cancelled)] = before.GetValueOrDefault(Text(PointState.Cancelled)) + waitingOrRunning,
            };
            AddCountChange(c, tx, sweepId, before, after);
            Execute(c, tx, """
                UPDATE latsweep_points SET state = @cancelled
                WHERE sweep_id = @sweep AND chunk_id = @chunk AND state IN (@waiting, @running)
                """,
                ("cancelled", Text(PointState.Cancelled)), ("sweep", sweepId), ("chunk", chunkId),
                ("waiting", Text(PointState.Waiting)), ("running", Text(PointState.Running)));
            tx.Commit();
            return new ChunkClaim(ChunkDecision.Cancelled, []);
        }

        if (points.All(p => HasResult(p.State, p.Kind)))
        {
            tx.Rollback();
            return new ChunkClaim(ChunkDecision.AlreadyFinished, []);
        }

        var now = Ms(_time.GetUtcNow());
        AddCountChange(c, tx, sweepId, before, new Dictionary<string, long> { [Text(PointState.Running)] = points.Count });
        Execute(c, tx, """
            UPDATE latsweep_points SET state = @running, attempts = attempts + 1, started_ms = @now,
                finished_ms = NULL, duration_us = NULL, failure_kind = NULL, error = NULL, worker = @worker
            WHERE sweep_id = @sweep AND chunk_id = @chunk
            """,
            ("running", Text(PointState.Running)), ("now", now), ("worker", workerName), ("sweep", sweepId), ("chunk", chunkId));
        var started = Execute(c, tx, """
            UPDATE latsweep_sweeps SET state = @running, started_ms = COALESCE(started_ms, @now)
            WHERE sweep_id = @sweep AND state = @queued
            """,
            ("running", Text(SweepState.Running)), ("now", now), ("sweep", sweepId), ("queued", Text(SweepState.Queued)));

        // A late delivery of a chunk whose points failed without results (e.g. its last queue attempt
        // gave up while another copy was still queued) makes a finished sweep run again.
        Execute(c, tx, """
            UPDATE latsweep_sweeps SET state = @running, finished_ms = NULL
            WHERE sweep_id = @sweep AND state IN (@done, @failed)
            """,
            ("running", Text(SweepState.Running)), ("sweep", sweepId), ("done", Text(SweepState.Done)), ("failed", Text(SweepState.Failed)));

        var claimed = ImmutableArray.CreateBuilder<ClaimedPoint>();
        using (var cmd = Command(c, tx, "SELECT point_id, attempts, point_index FROM latsweep_points WHERE sweep_id = @sweep AND chunk_id = @chunk ORDER BY point_index"))
        {
            Add(cmd, "sweep", sweepId);
            Add(cmd, "chunk", chunkId);
            using var r = cmd.ExecuteReader();
            while (r.Read())
            {
                claimed.Add(new ClaimedPoint(r.GetString(0), (int)r.GetInt64(1), (int)r.GetInt64(2)));
            }
        }

        tx.Commit();
        return new ChunkClaim(ChunkDecision.Run, claimed.ToImmutable(), SweepStarted: started > 0);
    }

    public ChunkCompletion CompleteChunk(string sweepId, string chunkId, IReadOnlyList<PointCompletion> points)
    {
        ArgumentNullException.ThrowIfNull(points);
        using var c = Open();
        using var tx = c.BeginTransaction();

        // Lock the sweep row first, then change and count: see the class remarks.
        LockSweep(c, tx, sweepId);
        var before = ChunkStates(c, tx, sweepId, chunkId);
        using (var cmd = Command(c, tx, """
            UPDATE latsweep_points SET state = @state, failure_kind = @kind, error = @error,
                started_ms = @started, finished_ms = @finished, duration_us = @duration
            WHERE sweep_id = @sweep AND chunk_id = @chunk AND point_id = @point
            """))
        {
            Add(cmd, "sweep", sweepId);
            Add(cmd, "chunk", chunkId);
            var pState = Add(cmd, "state", "");
            var pKind = Add(cmd, "kind", DBNull.Value);
            var pError = Add(cmd, "error", DBNull.Value);
            var pStarted = Add(cmd, "started", 0L);
            var pFinished = Add(cmd, "finished", 0L);
            var pDuration = Add(cmd, "duration", 0L);
            var pPoint = Add(cmd, "point", "");
            foreach (var p in points)
            {
                pState.Value = Text(p.State);
                pKind.Value = p.FailureKind is { } k ? Text(k) : DBNull.Value;
                pError.Value = (object?)p.Error ?? DBNull.Value;
                pStarted.Value = Ms(p.StartedAt);
                pFinished.Value = Ms(p.FinishedAt);
                pDuration.Value = (long)Math.Round(p.DurationSeconds * 1e6);
                pPoint.Value = p.PointId;
                cmd.ExecuteNonQuery();
            }
        }

        AddCountChange(c, tx, sweepId, before, ChunkStates(c, tx, sweepId, chunkId));
        var counts = ReadCounts(c, tx, sweepId);
        var state = ReadSweepState(c, tx, sweepId) ?? SweepState.Queued;
        var finishedNow = false;
        if (counts.Unfinished == 0 && state != SweepState.Cancelled)
        {
            var end = counts.Failed > 0 ? SweepState.Failed : SweepState.Done;
            if (end != state || state is SweepState.Queued or SweepState.Running)
            {
                state = end;
                Execute(c, tx, "UPDATE latsweep_sweeps SET state = @state, finished_ms = @now WHERE sweep_id = @sweep",
                    ("state", Text(state)), ("now", Ms(_time.GetUtcNow())), ("sweep", sweepId));
                finishedNow = true;
            }
        }

        tx.Commit();
        return new ChunkCompletion(state, counts, finishedNow);
    }

    public bool Cancel(string sweepId)
    {
        using var c = Open();
        using var tx = c.BeginTransaction();
        var updated = Execute(c, tx, "UPDATE latsweep_sweeps SET state = @cancelled, finished_ms = @now WHERE sweep_id = @sweep",
            ("cancelled", Text(SweepState.Cancelled)), ("now", Ms(_time.GetUtcNow())), ("sweep", sweepId));
        if (updated == 0)
        {
            tx.Rollback();
            return false;
        }

        var cancelled = Execute(c, tx, "UPDATE latsweep_points SET state = @cancelled WHERE sweep_id = @sweep AND state = @waiting",
            ("cancelled", Text(PointState.Cancelled)), ("sweep", sweepId), ("waiting", Text(PointState.Waiting)));
        AddCountChange(c, tx, sweepId,
            new Dictionary<string, long> { [Text(PointState.Waiting)] = cancelled },
            new Dictionary<string, long> { [Text(PointState.Cancelled)] = cancelled });
        tx.Commit();
        return true;
    }

    public virtual void Dispose()
    {
        GC.SuppressFinalize(this);
    }

    /// <summary>SQL condition: the point has its row in the results (done, unstable, or failed for a model or engine reason).</summary>
    private static readonly string HasResultSql =
        $"state IN ('{Text(PointState.Done)}', '{Text(PointState.Unstable)}') OR (state = '{Text(PointState.Failed)}' AND failure_kind IN ('{Text(FailureKind.Model)}', '{Text(FailureKind.Engine)}'))";

    private static bool HasResult(PointState state, FailureKind? kind) =>
        state is PointState.Done or PointState.Unstable || (state == PointState.Failed && kind is { } k && k.HasResult());

    /// <summary>The counts with <paramref name="n"/> more points in <paramref name="state"/>.</summary>
    internal static SweepCounts Count(SweepCounts c, PointState state, long n)
    {
        var x = state switch
        {
            PointState.Waiting => c with { Waiting = c.Waiting + n },
            PointState.Running => c with { Running = c.Running + n },
            PointState.Done => c with { Done = c.Done + n },
            PointState.Failed => c with { Failed = c.Failed + n },
            PointState.Unstable => c with { Unstable = c.Unstable + n },
            _ => c with { Cancelled = c.Cancelled + n },
        };
        return x with { Total = x.Total + n };
    }

    private static SweepState? ReadSweepState(DbConnection c, DbTransaction? tx, string sweepId)
    {
        using var cmd = Command(c, tx, "SELECT state FROM latsweep_sweeps WHERE sweep_id = @sweep");
        Add(cmd, "sweep", sweepId);
        return cmd.ExecuteScalar() is string s ? ParseSweepState(s) : null;
    }

    private static List<(PointState State, FailureKind? Kind)> ReadChunkStates(DbConnection c, DbTransaction tx, string sweepId, string chunkId)
    {
        using var cmd = Command(c, tx, "SELECT state, failure_kind FROM latsweep_points WHERE sweep_id = @sweep AND chunk_id = @chunk");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "chunk", chunkId);
        using var r = cmd.ExecuteReader();
        var list = new List<(PointState, FailureKind?)>();
        while (r.Read())
        {
            list.Add((ParsePointState(r.GetString(0)), r.IsDBNull(1) ? null : ParseFailureKind(r.GetString(1))));
        }

        return list;
    }
}
