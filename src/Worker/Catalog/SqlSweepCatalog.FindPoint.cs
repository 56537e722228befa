using System.Data.Common;

namespace LatticeSweep.Worker.Catalog;

/// <summary>One point by id, for the dashboard's point page (read only).</summary>
public abstract partial class SqlSweepCatalog
{
    /// <summary>
    /// The point by the sweep's id groups (<see cref="PointIdBuckets"/>: one small row names its
    /// index, then the chunk whose index range holds it), the same work at any sweep size. A sweep
    /// without them (registered before) is found through the chunk whose points text names its id
    /// (the text is kept after the claim, see <see cref="CatalogSchema"/>): a pending chunk's text
    /// decoded, or the claimed chunk's row by the chunk index, in the same read transaction. One pass
    /// over the sweep's chunk texts inside the database (candidates are checked by decoding or by the
    /// row, so an id that merely appears inside another point's parameters is not taken for it);
    /// point rows are not indexed by id alone. Stores from before kept no text for claimed chunks (or
    /// had no chunk rows): there the id is looked up in the point rows, whose primary key those stores still have.
    /// </summary>
    public PointRecord? FindPoint(string sweepId, string pointId)
    {
        ArgumentNullException.ThrowIfNull(pointId);
        using var c = Open();
        using var tx = BeginRead(c);
        var types = ReadAxisTypes(c, tx, sweepId);
        var (indexed, index) = PointIdBuckets.Find(c, tx, sweepId, pointId);
        if (indexed)
        {
            return index is { } i ? FindIn(c, tx, sweepId, pointId, ChunksHolding(c, tx, sweepId, i), types) : null;
        }

        return FindIn(c, tx, sweepId, pointId, ChunksNaming(c, tx, sweepId, pointId), types)
            ?? (HasChunksWithoutText(c, tx, sweepId) ? ReadPointRow(c, tx, sweepId, pointId, null, types) : null);
    }

    /// <summary>The point in the first of <paramref name="chunks"/> that holds it: a pending chunk's text decoded, a claimed chunk's row.</summary>
    private static PointRecord? FindIn(DbConnection c, DbTransaction tx, string sweepId, string pointId, List<(string ChunkId, bool Pending)> chunks,
        Dictionary<string, Planning.AxisValueType> types)
    {
        foreach (var (chunk, pending) in chunks)
        {
            var found = pending
                ? ReadPendingPoints(c, tx, sweepId, chunk, types)?.FirstOrDefault(p => p.PointId == pointId)
                : ReadPointRow(c, tx, sweepId, pointId, chunk, types);
            if (found is not null)
            {
                return found;
            }
        }

        return null;
    }

    /// <summary>The chunks whose index range holds <paramref name="index"/> (one, as the planner cuts chunks), and whether each is pending.</summary>
    private static List<(string ChunkId, bool Pending)> ChunksHolding(DbConnection c, DbTransaction tx, string sweepId, long index)
    {
        using var cmd = Command(c, tx, "SELECT chunk_id, pending_state FROM latsweep_chunks WHERE sweep_id = @sweep AND first_index <= @index AND last_index >= @index");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "index", index);
        using var r = cmd.ExecuteReader();
        var chunks = new List<(string, bool)>();
        while (r.Read())
        {
            chunks.Add((r.GetString(0), !r.IsDBNull(1)));
        }

        return chunks;
    }

    /// <summary>The point's row, in <paramref name="chunkId"/> (by the chunk index) or anywhere in the sweep (by the primary key of stores from before).</summary>
    private static PointRecord? ReadPointRow(DbConnection c, DbTransaction tx, string sweepId, string pointId, string? chunkId, Dictionary<string, Planning.AxisValueType> types)
    {
        var inChunk = chunkId is null ? "" : " AND chunk_id = @chunk";
        using var cmd = Command(c, tx, $"SELECT {PointColumns} FROM latsweep_points WHERE sweep_id = @sweep{inChunk} AND point_id = @point");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "point", pointId);
        if (chunkId is not null)
        {
            Add(cmd, "chunk", chunkId);
        }

        return ReadPoints(cmd, types) is [var row, ..] ? row : null;
    }

    /// <summary>The chunks whose points text holds the id as a JSON string (ids are hex digits, which JSON writes as they are), and whether each is pending.</summary>
    private List<(string ChunkId, bool Pending)> ChunksNaming(DbConnection c, DbTransaction tx, string sweepId, string pointId)
    {
        using var cmd = Command(c, tx, $"SELECT chunk_id, pending_state FROM latsweep_chunks WHERE sweep_id = @sweep AND points_json IS NOT NULL AND {TextHolds("points_json", "@needle")}");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "needle", "\"" + pointId + "\"");
        using var r = cmd.ExecuteReader();
        var chunks = new List<(string, bool)>();
        while (r.Read())
        {
            chunks.Add((r.GetString(0), !r.IsDBNull(1)));
        }

        return chunks;
    }

    /// <summary>Whether some of the sweep's point rows may be named by no chunk text: a store from before kept none for claimed chunks, or had no chunk rows.</summary>
    private static bool HasChunksWithoutText(DbConnection c, DbTransaction tx, string sweepId)
    {
        using var cmd = Command(c, tx, """
            SELECT CASE WHEN EXISTS (SELECT 1 FROM latsweep_chunks WHERE sweep_id = @sweep AND points_json IS NULL)
                OR NOT EXISTS (SELECT 1 FROM latsweep_chunks WHERE sweep_id = @sweep) THEN 1 ELSE 0 END
            """);
        Add(cmd, "sweep", sweepId);
        return Convert.ToInt64(cmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture) == 1;
    }

    /// <summary>SQL that is true when <paramref name="column"/> holds the text of <paramref name="parameter"/> (PostgreSQL's strpos; SQLite overrides it with instr).</summary>
    protected virtual string TextHolds(string column, string parameter) => $"strpos({column}, {parameter}) > 0";
}
