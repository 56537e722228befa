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

    /// <summary>Creates the catalog tables when missing. Call once after construction.</summary>
    protected void EnsureSchema()
    {
        using var c = Open();
        if (SchemaInPlace(c))
        {
            // Nothing to create, stamp or count: a store this version wrote opens without a write,
            // so a read-only file or a database role that may only read can still show it.
            return;
        }

        using var tx = c.BeginTransaction();
        BeforeSchema(c, tx);
        StoreFormat.Check(c, tx, table => TableExists(c, tx, table));
        foreach (var statement in CatalogSchema.Statements)
        {
            Execute(c, tx, statement);
        }

        Execute(c, tx, FailedIndexStatement);

        StoreFormat.Stamp(c, tx);
        CountOlderSweeps(c, tx);
        tx.Commit();
    }

    /// <summary>Whether the store already has <paramref name="table"/> (in the store's schema on PostgreSQL).</summary>
    protected abstract bool TableExists(DbConnection connection, DbTransaction transaction, string table);

    /// <summary>Whether the store already has the index <paramref name="index"/> (in the store's schema on PostgreSQL).</summary>
    protected abstract bool IndexExists(DbConnection connection, DbTransaction transaction, string index);

    /// <summary>Whether every table and index is there, the store is stamped with this format and every sweep has its counts (reads only).</summary>
    private bool SchemaInPlace(DbConnection c)
    {
        using var tx = BeginRead(c);
        var inPlace = CatalogSchema.Objects(FailedIndexStatement).All(o => o.IsIndex ? IndexExists(c, tx, o.Name) : TableExists(c, tx, o.Name))
            && StoreFormat.IsCurrent(c, tx)
            && !HasUncountedSweeps(c, tx);
        tx.Commit();
        return inPlace;
    }

    public bool Register(NewSweep sweep)
    {
        ArgumentNullException.ThrowIfNull(sweep);

        // One row for the sweep and one per chunk: the points get their rows when their chunk is first claimed.
        using var c = Open();
        using var tx = c.BeginTransaction();
        var chunkCount = (long)(sweep.ChunkCount ?? 0);
        var inserted = Execute(c, tx, """
            INSERT INTO latsweep_sweeps (sweep_id, name, description, state, spec_hash, source_path, spec_text,
                output_folder, axes_json, tables_csv, engine_version, created_ms, started_ms, finished_ms, point_count, chunk_count)
            VALUES (@id, @name, @description, @state, @hash, @source, @spec, @out, @axes, @tables, @engine, @now, NULL, NULL, @points, @chunks)
            ON CONFLICT (sweep_id) DO NOTHING
            """,
            ("id", sweep.SweepId), ("name", sweep.Name), ("description", sweep.Description), ("state", Text(SweepState.Queued)),
            ("hash", sweep.SpecHash), ("source", sweep.SourcePath), ("spec", sweep.SpecText), ("out", sweep.OutputFolder),
            ("axes", CatalogJson.WriteAxes(sweep.Axes)), ("tables", string.Join(',', sweep.Tables)), ("engine", sweep.EngineVersion),
            ("now", Ms(_time.GetUtcNow())), ("points", (long)sweep.Points.Count), ("chunks", chunkCount));
        if (inserted == 0)
        {
            tx.Rollback();
            return false;
        }

        if (sweep.DefinitionHash is { } definition)
        {
            Execute(c, tx, "INSERT INTO latsweep_sweep_definitions (sweep_id, definition_hash) VALUES (@id, @hash)", ("id", sweep.SweepId), ("hash", definition));
        }

        var waiting = Text(PointState.Waiting);
        var buckets = sweep.PointKeys is { } keys ? new PointIdBuckets(keys) : new PointIdBuckets(sweep.Points.Count);
        var values = SweptValueCounts.For(sweep.Axes);
        var written = WriteChunks(c, tx, sweep, waiting, buckets, values);
        using (var bucketRows = BucketRowWriter(c, tx, sweep.SweepId))
        {
            buckets.Write(bucketRows);
        }

        if (written != chunkCount)
        {
            Execute(c, tx, "UPDATE latsweep_sweeps SET chunk_count = @chunks WHERE sweep_id = @id", ("chunks", (long)written), ("id", sweep.SweepId));
        }

        AddCountChange(c, tx, sweep.SweepId, new Dictionary<string, long>(), new Dictionary<string, long> { [waiting] = sweep.Points.Count });
        var tally = AxisTally.For(sweep.Axes);
        tally.AddValues(values.Counts, sweep.Points.Count, waiting);
        AddAxisChange(c, tx, sweep.SweepId, tally.Empty(), tally);
        tx.Commit();
        return true;
    }

    public IReadOnlyList<string> RequeueUnfinished(string sweepId, IReadOnlyCollection<string>? lostChunks = null)
    {
        using var c = Open();
        using var tx = c.BeginTransaction();
        LockSweep(c, tx, sweepId);
        // Pending chunks have no results by definition: waiting ones stay so, cancelled ones wait again.
        var pending = ReadPendingChunks(c, tx, sweepId, null);
        var cancelled = pending.Where(p => p.State == PointState.Cancelled).Sum(p => p.PointCount);
        var columns = EmptyTally(c, tx, sweepId);
        if (cancelled > 0)
        {
            var wasCancelled = columns.Empty();
            foreach (var chunk in pending.Where(p => p.State == PointState.Cancelled))
            {
                AddPendingChunk(c, tx, sweepId, chunk.ChunkId, Text(PointState.Cancelled), wasCancelled);
            }

            AddAxisChange(c, tx, sweepId, wasCancelled, wasCancelled.AllIn(Text(PointState.Waiting)));
            AddCountChange(c, tx, sweepId,
                new Dictionary<string, long> { [Text(PointState.Cancelled)] = cancelled },
                new Dictionary<string, long> { [Text(PointState.Waiting)] = cancelled });
            Execute(c, tx, "UPDATE latsweep_chunks SET pending_state = @waiting WHERE sweep_id = @sweep AND pending_state = @cancelled",
                ("waiting", Text(PointState.Waiting)), ("sweep", sweepId), ("cancelled", Text(PointState.Cancelled)));
        }

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

        // Chunks whose results were recorded but whose files are gone run again whole too.
        if (lostChunks is { Count: > 0 })
        {
            chunks = [.. chunks.Union(lostChunks, StringComparer.Ordinal).Order(StringComparer.Ordinal)];
        }

        // The whole chunk goes back: its part files are rewritten as one (see ChunkRunner).
        foreach (var chunk in chunks)
        {
            var before = ChunkStates(c, tx, sweepId, chunk);
            AddCountChange(c, tx, sweepId, before, new Dictionary<string, long> { [Text(PointState.Waiting)] = before.Values.Sum() });
            var beforeAxes = ChunkTally(c, tx, sweepId, chunk, columns);
            AddAxisChange(c, tx, sweepId, beforeAxes, beforeAxes.AllIn(Text(PointState.Waiting)));
            Execute(c, tx, """
                UPDATE latsweep_points SET state = @waiting, failure_kind = NULL, error = NULL
                WHERE sweep_id = @sweep AND chunk_id = @chunk
                """,
                ("waiting", Text(PointState.Waiting)), ("sweep", sweepId), ("chunk", chunk));
        }

        if (chunks.Count + pending.Count > 0)
        {
            Execute(c, tx, "UPDATE latsweep_sweeps SET state = @queued, finished_ms = NULL WHERE sweep_id = @sweep",
                ("queued", Text(SweepState.Queued)), ("sweep", sweepId));
        }

        tx.Commit();
        return [.. chunks.Concat(pending.Select(p => p.ChunkId)).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal)];
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

        EnsureChunkRows(c, tx, sweepId, chunkId);
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
            var beforeAxes = ChunkTally(c, tx, sweepId, chunkId, EmptyTally(c, tx, sweepId));
            AddAxisChange(c, tx, sweepId, beforeAxes, beforeAxes.Moved(s =>
                s == Text(PointState.Waiting) || s == Text(PointState.Running) ? Text(PointState.Cancelled) : s));
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
        if (before.Keys.Any(s => !AxisTally.IsPending(s)))
        {
            // A chunk run again with points that had ended (waiting to running changes no axis count).
            var beforeAxes = ChunkTally(c, tx, sweepId, chunkId, EmptyTally(c, tx, sweepId));
            AddAxisChange(c, tx, sweepId, beforeAxes, beforeAxes.AllIn(Text(PointState.Running)));
        }
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
        EnsureChunkRows(c, tx, sweepId, chunkId);
        var before = ChunkStates(c, tx, sweepId, chunkId);
        var rows = ChunkRows(c, tx, sweepId, chunkId);
        UpdateCompletedPoints(c, tx, sweepId, chunkId, points);

        AddCountChange(c, tx, sweepId, before, ChunkStates(c, tx, sweepId, chunkId));
        AddCompletedAxes(c, tx, sweepId, rows, points);
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

    /// <summary>
    /// Writes each point's end (state, failure, times) into its row of the chunk; a point given twice
    /// ends as the last one given. Here one prepared UPDATE per point (a round trip each on PostgreSQL).
    /// </summary>
    protected virtual void UpdateCompletedPoints(DbConnection c, DbTransaction tx, string sweepId, string chunkId, IReadOnlyList<PointCompletion> points)
    {
        ArgumentNullException.ThrowIfNull(points);
        using var cmd = Command(c, tx, UpdatePointEndSql);
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
            pDuration.Value = DurationUs(p.DurationSeconds);
            pPoint.Value = p.PointId;
            cmd.ExecuteNonQuery();
        }
    }

    /// <summary>
    /// The points' ends with each point once, as the last one given for it, in the order given: what a chunk's one
    /// statement over all its ends takes (where a point joined twice would end as either).
    /// </summary>
    protected static IReadOnlyList<PointCompletion> LastOfEachPoint(IReadOnlyList<PointCompletion> points)
    {
        ArgumentNullException.ThrowIfNull(points);
        var last = new Dictionary<string, int>(points.Count, StringComparer.Ordinal);
        for (var i = 0; i < points.Count; i++)
        {
            last[points[i].PointId] = i;
        }

        if (last.Count == points.Count)
        {
            return points;
        }

        var once = new List<PointCompletion>(last.Count);
        for (var i = 0; i < points.Count; i++)
        {
            if (last[points[i].PointId] == i)
            {
                once.Add(points[i]);
            }
        }

        return once;
    }

    /// <summary>The UPDATE of one point's end (parameters @sweep, @chunk, @point, @state, @kind, @error, @started, @finished, @duration).</summary>
    protected const string UpdatePointEndSql = """
        UPDATE latsweep_points SET state = @state, failure_kind = @kind, error = @error,
            started_ms = @started, finished_ms = @finished, duration_us = @duration
        WHERE sweep_id = @sweep AND chunk_id = @chunk AND point_id = @point
        """;

    /// <summary>A point's duration as the catalog keeps it, in whole microseconds.</summary>
    internal static long DurationUs(double seconds) => (long)Math.Round(seconds * 1e6);

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

        CancelAxes(c, tx, sweepId);
        long cancelled = Execute(c, tx, "UPDATE latsweep_points SET state = @cancelled WHERE sweep_id = @sweep AND state = @waiting",
            ("cancelled", Text(PointState.Cancelled)), ("sweep", sweepId), ("waiting", Text(PointState.Waiting)));
        cancelled += PendingPoints(c, tx, sweepId, PointState.Waiting);
        Execute(c, tx, "UPDATE latsweep_chunks SET pending_state = @cancelled WHERE sweep_id = @sweep AND pending_state = @waiting",
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
