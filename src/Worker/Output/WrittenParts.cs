using Microsoft.Win32.SafeHandles;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// The column arrays of the part files this process wrote for a sweep it will merge itself (<c>run</c>), kept so
/// that the merge takes a part's cells from them instead of decoding the file through Parquet.Net again
/// (<see cref="SortedInput"/>): in a 300-point run that reading was ~0.1 s of the ~0.3 s merge (bench/README, round 24).
/// </summary>
/// <remarks>
/// A part is taken from memory only while its file is the one written: the same length and write time as the
/// temporary file had before its rename (checked on the merge's open handle), the same columns and rows, a
/// row-group layout the merge reads by columns. Anything else (a part replaced by a later run of its chunk,
/// by another process, a file this process did not write) is read from the file as before. Only the cells
/// a file gives back exactly are served: text, doubles, integers and flags; timestamps, which the file holds
/// in milliseconds, are always read from it. At most <see cref="KeptBytesAtMost"/> are held for all sweeps
/// (<see cref="KeptBytesFewChunksAtMost"/> while the watched sweep has at most <see cref="MergedLayout.FilesTakenAsTheyAre"/> chunks):
/// a sweep whose parts grow past it is forgotten whole and not kept any more (a large sweep's merge reads its
/// files; its solving holds nothing for it), and a table's are dropped once it is merged.
/// </remarks>
internal static class WrittenParts
{
    /// <summary>The most bytes of column arrays held at once (estimated from rows and column types).</summary>
    internal const long KeptBytesAtMost = 32L << 20;

    /// <summary>
    /// The bound for a sweep of 2 to <see cref="MergedLayout.FilesTakenAsTheyAre"/> chunks, whose tables under 64 MiB are rewritten
    /// as one file each since round 26 (until then hard-linked): 2,000 small points hold ~73 MiB of columns (their `dos/` and
    /// `modes/` were read back from the files, half of the merge's CPU: bench/README, round 27). Held while the last chunks
    /// solve: +~8-14 MB of peak RSS for them; a sweep of more chunks keeps the 32 MiB bound.
    /// </summary>
    internal const long KeptBytesFewChunksAtMost = 96L << 20;

    private static readonly object Gate = new();
    // The watched sweeps with the bound of their kept bytes (KeptBytesAtMost until Keeps has seen their chunk count).
    private static readonly Dictionary<string, long> Watched = new(StringComparer.Ordinal);
    private static readonly Dictionary<string, Kept> ByPath = new(StringComparer.Ordinal);
    private static long _bytes;

    /// <summary>A part's file as written: its length and last write time (UTC ticks).</summary>
    internal readonly record struct FileIdentity(long Length, long WriteTicks);

    private sealed record Kept(string SweepId, FileIdentity Identity, IReadOnlyList<ColumnDef> Columns, Array?[] Values, int Rows, long Bytes);

    /// <summary>Parts of <paramref name="sweepId"/> written from now on are kept until <see cref="Forget"/>.</summary>
    public static void Watch(string sweepId)
    {
        lock (Gate)
        {
            Watched.TryAdd(sweepId, KeptBytesAtMost);
        }
    }

    /// <summary>Stops keeping the sweep's parts and drops what was kept of them.</summary>
    public static void Forget(string sweepId)
    {
        lock (Gate)
        {
            Watched.Remove(sweepId);
            DropWhere(k => k.SweepId == sweepId);
        }
    }

    /// <summary>Drops what was kept of the parts in <paramref name="tableFolder"/> (its merge is done).</summary>
    public static void ForgetFolder(string tableFolder)
    {
        var prefix = Path.GetFullPath(tableFolder).TrimEnd(Path.DirectorySeparatorChar) + Path.DirectorySeparatorChar;
        lock (Gate)
        {
            if (ByPath.Count > 0)
            {
                DropWhere(path: p => p.StartsWith(prefix, StringComparison.Ordinal));
            }
        }
    }

    /// <summary>The identity of a file just written (before its rename, which keeps both).</summary>
    public static FileIdentity IdentityOf(string path)
    {
        var info = new FileInfo(path);
        return new FileIdentity(info.Length, info.LastWriteTimeUtc.Ticks);
    }

    /// <summary>
    /// Whether the parts of a sweep of <paramref name="chunks"/> chunks being written are kept: it is watched, its merge would
    /// read them (two parts a table or more: a small table of several files is rewritten as one, <see cref="MergedLayout.TakenAsTheyAre"/>;
    /// a lone part is taken as it is), and opens each once (at most <see cref="TableMerger.OpenedOnceAtMost"/>). A larger sweep keeps
    /// none, not even its first chunks' until the bound: held early in a 10^6-point run they set its peak (206 against 201 MB,
    /// bench/README, round 24).
    /// </summary>
    public static bool Keeps(string sweepId, int chunks)
    {
        if (chunks < 2 || chunks > TableMerger.OpenedOnceAtMost)
        {
            return false;
        }

        lock (Gate)
        {
            if (!Watched.ContainsKey(sweepId))
            {
                return false;
            }

            Watched[sweepId] = BoundFor(chunks);
            return true;
        }
    }

    /// <summary>The most bytes kept for a sweep of <paramref name="chunks"/> chunks (<see cref="KeptBytesFewChunksAtMost"/> or <see cref="KeptBytesAtMost"/>).</summary>
    internal static long BoundFor(int chunks) => chunks <= MergedLayout.FilesTakenAsTheyAre ? KeptBytesFewChunksAtMost : KeptBytesAtMost;

    /// <summary>Keeps the rows written to <paramref name="path"/> (now renamed into place), when the sweep is watched and they fit.</summary>
    public static void Keep(string sweepId, string path, FileIdentity identity, TableRows rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var values = new Array?[rows.Columns.Count];
        long bytes = 0;
        for (var c = 0; c < values.Length; c++)
        {
            if (Served(rows.Columns[c].Type) && rows.Values[c].Length == rows.RowCount && !HasSurrogates(rows.Values[c]))
            {
                values[c] = rows.Values[c];
                bytes += (long)rows.RowCount * BytesPerCell(rows.Columns[c].Type);
            }
        }

        var full = Path.GetFullPath(path);
        lock (Gate)
        {
            if (!Watched.TryGetValue(sweepId, out var bound))
            {
                return;
            }

            DropWhere(path: p => p == full);
            if (_bytes + bytes > bound)
            {
                // Too large to hold through the run: the sweep's merge reads its files.
                Watched.Remove(sweepId);
                DropWhere(k => k.SweepId == sweepId);
                return;
            }

            ByPath[full] = new Kept(sweepId, identity, rows.Columns, values, rows.RowCount, bytes);
            _bytes += bytes;
        }
    }

    /// <summary>
    /// The kept columns of <paramref name="path"/> when the file open on <paramref name="handle"/> is the one written and holds
    /// <paramref name="columns"/> in <paramref name="groupRows"/>; null otherwise (the file is read). A column not kept is null.
    /// </summary>
    public static Array?[]? Find(string path, SafeFileHandle handle, IReadOnlyList<ColumnDef> columns, IReadOnlyList<long> groupRows)
    {
        ArgumentNullException.ThrowIfNull(handle);
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentNullException.ThrowIfNull(groupRows);
        Kept? kept;
        lock (Gate)
        {
            if (ByPath.Count == 0 || !ByPath.TryGetValue(Path.GetFullPath(path), out kept))
            {
                return null;
            }
        }

        var identity = new FileIdentity(RandomAccess.GetLength(handle), File.GetLastWriteTimeUtc(handle).Ticks);
        if (identity != kept.Identity || groupRows.Sum() != kept.Rows || columns.Count != kept.Columns.Count)
        {
            return null;
        }

        for (var c = 0; c < columns.Count; c++)
        {
            if (columns[c].Name != kept.Columns[c].Name || columns[c].Type != kept.Columns[c].Type)
            {
                return null;
            }
        }

        return kept.Values;
    }

    /// <summary>Bytes held now (tests).</summary>
    internal static long BytesHeld
    {
        get
        {
            lock (Gate)
            {
                return _bytes;
            }
        }
    }

    /// <summary>Whether the merge may take a column of this type from memory: its cells come back from the file exactly as written.</summary>
    internal static bool Served(ColumnType type) => type is ColumnType.Text or ColumnType.Double or ColumnType.Int32 or ColumnType.Int64 or ColumnType.Bool;

    /// <summary>
    /// Whether a text column holds a UTF-16 surrogate: the file holds UTF-8, where a lone one comes back as U+FFFD, so such
    /// a column is read from the file (paired ones would come back, but are not worth telling apart here).
    /// </summary>
    private static bool HasSurrogates(Array values)
    {
        if (values is not string?[] texts)
        {
            return false;
        }

        string? last = null;
        foreach (var text in texts)
        {
            // A run of a point's rows shares one string: looked at once.
            if (text is null || ReferenceEquals(text, last))
            {
                continue;
            }

            last = text;
            if (text.AsSpan().ContainsAnyInRange('\uD800', '\uDFFF'))
            {
                return true;
            }
        }

        return false;
    }

    private static long BytesPerCell(ColumnType type) => type switch
    {
        ColumnType.Double or ColumnType.Int64 => 16,
        ColumnType.Int32 or ColumnType.Text => 8,
        _ => 2,
    };

    private static void DropWhere(Func<Kept, bool>? kept = null, Func<string, bool>? path = null)
    {
        foreach (var (p, k) in ByPath.Where(e => (kept?.Invoke(e.Value) ?? true) && (path?.Invoke(e.Key) ?? true)).ToList())
        {
            ByPath.Remove(p);
            _bytes -= k.Bytes;
        }
    }
}
