using System.Data.Common;
using System.Globalization;
using System.Text;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Where a point is by id, written at submit beside the chunk rows (<c>latsweep_point_buckets</c>):
/// the sweep's ids grouped by their first <see cref="PrefixLength"/> characters, one row per group
/// holding "id index" lines, and a marker row (<see cref="Marker"/>) saying the sweep has them. A
/// look-up reads one small row and then the chunk whose index range holds the point, however large
/// the sweep (the ids are hashes, so nothing in an id names its chunk; the chunk texts hold ids, but
/// finding one there is a pass over every chunk's text: 0.3-0.5 s at 10^6 points). A sweep
/// registered before this table, or whose ids cannot be written as lines, has no marker and is
/// looked up the old way.
/// </summary>
internal sealed class PointIdBuckets
{
    /// <summary>Characters of the id that name its group: 16^3 = 4,096 groups, ~250 ids each at 10^6 points.</summary>
    public const int PrefixLength = 3;

    /// <summary>The group name of the marker row (no id is empty); its text is the number of points.</summary>
    public const string Marker = "";

    public const string CreateTable = """
        CREATE TABLE IF NOT EXISTS latsweep_point_buckets (
            sweep_id TEXT NOT NULL,
            bucket TEXT NOT NULL,
            points TEXT NOT NULL,
            PRIMARY KEY (sweep_id, bucket)
        )
        """;

    // Ids as the planner makes them (16 hex digits) kept as 8-byte keys (16 bytes a point with its index,
    // no string per point: 10^6 ids as strings took ~90 MB more at submit); any other id kept as text.
    private readonly List<(ulong Key, long Index)> _keys;
    private List<(string Id, long Index)>? _texts;
    private bool _unwritable;

    /// <param name="expected">the sweep's point count (the key list is made that size once)</param>
    public PointIdBuckets(int expected = 0)
    {
        _keys = new(Math.Max(0, expected));
    }

    /// <summary>Notes a point (on the thread that makes the chunk rows).</summary>
    public void Add(string pointId, long index)
    {
        if (_unwritable)
        {
            return;
        }

        if (_texts is null && PointIdentity.TryKey(pointId, out var key) && IsLowerHex(pointId))
        {
            _keys.Add((key, index));
            return;
        }

        if (pointId.Length == 0 || pointId.AsSpan().IndexOfAny(" \n\r") >= 0)
        {
            // Not writable as a line: this sweep gets no buckets and is looked up by its chunk texts.
            _unwritable = true;
            _keys.Clear();
            _texts = null;
            return;
        }

        _texts ??= [.. _keys.Select(k => (PointIdentity.IdText(k.Key), k.Index))];
        _keys.Clear();
        _texts.Add((pointId, index));
    }

    /// <summary>Writes the groups and the marker, in the register transaction; nothing when an id could not be written.</summary>
    public void Write(DbConnection c, DbTransaction tx, string sweepId)
    {
        if (_unwritable)
        {
            return;
        }

        using var cmd = SqlSweepCatalog.Command(c, tx, "INSERT INTO latsweep_point_buckets (sweep_id, bucket, points) VALUES (@sweep, @bucket, @points)");
        SqlSweepCatalog.Add(cmd, "sweep", sweepId);
        var bucket = SqlSweepCatalog.Add(cmd, "bucket", "");
        var points = SqlSweepCatalog.Add(cmd, "points", "");
        var text = new StringBuilder();
        long count;
        if (_texts is { } texts)
        {
            texts.Sort((a, b) => string.CompareOrdinal(a.Id, b.Id));
            for (var i = 0; i < texts.Count;)
            {
                var name = BucketOf(texts[i].Id);
                text.Clear();
                for (; i < texts.Count && BucketOf(texts[i].Id) == name; i++)
                {
                    text.Append(texts[i].Id).Append(' ').Append(texts[i].Index.ToString(CultureInfo.InvariantCulture)).Append('\n');
                }

                Insert(name);
            }

            count = texts.Count;
        }
        else
        {
            // Keys sort as their ids do (fixed-width lower-case hex); a group is the key's top 12 bits (3 hex digits).
            var keys = System.Runtime.InteropServices.CollectionsMarshal.AsSpan(_keys);
            keys.Sort((a, b) => a.Key.CompareTo(b.Key));
            Span<char> id = stackalloc char[16];
            for (var i = 0; i < keys.Length;)
            {
                var group = keys[i].Key >> 52;
                text.Clear();
                for (; i < keys.Length && keys[i].Key >> 52 == group; i++)
                {
                    keys[i].Key.TryFormat(id, out _, "x16", CultureInfo.InvariantCulture);
                    text.Append(id).Append(' ').Append(keys[i].Index.ToString(CultureInfo.InvariantCulture)).Append('\n');
                }

                Insert(PointIdentity.IdText(group << 52)[..PrefixLength]);
            }

            count = keys.Length;
        }

        void Insert(string name)
        {
            bucket.Value = name;
            points.Value = text.ToString();
            cmd.ExecuteNonQuery();
        }

        bucket.Value = Marker;
        points.Value = count.ToString(CultureInfo.InvariantCulture);
        cmd.ExecuteNonQuery();
    }

    /// <summary>The group an id belongs to.</summary>
    public static string BucketOf(string pointId) => pointId.Length <= PrefixLength ? pointId : pointId[..PrefixLength];

    /// <summary>
    /// The point's index from the sweep's groups: found (and its index), absent (the sweep has groups and
    /// the id is in none), or unknown (the sweep has no groups: a store from before, or ids not writable).
    /// </summary>
    public static (bool Known, long? Index) Find(DbConnection c, DbTransaction tx, string sweepId, string pointId)
    {
        if (pointId.Length == 0)
        {
            return (false, null);
        }

        using var cmd = SqlSweepCatalog.Command(c, tx, "SELECT bucket, points FROM latsweep_point_buckets WHERE sweep_id = @sweep AND bucket IN (@bucket, @marker)");
        SqlSweepCatalog.Add(cmd, "sweep", sweepId);
        SqlSweepCatalog.Add(cmd, "bucket", BucketOf(pointId));
        SqlSweepCatalog.Add(cmd, "marker", Marker);
        using var r = cmd.ExecuteReader();
        var marked = false;
        long? index = null;
        while (r.Read())
        {
            if (r.GetString(0) == Marker)
            {
                marked = true;
            }
            else
            {
                index = IndexIn(r.GetString(1), pointId);
            }
        }

        return (marked, index);
    }

    /// <summary>The index on the id's line of a group's text, or null.</summary>
    private static long? IndexIn(string lines, string pointId)
    {
        var text = lines.AsSpan();
        while (text.Length > 0)
        {
            var end = text.IndexOf('\n');
            var line = end < 0 ? text : text[..end];
            var space = line.IndexOf(' ');
            if (space > 0 && line[..space].SequenceEqual(pointId)
                && long.TryParse(line[(space + 1)..], NumberStyles.None, CultureInfo.InvariantCulture, out var index))
            {
                return index;
            }

            text = end < 0 ? default : text[(end + 1)..];
        }

        return null;
    }

    private static bool IsLowerHex(string id)
    {
        foreach (var ch in id)
        {
            if (ch is not ((>= '0' and <= '9') or (>= 'a' and <= 'f')))
            {
                return false;
            }
        }

        return true;
    }
}
