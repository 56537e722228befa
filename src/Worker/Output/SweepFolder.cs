namespace LatticeSweep.Worker.Output;

/// <summary>
/// Layout of one sweep's dataset: <c>&lt;root&gt;/&lt;sweep id&gt;/</c> holding <c>sweep.json</c> and one
/// folder per table (<c>points/</c>, <c>dos/</c>, ...) of <c>part-&lt;chunk&gt;.parquet</c> files.
/// </summary>
public static class SweepFolder
{
    public const string ManifestFileName = "sweep.json";

    /// <summary>The sweep's folder under the output root; refuses an id that would leave the root.</summary>
    public static string For(string outputRoot, string sweepId)
    {
        var root = Path.GetFullPath(outputRoot);
        var folder = Path.GetFullPath(Path.Combine(root, sweepId));
        var relative = Path.GetRelativePath(root, folder);
        if (sweepId.Length == 0 || relative.StartsWith("..", StringComparison.Ordinal) || Path.IsPathRooted(relative)
            || relative.Contains(Path.DirectorySeparatorChar, StringComparison.Ordinal))
        {
            throw new ArgumentException($"the sweep id '{sweepId}' does not name a folder directly under {root}", nameof(sweepId));
        }

        return folder;
    }

    public static string Table(string sweepFolder, string table) => Path.Combine(sweepFolder, table);

    public static string Manifest(string sweepFolder) => Path.Combine(sweepFolder, ManifestFileName);
}
