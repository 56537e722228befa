using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Chunks whose results the catalog records but whose rows are no longer in the sweep's folder
/// (the folder, a table or a part file deleted or moved after the run). A resumed or re-run sweep
/// queues them again, so "every point without results runs again" holds for the files, not only
/// for the catalog. <c>points/</c> decides: every finished chunk writes its rows there (failed
/// points included), while other tables may legitimately lack a chunk (an unstable point has no
/// thermal rows).
/// </summary>
public static class LostResults
{
    /// <summary>The lost chunks, ascending; empty when nothing is recorded or everything is on disk.</summary>
    public static IReadOnlyList<string> Find(ISweepCatalog catalog, SweepRecord sweep)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(sweep);
        if (sweep.Counts.Done + sweep.Counts.Unstable + sweep.Counts.Failed == 0)
        {
            return [];
        }

        var folder = SweepFolder.Table(sweep.OutputFolder, TableNames.Points);
        var recorded = catalog.GetChunksWithResults(sweep.SweepId);
        if (recorded.Count == 0)
        {
            return [];
        }

        var present = ChunksOnDisk(folder);
        return [.. recorded.Where(c => !present.Contains(c))];
    }

    /// <summary>Chunks with rows in a table folder: its part files and the merged files' chunk list (where the merged file exists).</summary>
    public static HashSet<string> ChunksOnDisk(string tableFolder)
    {
        var present = new HashSet<string>(StringComparer.Ordinal);
        if (!Directory.Exists(tableFolder))
        {
            return present;
        }

        foreach (var file in Directory.EnumerateFiles(tableFolder, MergedLayout.PartPrefix + "*.parquet"))
        {
            if (MergedLayout.ChunkOfPart(Path.GetFileName(file)) is { } chunk)
            {
                present.Add(chunk);
            }
        }

        var existing = new Dictionary<string, bool>(StringComparer.Ordinal);
        foreach (var (chunk, file) in MergedLayout.MergedChunks(tableFolder))
        {
            if (!existing.TryGetValue(file, out var exists))
            {
                exists = File.Exists(Path.Combine(tableFolder, file));
                existing[file] = exists;
            }

            if (exists)
            {
                present.Add(chunk);
            }
        }

        return present;
    }
}
