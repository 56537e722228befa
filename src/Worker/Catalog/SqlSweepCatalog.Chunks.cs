using System.Buffers;
using System.Data.Common;
using System.Text.Json;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Chunks registered as one row each (<c>latsweep_chunks</c>): a chunk's points are written at
/// submit as one JSON text in the chunk's row and get their own rows in <c>latsweep_points</c> when
/// a worker first claims the chunk (or a cancel, completion or re-queue first touches it). Until then
/// the chunk is pending: its points are all in the chunk's pending state (waiting or cancelled), with
/// no attempts, and every read that lists points takes them from the chunk's text.
/// </summary>
public abstract partial class SqlSweepCatalog
{
    /// <summary>A chunk whose points have no rows yet.</summary>
    private sealed record PendingChunk(string ChunkId, long FirstIndex, long LastIndex, long PointCount, PointState State);

    /// <summary>A chunk's row as <see cref="WriteChunks"/> inserts it: its points' text as UTF-8 in a buffer that is used again after the insert.</summary>
    private sealed record ChunkRow(string ChunkId, long First, long Last, long Count, ArrayBufferWriter<byte> PointsUtf8);

    /// <summary>Chunk rows made ahead of the inserts: enough to keep the inserting thread busy, few enough to hold.</summary>
    private const int ChunkRowsAhead = 4;

    /// <summary>Inserts one sweep's chunk rows, one at a time, inside the register transaction.</summary>
    protected interface IChunkRowInserter : IDisposable
    {
        void Insert(string chunkId, long first, long last, long count, ReadOnlySpan<byte> pointsUtf8);
    }

    /// <summary>The SQL that inserts a chunk's row (parameters @sweep, @chunk, @first, @last, @count, @state, @points).</summary>
    protected const string InsertChunkRowSql = """
        INSERT INTO latsweep_chunks (sweep_id, chunk_id, first_index, last_index, point_count, pending_state, points_json)
        VALUES (@sweep, @chunk, @first, @last, @count, @state, @points)
        """;

    /// <summary>
    /// An inserter of <paramref name="sweepId"/>'s chunk rows (points pending in <paramref name="state"/>):
    /// here an ADO.NET command with the text as a string; SQLite binds the UTF-8 text as it is.
    /// </summary>
    protected virtual IChunkRowInserter ChunkRowInserter(DbConnection c, DbTransaction tx, string sweepId, string state) =>
        new CommandChunkRowInserter(c, tx, sweepId, state);

    /// <summary>A writer of <paramref name="sweepId"/>'s point-id groups (<see cref="PointIdBuckets"/>): here by an ADO.NET command.</summary>
    private protected virtual PointIdBuckets.IRowWriter BucketRowWriter(DbConnection c, DbTransaction tx, string sweepId) =>
        new PointIdBuckets.CommandRowWriter(c, tx, sweepId);

    private sealed class CommandChunkRowInserter : IChunkRowInserter
    {
        private readonly DbCommand _cmd;
        private readonly DbParameter _chunk, _first, _last, _count, _points;

        public CommandChunkRowInserter(DbConnection c, DbTransaction tx, string sweepId, string state)
        {
            _cmd = Command(c, tx, InsertChunkRowSql);
            Add(_cmd, "sweep", sweepId);
            Add(_cmd, "state", state);
            _chunk = Add(_cmd, "chunk", "");
            _first = Add(_cmd, "first", 0L);
            _last = Add(_cmd, "last", 0L);
            _count = Add(_cmd, "count", 0L);
            _points = Add(_cmd, "points", "");
        }

        public void Insert(string chunkId, long first, long last, long count, ReadOnlySpan<byte> pointsUtf8)
        {
            _chunk.Value = chunkId;
            _first.Value = first;
            _last.Value = last;
            _count.Value = count;
            _points.Value = System.Text.Encoding.UTF8.GetString(pointsUtf8);
            _cmd.ExecuteNonQuery();
        }

        public void Dispose() => _cmd.Dispose();
    }

    /// <summary>
    /// Writes one row per chunk of <paramref name="sweep"/> (its points pending, as <paramref name="state"/>); returns the number of chunks.
    /// The rows' texts are made on another thread while this one inserts the rows before them
    /// (a million points: two halves of the work on two cores instead of one after the other), in
    /// a few UTF-8 buffers passed back and forth: no text of a chunk is made twice or kept.
    /// </summary>
    private int WriteChunks(DbConnection c, DbTransaction tx, NewSweep sweep, string state, PointIdBuckets buckets, SweptValueCounts values)
    {
        using var inserter = ChunkRowInserter(c, tx, sweep.SweepId, state);
        using var rows = new System.Collections.Concurrent.BlockingCollection<ChunkRow>(ChunkRowsAhead);
        using var free = new System.Collections.Concurrent.BlockingCollection<ArrayBufferWriter<byte>>();
        for (var i = 0; i < ChunkRowsAhead + 2; i++)
        {
            free.Add(new ArrayBufferWriter<byte>(1 << 16));
        }

        using var stop = new CancellationTokenSource();
        var maker = Task.Run(() =>
        {
            try
            {
                return MakeChunkRows(sweep, rows, free, buckets, values, stop.Token);
            }
            finally
            {
                rows.CompleteAdding();
            }
        });

        try
        {
            foreach (var row in rows.GetConsumingEnumerable())
            {
                inserter.Insert(row.ChunkId, row.First, row.Last, row.Count, row.PointsUtf8.WrittenSpan);
                free.Add(row.PointsUtf8);
            }
        }
        catch
        {
            // An insert failed: stop making rows, and report the insert's error.
            stop.Cancel();
            try
            {
                maker.Wait();
            }
            catch (AggregateException)
            {
            }

            throw;
        }

        // The maker's own error (points of a chunk not consecutive) as it was thrown.
        return maker.GetAwaiter().GetResult();
    }

    /// <summary>The chunk rows of <paramref name="sweep"/>'s points in order, added to <paramref name="rows"/>, each written into a buffer taken from <paramref name="free"/>, every point noted in <paramref name="buckets"/> and its swept values in <paramref name="values"/>; returns the number of chunks.</summary>
    private static int MakeChunkRows(NewSweep sweep, System.Collections.Concurrent.BlockingCollection<ChunkRow> rows,
        System.Collections.Concurrent.BlockingCollection<ArrayBufferWriter<byte>> free, PointIdBuckets buckets, SweptValueCounts values, CancellationToken stop)
    {
        var seen = new HashSet<string>(StringComparer.Ordinal);
        var buffer = free.Take(stop);
        using var w = new Utf8JsonWriter(buffer);
        var text = new ChunkText.Writer();
        string? current = null;
        long first = 0, last = 0, count = 0;

        void Flush()
        {
            ChunkText.Writer.End(w);
            w.Flush();
            rows.Add(new ChunkRow(current!, first, last, count, buffer), stop);
            buffer = free.Take(stop);
        }

        foreach (var point in sweep.Points)
        {
            if (!string.Equals(point.ChunkId, current, StringComparison.Ordinal))
            {
                if (current is not null)
                {
                    Flush();
                }

                if (!seen.Add(point.ChunkId))
                {
                    throw new ArgumentException($"the points of chunk {point.ChunkId} are not consecutive in the sweep's point list", nameof(sweep));
                }

                current = point.ChunkId;
                buffer.ResetWrittenCount();
                w.Reset(buffer);
                text.Start(w);
                first = point.Index;
                last = point.Index;
                count = 0;
            }

            text.Add(w, point.PointId, point.Index, point.Parameters);
            buckets.Add(point.PointId, point.Index);
            values.Add(point.Parameters);
            first = Math.Min(first, point.Index);
            last = Math.Max(last, point.Index);
            count++;
        }

        if (current is not null)
        {
            Flush();
        }

        return seen.Count;
    }

    /// <summary>
    /// Gives a pending chunk's points their rows (in the chunk's pending state) and marks the chunk
    /// as having them (pending state null, text kept); nothing when it has them already or is not a registered chunk. Call under the sweep's lock.
    /// </summary>
    private void EnsureChunkRows(DbConnection c, DbTransaction tx, string sweepId, string chunkId)
    {
        string? state = null, json = null;
        using (var cmd = Command(c, tx, "SELECT pending_state, points_json FROM latsweep_chunks WHERE sweep_id = @sweep AND chunk_id = @chunk AND pending_state IS NOT NULL"))
        {
            Add(cmd, "sweep", sweepId);
            Add(cmd, "chunk", chunkId);
            using var r = cmd.ExecuteReader();
            if (r.Read())
            {
                state = r.GetString(0);
                json = r.GetString(1);
            }
        }

        if (state is null || json is null)
        {
            return;
        }

        InsertChunkPoints(c, tx, sweepId, chunkId, json, state);

        // The text stays: FindPoint finds a point's chunk by it (see CatalogSchema).
        Execute(c, tx, "UPDATE latsweep_chunks SET pending_state = NULL WHERE sweep_id = @sweep AND chunk_id = @chunk",
            ("sweep", sweepId), ("chunk", chunkId));
    }

    /// <summary>Inserts the points of one chunk's JSON text (see <see cref="CatalogSchema"/>) as rows in <paramref name="state"/>.</summary>
    protected virtual void InsertChunkPoints(DbConnection c, DbTransaction tx, string sweepId, string chunkId, string pointsJson, string state)
    {
        var rows = ChunkText.Decode(pointsJson, chunkId);

        // Many rows per statement: a statement costs a round trip to the server.
        const int RowsPerStatement = 128;
        for (var start = 0; start < rows.Count; start += RowsPerStatement)
        {
            var count = Math.Min(RowsPerStatement, rows.Count - start);
            var sql = new System.Text.StringBuilder("INSERT INTO latsweep_points (sweep_id, point_id, point_index, chunk_id, state, parameters_json, attempts) VALUES ");
            using var cmd = Command(c, tx, "");
            Add(cmd, "s", sweepId);
            Add(cmd, "c", chunkId);
            Add(cmd, "t", state);
            for (var i = 0; i < count; i++)
            {
                var n = i.ToString(System.Globalization.CultureInfo.InvariantCulture);
                sql.Append(i == 0 ? "" : ", ").Append($"(@s, @p{n}, @i{n}, @c, @t, @j{n}, 0)");
                var row = rows[start + i];
                Add(cmd, "p" + n, row.PointId);
                Add(cmd, "i" + n, row.Index);
                Add(cmd, "j" + n, row.ParametersJson);
            }

            cmd.CommandText = sql.ToString();
            cmd.ExecuteNonQuery();
        }
    }

    /// <summary>Pending chunks of a sweep (optionally in one state), by first index.</summary>
    private static List<PendingChunk> ReadPendingChunks(DbConnection c, DbTransaction? tx, string sweepId, PointState? state)
    {
        using var cmd = Command(c, tx, $"""
            SELECT chunk_id, first_index, last_index, point_count, pending_state FROM latsweep_chunks
            WHERE sweep_id = @sweep AND pending_state {(state is null ? "IS NOT NULL" : "= @state")}
            ORDER BY first_index, chunk_id
            """);
        Add(cmd, "sweep", sweepId);
        if (state is { } s)
        {
            Add(cmd, "state", Text(s));
        }

        using var r = cmd.ExecuteReader();
        var list = new List<PendingChunk>();
        while (r.Read())
        {
            list.Add(new PendingChunk(r.GetString(0), r.GetInt64(1), r.GetInt64(2), r.GetInt64(3), ParsePointState(r.GetString(4))));
        }

        return list;
    }

    /// <summary>The points of one pending chunk as records (null when the chunk is not pending), in index order.</summary>
    private static List<PointRecord>? ReadPendingPoints(DbConnection c, DbTransaction? tx, string sweepId, string chunkId, Dictionary<string, Planning.AxisValueType> types)
    {
        using var cmd = Command(c, tx, "SELECT pending_state, points_json FROM latsweep_chunks WHERE sweep_id = @sweep AND chunk_id = @chunk AND pending_state IS NOT NULL");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "chunk", chunkId);
        using var r = cmd.ExecuteReader();
        if (!r.Read())
        {
            return null;
        }

        var state = ParsePointState(r.GetString(0));
        return [.. ChunkText.Decode(r.GetString(1), chunkId).OrderBy(p => p.Index).Select(p => new PointRecord
        {
            SweepId = sweepId,
            PointId = p.PointId,
            Index = (int)p.Index,
            ChunkId = chunkId,
            State = state,
            Parameters = CatalogJson.ReadParameters(p.ParametersJson, types),
            Attempts = 0,
        })];
    }

    /// <summary>
    /// A read-only transaction, so the reads of point rows and of pending chunks see one state of the
    /// catalog (a chunk claimed in between is neither missed nor seen twice).
    /// </summary>
    protected virtual DbTransaction BeginRead(DbConnection connection)
    {
        ArgumentNullException.ThrowIfNull(connection);
        return connection.BeginTransaction(System.Data.IsolationLevel.RepeatableRead);
    }

    /// <summary>Points in pending chunks of a sweep in <paramref name="state"/>.</summary>
    private static long PendingPoints(DbConnection c, DbTransaction? tx, string sweepId, PointState state)
    {
        using var cmd = Command(c, tx, "SELECT COALESCE(SUM(point_count), 0) FROM latsweep_chunks WHERE sweep_id = @sweep AND pending_state = @state");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "state", Text(state));
        return Convert.ToInt64(cmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture);
    }
}
