using System.Buffers;
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

    /// <summary>Entries a pass of <see cref="Write"/> holds when the ids come as keys (16 bytes each: 4 MiB; a pass reads every key, ~10 ms at 10^7).</summary>
    internal const int EntriesPerPass = 1 << 18;

    /// <summary>Groups: one per value of an id's first <see cref="PrefixLength"/> hex digits (a key's top 12 bits).</summary>
    private const int GroupCount = 1 << (4 * PrefixLength);

    // Ids given as the planner's keys at submit (NewSweep.PointKeys): nothing is noted per point; Write reads the keys
    // again in passes of at most EntriesPerPass (10^7 ids noted as keys had taken 160 MB, bench/README round 23).
    private readonly ReadOnlyMemory<ulong>? _givenKeys;
    private readonly int _entriesPerPass = EntriesPerPass;

    // Else ids as the planner makes them (16 hex digits) kept as 8-byte keys (16 bytes a point with its index,
    // no string per point: 10^6 ids as strings took ~90 MB more at submit); any other id kept as text.
    private readonly List<(ulong Key, long Index)> _keys;
    private List<(string Id, long Index)>? _texts;
    private bool _unwritable;

    /// <param name="expected">the sweep's point count (the key list is made that size once)</param>
    public PointIdBuckets(int expected = 0)
    {
        _keys = new(Math.Max(0, expected));
    }

    /// <param name="keys">every point's id as its key, the point at position i having index i (<see cref="NewSweep.PointKeys"/>)</param>
    /// <param name="entriesPerPass">the most points a pass of <see cref="Write"/> holds (tests make it small)</param>
    public PointIdBuckets(ReadOnlyMemory<ulong> keys, int entriesPerPass = EntriesPerPass)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(entriesPerPass, 1);
        _givenKeys = keys;
        _entriesPerPass = entriesPerPass;
        _keys = [];
    }

    /// <summary>Writes one group's row: its name and its "id index" lines as UTF-8 (in the register transaction).</summary>
    internal interface IRowWriter : IDisposable
    {
        void Insert(string bucket, ReadOnlySpan<byte> pointsUtf8);
    }

    /// <summary>The SQL that inserts a group's row (parameters @sweep, @bucket, @points).</summary>
    internal const string InsertSql = "INSERT INTO latsweep_point_buckets (sweep_id, bucket, points) VALUES (@sweep, @bucket, @points)";

    /// <summary>A writer by an ADO.NET command, the text as a string (SQLite's catalog binds the UTF-8 as it is).</summary>
    internal sealed class CommandRowWriter : IRowWriter
    {
        private readonly DbCommand _cmd;
        private readonly DbParameter _bucket, _points;

        public CommandRowWriter(DbConnection c, DbTransaction tx, string sweepId)
        {
            _cmd = SqlSweepCatalog.Command(c, tx, InsertSql);
            SqlSweepCatalog.Add(_cmd, "sweep", sweepId);
            _bucket = SqlSweepCatalog.Add(_cmd, "bucket", "");
            _points = SqlSweepCatalog.Add(_cmd, "points", "");
        }

        public void Insert(string bucket, ReadOnlySpan<byte> pointsUtf8)
        {
            _bucket.Value = bucket;
            _points.Value = Encoding.UTF8.GetString(pointsUtf8);
            _cmd.ExecuteNonQuery();
        }

        public void Dispose() => _cmd.Dispose();
    }

    /// <summary>Notes a point (on the thread that makes the chunk rows); nothing when the ids were given as keys.</summary>
    public void Add(string pointId, long index)
    {
        if (_unwritable || _givenKeys is not null)
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
    public void Write(IRowWriter writer)
    {
        ArgumentNullException.ThrowIfNull(writer);
        if (_unwritable)
        {
            return;
        }

        // A group's text is made in one UTF-8 buffer used again for every group: at 10^7 points a group's
        // text is ~60 KB, and 4,096 of them as strings were ~500 MB of large objects left to the next full collection.
        var text = new ArrayBufferWriter<byte>(1 << 16);
        long count;
        if (_givenKeys is { } given)
        {
            count = WriteGivenKeys(given.Span, _entriesPerPass, writer, text);
        }
        else if (_texts is { } texts)
        {
            texts.Sort((a, b) => string.CompareOrdinal(a.Id, b.Id));
            for (var i = 0; i < texts.Count;)
            {
                var name = BucketOf(texts[i].Id);
                text.ResetWrittenCount();
                for (; i < texts.Count && BucketOf(texts[i].Id) == name; i++)
                {
                    AppendLine(text, texts[i].Id, texts[i].Index);
                }

                writer.Insert(name, text.WrittenSpan);
            }

            count = texts.Count;
        }
        else
        {
            WriteKeys(System.Runtime.InteropServices.CollectionsMarshal.AsSpan(_keys), writer, text);
            count = _keys.Count;
        }

        text.ResetWrittenCount();
        Encoding.UTF8.GetBytes(count.ToString(CultureInfo.InvariantCulture), text);
        writer.Insert(Marker, text.WrittenSpan);
    }

    /// <summary>
    /// The groups of ids given as keys, in passes over them that each take the next groups whose points
    /// together are at most <paramref name="entriesPerPass"/> (a group larger than that alone): what a pass holds
    /// does not grow with the sweep. Returns the number of points.
    /// </summary>
    private static long WriteGivenKeys(ReadOnlySpan<ulong> keys, int entriesPerPass, IRowWriter writer, ArrayBufferWriter<byte> text)
    {
        var perGroup = new int[GroupCount];
        for (var i = 0; i < keys.Length; i++)
        {
            perGroup[keys[i] >> 52]++;
        }

        var pass = new List<(ulong Key, long Index)>(Math.Min(keys.Length, entriesPerPass));
        for (var first = 0; first < GroupCount;)
        {
            var end = first;
            var entries = 0L;
            while (end < GroupCount && (end == first || entries + perGroup[end] <= entriesPerPass))
            {
                entries += perGroup[end++];
            }

            pass.Clear();
            var (low, high) = ((ulong)first, (ulong)end);
            for (var i = 0; i < keys.Length; i++)
            {
                var group = keys[i] >> 52;
                if (group >= low && group < high)
                {
                    pass.Add((keys[i], i));
                }
            }

            WriteKeys(System.Runtime.InteropServices.CollectionsMarshal.AsSpan(pass), writer, text);
            first = end;
        }

        return keys.Length;
    }

    /// <summary>The groups of <paramref name="keys"/> (sorted here), each as one row.</summary>
    private static void WriteKeys(Span<(ulong Key, long Index)> keys, IRowWriter writer, ArrayBufferWriter<byte> text)
    {
        // Keys sort as their ids do (fixed-width lower-case hex); a group is the key's top 12 bits (3 hex digits).
        keys.Sort((a, b) => a.Key.CompareTo(b.Key));
        for (var i = 0; i < keys.Length;)
        {
            var group = keys[i].Key >> 52;
            text.ResetWrittenCount();
            for (; i < keys.Length && keys[i].Key >> 52 == group; i++)
            {
                keys[i].Key.TryFormat(text.GetSpan(16), out _, "x16", CultureInfo.InvariantCulture);
                text.Advance(16);
                AppendIndex(text, keys[i].Index);
            }

            writer.Insert(PointIdentity.IdText(group << 52)[..PrefixLength], text.WrittenSpan);
        }
    }

    private static void AppendLine(ArrayBufferWriter<byte> text, string id, long index)
    {
        Encoding.UTF8.GetBytes(id, text);
        AppendIndex(text, index);
    }

    /// <summary>The end of an "id index" line: a space, the index, a newline.</summary>
    private static void AppendIndex(ArrayBufferWriter<byte> text, long index)
    {
        var line = text.GetSpan(1 + 20 + 1);
        line[0] = (byte)' ';
        index.TryFormat(line[1..], out var digits, default, CultureInfo.InvariantCulture);
        line[1 + digits] = (byte)'\n';
        text.Advance(1 + digits + 1);
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
