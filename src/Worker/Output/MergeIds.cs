namespace LatticeSweep.Worker.Output;

/// <summary>
/// The point ids of one input row group as the merge by columns holds them while it picks the order
/// (<see cref="StreamingMerge"/>): ids as the planner makes them (16 lower-case hex digits) as their 8-byte
/// number, any other id as its text. Held as strings, the ids of every input's current row group were
/// most of a merge pass's live data (~22 MB for the ~105 parts of a 10^6-point `points/` file, ~56 MB for
/// the 279 `sound_speeds/` parts) and, once a pass was done, garbage in the oldest generation under the
/// next pass's peak (bench/README.md, round 19). Fixed-width lower-case hex sorts as its number, so
/// comparing keys gives the ordinal order of the texts.
/// </summary>
internal sealed class MergeIds
{
    private readonly ulong[] _keys;

    // The ids that are not keys (null when every id is one): which rows, and their texts (null for a missing id).
    private readonly bool[]? _textual;
    private readonly string?[]? _texts;

    // The text of the key last written by ScatterTextInto.
    private ulong _lastKey;
    private string? _lastText;

    private MergeIds(ulong[] keys, bool[]? textual, string?[]? texts)
    {
        _keys = keys;
        _textual = textual;
        _texts = texts;
    }

    public int Length => _keys.Length;

    /// <summary>Keeps the ids of <paramref name="ids"/> (the strings can then be dropped).</summary>
    public static MergeIds Of(string?[] ids) => Of(ids, 0, ids?.Length ?? 0);

    /// <summary>Keeps the ids of <paramref name="ids"/>[<paramref name="start"/>, <paramref name="start"/> + <paramref name="count"/>) (a row group of a kept part's column, not copied).</summary>
    public static MergeIds Of(string?[] ids, int start, int count)
    {
        ArgumentNullException.ThrowIfNull(ids);
        var keys = new ulong[count];
        bool[]? textual = null;
        string?[]? texts = null;
        for (var i = 0; i < count; i++)
        {
            var id = ids[start + i];
            // A point's rows share one string (as the rows were built): its key is made once per run.
            if (i > 0 && id is not null && ReferenceEquals(id, ids[start + i - 1]) && textual?[i - 1] != true)
            {
                keys[i] = keys[i - 1];
                continue;
            }

            if (!TryKey(id, out keys[i]))
            {
                textual ??= new bool[count];
                texts ??= new string?[count];
                textual[i] = true;
                texts[i] = id;
            }
        }

        return new MergeIds(keys, textual, texts);
    }

    /// <summary>Keeps the ids of a decoded text column, without a string per id (only ids that are not keys become strings).</summary>
    public static MergeIds Of(TextCells cells)
    {
        ArgumentNullException.ThrowIfNull(cells);
        var keys = new ulong[cells.Rows];
        bool[]? textual = null;
        string?[]? texts = null;
        string? last = null;
        for (var i = 0; i < keys.Length; i++)
        {
            if (cells.IsNull(i) || !TryKey(cells.Chars(i), out keys[i]))
            {
                textual ??= new bool[keys.Length];
                texts ??= new string?[keys.Length];
                textual[i] = true;
                texts[i] = cells.Text(i, ref last);
            }
        }

        return new MergeIds(keys, textual, texts);
    }

    /// <summary>The id at <paramref name="row"/> for ordering.</summary>
    public MergeId this[int row] => _textual is { } t && t[row]
        ? new MergeId(0, _texts![row], Keyed: false)
        : new MergeId(_keys[row], null, Keyed: true);

    /// <summary>The id's text (a new string for a key), as the merged file's <c>point_id</c> column holds it.</summary>
    public string? TextAt(int row) => _textual is { } t && t[row] ? _texts![row] : KeyText(_keys[row]);

    /// <summary>Rows <paramref name="from"/>[k] written to <paramref name="destination"/>[<paramref name="to"/>[k]] for k in [start, end), as text.</summary>
    public void ScatterTextInto(string?[] destination, int[] to, int[] from, int start, int end)
    {
        ArgumentNullException.ThrowIfNull(destination);
        ArgumentNullException.ThrowIfNull(to);
        ArgumentNullException.ThrowIfNull(from);
        for (var k = start; k < end; k++)
        {
            // A point's rows follow each other (hundreds in the long tables): its id text is made once per run.
            var row = from[k];
            if (_textual is { } t && t[row])
            {
                destination[to[k]] = _texts![row];
            }
            else
            {
                if (_lastText is null || _keys[row] != _lastKey)
                {
                    _lastKey = _keys[row];
                    _lastText = KeyText(_lastKey);
                }

                destination[to[k]] = _lastText;
            }
        }
    }

    /// <summary>16 lower-case hex digits, the text of <see cref="Planning.PointIdentity.IdText"/>.</summary>
    internal static string KeyText(ulong key) => Planning.PointIdentity.IdText(key);

    private static bool TryKey(string? id, out ulong key)
    {
        key = 0;
        return id is not null && TryKey(id.AsSpan(), out key);
    }

    private static bool TryKey(ReadOnlySpan<char> id, out ulong key)
    {
        key = 0;
        if (id.Length != 16)
        {
            return false;
        }

        foreach (var c in id)
        {
            var digit = c is >= '0' and <= '9' ? c - '0' : c is >= 'a' and <= 'f' ? c - 'a' + 10 : -1;
            if (digit < 0)
            {
                return false;
            }

            key = (key << 4) | (uint)digit;
        }

        return true;
    }
}

/// <summary>One point id in the merge's order: its key when <see cref="Keyed"/>, else its text (null for a missing id).</summary>
internal readonly record struct MergeId(ulong Key, string? Text, bool Keyed)
{
    /// <summary>Ordinal order of the ids' texts (keys compare as numbers, which is the same for 16 lower-case hex digits).</summary>
    public static int Compare(MergeId a, MergeId b) =>
        a.Keyed && b.Keyed ? a.Key.CompareTo(b.Key) : string.CompareOrdinal(a.AsText(), b.AsText());

    /// <summary>Whether this is a missing (null) id.</summary>
    public bool IsMissing => !Keyed && Text is null;

    /// <summary>The id as text (a new string for a key).</summary>
    public string? AsText() => Keyed ? MergeIds.KeyText(Key) : Text;
}
