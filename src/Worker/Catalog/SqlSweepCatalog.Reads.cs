using System.Collections.Immutable;
using System.Data.Common;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>The read side: what <c>status</c> and the dashboard show.</summary>
public abstract partial class SqlSweepCatalog
{
    private const string SweepColumns = """
        sweep_id, name, description, state, spec_hash, source_path, spec_text, output_folder, axes_json,
        tables_csv, engine_version, created_ms, started_ms, finished_ms, chunk_count
        """;

    private const string PointColumns = """
        sweep_id, point_id, point_index, chunk_id, state, failure_kind, error, parameters_json, attempts,
        started_ms, finished_ms, duration_us, worker
        """;

    public IReadOnlyList<SweepRecord> ListSweeps()
    {
        using var c = Open();
        var sweeps = ReadSweeps(c, $"SELECT {SweepColumns} FROM latsweep_sweeps ORDER BY created_ms DESC, sweep_id", []);
        var counts = ReadAllCounts(c);
        var definitions = ReadDefinitions(c, null);
        return sweeps.Select(s => s with { Counts = counts.GetValueOrDefault(s.SweepId, SweepCounts.Empty), DefinitionHash = definitions.GetValueOrDefault(s.SweepId) }).ToList();
    }

    public SweepRecord? FindSweep(string sweepIdOrName)
    {
        using var c = Open();
        var found = ReadSweeps(c, $"SELECT {SweepColumns} FROM latsweep_sweeps WHERE sweep_id = @key", [("key", sweepIdOrName)]);
        if (found.Count == 0)
        {
            // By name: the newest sweep of that name.
            found = ReadSweeps(c, $"SELECT {SweepColumns} FROM latsweep_sweeps WHERE name = @key ORDER BY created_ms DESC, sweep_id", [("key", sweepIdOrName)]);
        }

        if (found.Count == 0)
        {
            return null;
        }

        var sweep = found[0];
        return sweep with { Counts = ReadCounts(c, null, sweep.SweepId), DefinitionHash = ReadDefinitions(c, sweep.SweepId).GetValueOrDefault(sweep.SweepId) };
    }

    public IReadOnlyList<PointRecord> GetPoints(string sweepId, PointQuery query)
    {
        ArgumentNullException.ThrowIfNull(query);
        using var c = Open();
        using var tx = BeginRead(c);
        var types = ReadAxisTypes(c, tx, sweepId);
        if (query.Error is { } error)
        {
            using var group = Command(c, tx, $"SELECT {PointColumns} FROM latsweep_points WHERE {GroupRows} ORDER BY point_index LIMIT @limit OFFSET @offset");
            AddGroup(group, sweepId, Text(query.Kind ?? FailureKind.Model), error);
            Add(group, "limit", (long)Math.Max(0, query.Limit));
            Add(group, "offset", (long)Math.Max(0, query.Offset));
            return ReadPoints(group, types);
        }

        var pending = query.State is null or PointState.Waiting or PointState.Cancelled ? ReadPendingChunks(c, tx, sweepId, query.State) : [];
        if (pending.Count > 0)
        {
            return MergePoints(c, tx, sweepId, query, types, pending);
        }

        var where = query.State is { } s ? " AND state = @state" : "";
        using var cmd = Command(c, tx, $"""
            SELECT {PointColumns} FROM latsweep_points WHERE sweep_id = @sweep{where}
            ORDER BY point_index LIMIT @limit OFFSET @offset
            """);
        Add(cmd, "sweep", sweepId);
        if (query.State is { } state)
        {
            Add(cmd, "state", Text(state));
        }

        Add(cmd, "limit", (long)Math.Max(0, query.Limit));
        Add(cmd, "offset", (long)Math.Max(0, query.Offset));
        return ReadPoints(cmd, types);
    }

    public IReadOnlyList<PointRecord> GetChunkPoints(string sweepId, string chunkId)
    {
        using var c = Open();
        using var tx = BeginRead(c);
        var types = ReadAxisTypes(c, tx, sweepId);
        if (ReadPendingPoints(c, tx, sweepId, chunkId, types) is { } pending)
        {
            return pending;
        }

        using var cmd = Command(c, tx, $"SELECT {PointColumns} FROM latsweep_points WHERE sweep_id = @sweep AND chunk_id = @chunk ORDER BY point_index");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "chunk", chunkId);
        return ReadPoints(cmd, types);
    }

    /// <summary>Rows read per statement when point rows and pending chunks are merged.</summary>
    private const int MergeBatchRows = 2000;

    /// <summary>
    /// A page of the points of a sweep that has pending chunks: its point rows (read by index in
    /// batches) and its pending chunks' points (decoded when reached) merged in index order, all in
    /// one read transaction. A pending chunk wholly inside the offset is skipped without decoding.
    /// </summary>
    private static List<PointRecord> MergePoints(DbConnection c, DbTransaction tx, string sweepId, PointQuery query,
        Dictionary<string, AxisValueType> types, List<PendingChunk> pending)
    {
        var skip = (long)Math.Max(0, query.Offset);
        var take = Math.Max(0, query.Limit);
        var result = new List<PointRecord>();
        var rows = new Queue<PointRecord>();
        var lastRowIndex = long.MinValue;
        var rowsDone = false;
        var decoded = new PriorityQueue<PointRecord, long>();
        var next = 0;

        void Refill()
        {
            if (rows.Count > 0 || rowsDone)
            {
                return;
            }

            var where = query.State is { } s ? " AND state = @state" : "";
            using var cmd = Command(c, tx, $"""
                SELECT {PointColumns} FROM latsweep_points WHERE sweep_id = @sweep{where} AND point_index > @after
                ORDER BY point_index LIMIT @limit
                """);
            Add(cmd, "sweep", sweepId);
            if (query.State is { } state)
            {
                Add(cmd, "state", Text(state));
            }

            Add(cmd, "after", lastRowIndex);
            Add(cmd, "limit", (long)MergeBatchRows);
            foreach (var p in ReadPoints(cmd, types))
            {
                rows.Enqueue(p);
                lastRowIndex = p.Index;
            }

            rowsDone = rows.Count < MergeBatchRows;
        }

        while (result.Count < take)
        {
            Refill();
            var rowHead = rows.TryPeek(out var row) ? row.Index : long.MaxValue;
            var decodedHead = decoded.TryPeek(out _, out var d) ? d : long.MaxValue;
            var chunkHead = next < pending.Count ? pending[next].FirstIndex : long.MaxValue;
            if (rowHead == long.MaxValue && decodedHead == long.MaxValue && chunkHead == long.MaxValue)
            {
                break;
            }

            if (chunkHead <= rowHead && chunkHead <= decodedHead)
            {
                var chunk = pending[next++];
                var nextOther = Math.Min(Math.Min(rowHead, decodedHead), next < pending.Count ? pending[next].FirstIndex : long.MaxValue);
                if (skip >= chunk.PointCount && chunk.LastIndex < nextOther)
                {
                    skip -= chunk.PointCount;
                    continue;
                }

                foreach (var p in ReadPendingPoints(c, tx, sweepId, chunk.ChunkId, types) ?? [])
                {
                    decoded.Enqueue(p, p.Index);
                }

                continue;
            }

            var point = decodedHead <= rowHead ? decoded.Dequeue() : rows.Dequeue();
            if (skip > 0)
            {
                skip--;
            }
            else
            {
                result.Add(point);
            }
        }

        return result;
    }

    public IReadOnlyList<string> GetChunksWithResults(string sweepId)
    {
        using var c = Open();
        using var cmd = Command(c, null, $"""
            SELECT DISTINCT chunk_id FROM latsweep_points
            WHERE sweep_id = @sweep AND ({HasResultSql})
            ORDER BY chunk_id
            """);
        Add(cmd, "sweep", sweepId);
        var chunks = new List<string>();
        using var r = cmd.ExecuteReader();
        while (r.Read())
        {
            chunks.Add(r.GetString(0));
        }

        return chunks;
    }

    private static IReadOnlyList<AxisInfo> ReadAxes(DbConnection c, DbTransaction? tx, string sweepId)
    {
        using var cmd = Command(c, tx, "SELECT axes_json FROM latsweep_sweeps WHERE sweep_id = @sweep");
        Add(cmd, "sweep", sweepId);
        return cmd.ExecuteScalar() is string json ? CatalogJson.ReadAxes(json) : [];
    }

    private static List<SweepRecord> ReadSweeps(DbConnection c, string sql, (string, object)[] parameters)
    {
        using var cmd = Command(c, null, sql);
        foreach (var (name, value) in parameters)
        {
            Add(cmd, name, value);
        }

        using var r = cmd.ExecuteReader();
        var list = new List<SweepRecord>();
        while (r.Read())
        {
            list.Add(new SweepRecord
            {
                SweepId = r.GetString(0),
                Name = r.GetString(1),
                Description = r.GetString(2),
                State = ParseSweepState(r.GetString(3)),
                SpecHash = r.GetString(4),
                SourcePath = r.GetString(5),
                SpecText = r.GetString(6),
                OutputFolder = r.GetString(7),
                Axes = CatalogJson.ReadAxes(r.GetString(8)),
                Tables = [.. r.GetString(9).Split(',', StringSplitOptions.RemoveEmptyEntries)],
                EngineVersion = r.GetString(10),
                CreatedAt = DateTimeOffset.FromUnixTimeMilliseconds(r.GetInt64(11)),
                StartedAt = FromMs(r, 12),
                FinishedAt = FromMs(r, 13),
                ChunkCount = (int)r.GetInt64(14),
                Counts = SweepCounts.Empty,
            });
        }

        return list;
    }

    /// <summary>Definition hashes by sweep id: of one sweep, or of all when <paramref name="sweepId"/> is null.</summary>
    private static Dictionary<string, string> ReadDefinitions(DbConnection c, string? sweepId)
    {
        using var cmd = Command(c, null, "SELECT sweep_id, definition_hash FROM latsweep_sweep_definitions" + (sweepId is null ? "" : " WHERE sweep_id = @sweep"));
        if (sweepId is not null)
        {
            Add(cmd, "sweep", sweepId);
        }

        using var r = cmd.ExecuteReader();
        var map = new Dictionary<string, string>(StringComparer.Ordinal);
        while (r.Read())
        {
            map[r.GetString(0)] = r.GetString(1);
        }

        return map;
    }

    private static Dictionary<string, AxisValueType> ReadAxisTypes(DbConnection c, DbTransaction? tx, string sweepId)
    {
        using var cmd = Command(c, tx, "SELECT axes_json FROM latsweep_sweeps WHERE sweep_id = @sweep");
        Add(cmd, "sweep", sweepId);
        return cmd.ExecuteScalar() is string json
            ? CatalogJson.ReadAxes(json).ToDictionary(a => a.ColumnName, a => a.ValueType, StringComparer.Ordinal)
            : [];
    }

    private static List<PointRecord> ReadPoints(DbCommand cmd, Dictionary<string, AxisValueType> types)
    {
        using var r = cmd.ExecuteReader();
        var list = new List<PointRecord>();
        while (r.Read())
        {
            list.Add(new PointRecord
            {
                SweepId = r.GetString(0),
                PointId = r.GetString(1),
                Index = (int)r.GetInt64(2),
                ChunkId = r.GetString(3),
                State = ParsePointState(r.GetString(4)),
                FailureKind = r.IsDBNull(5) ? null : ParseFailureKind(r.GetString(5)),
                Error = r.IsDBNull(6) ? null : r.GetString(6),
                Parameters = CatalogJson.ReadParameters(r.GetString(7), types),
                Attempts = (int)r.GetInt64(8),
                StartedAt = FromMs(r, 9),
                FinishedAt = FromMs(r, 10),
                DurationSeconds = r.IsDBNull(11) ? null : r.GetInt64(11) / 1e6,
                Worker = r.IsDBNull(12) ? null : r.GetString(12),
            });
        }

        return list;
    }
}
