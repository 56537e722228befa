using System.Data.Common;

namespace LatticeSweep.Worker.Catalog;

/// <summary>One point by id, for the dashboard's point page (read only).</summary>
public abstract partial class SqlSweepCatalog
{
    /// <summary>
    /// The point's row by its key; for a point of a pending chunk (no row yet) the chunk whose
    /// points text names the id, decoded, in the same read transaction. Paging the sweep's points
    /// to find one took seconds at 10^6 points; this is one indexed read, or one pass over the
    /// pending chunks' text inside the database (candidates are checked by decoding, so an id that
    /// merely appears inside another point's parameters is not taken for it).
    /// </summary>
    public PointRecord? FindPoint(string sweepId, string pointId)
    {
        ArgumentNullException.ThrowIfNull(pointId);
        using var c = Open();
        using var tx = BeginRead(c);
        var types = ReadAxisTypes(c, tx, sweepId);
        using (var cmd = Command(c, tx, $"SELECT {PointColumns} FROM latsweep_points WHERE sweep_id = @sweep AND point_id = @point"))
        {
            Add(cmd, "sweep", sweepId);
            Add(cmd, "point", pointId);
            if (ReadPoints(cmd, types) is [var row, ..])
            {
                return row;
            }
        }

        foreach (var chunk in PendingChunksNaming(c, tx, sweepId, pointId))
        {
            if (ReadPendingPoints(c, tx, sweepId, chunk, types)?.FirstOrDefault(p => p.PointId == pointId) is { } pending)
            {
                return pending;
            }
        }

        return null;
    }

    /// <summary>The pending chunks whose points text holds the id as a JSON string (ids are hex digits, which JSON writes as they are).</summary>
    private List<string> PendingChunksNaming(DbConnection c, DbTransaction tx, string sweepId, string pointId)
    {
        using var cmd = Command(c, tx, $"SELECT chunk_id FROM latsweep_chunks WHERE sweep_id = @sweep AND pending_state IS NOT NULL AND {TextHolds("points_json", "@needle")}");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "needle", "\"" + pointId + "\"");
        using var r = cmd.ExecuteReader();
        var chunks = new List<string>();
        while (r.Read())
        {
            chunks.Add(r.GetString(0));
        }

        return chunks;
    }

    /// <summary>SQL that is true when <paramref name="column"/> holds the text of <paramref name="parameter"/> (PostgreSQL's strpos; SQLite overrides it with instr).</summary>
    protected virtual string TextHolds(string column, string parameter) => $"strpos({column}, {parameter}) > 0";
}
