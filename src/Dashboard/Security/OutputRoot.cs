namespace LatticeSweep.Dashboard.Security;

/// <summary>
/// The only folder the dashboard reads files from. Every path is made absolute, its symbolic
/// links followed, and then checked to lie inside the root; anything else is treated as absent,
/// so a traversal attempt and a missing file look the same (404).
/// </summary>
internal sealed class OutputRoot
{
    public OutputRoot(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        Path = Canonical(System.IO.Path.GetFullPath(path));
    }

    /// <summary>The canonical absolute root, without a trailing separator.</summary>
    public string Path { get; }

    /// <summary>
    /// The canonical form of <paramref name="relative"/> under the root, or null when it is rooted,
    /// leaves the root (by <c>..</c> or a link), or contains characters no file name here may have.
    /// The target need not exist.
    /// </summary>
    public string? Resolve(string? relative)
    {
        relative ??= "";
        if (relative.Contains('\0', StringComparison.Ordinal) || System.IO.Path.IsPathRooted(relative) || relative.Contains('\\', StringComparison.Ordinal))
        {
            return null;
        }

        var combined = System.IO.Path.GetFullPath(System.IO.Path.Combine(Path, relative));
        return Inside(combined) && Canonical(combined) is { } real && Inside(real) ? real : null;
    }

    /// <summary>The canonical form of an absolute path (e.g. a sweep's folder from the catalog) when it lies under the root; else null.</summary>
    public string? Contain(string? absolute)
    {
        if (string.IsNullOrEmpty(absolute) || !System.IO.Path.IsPathFullyQualified(absolute))
        {
            return null;
        }

        var full = System.IO.Path.GetFullPath(absolute);
        return Canonical(full) is { } real && Inside(real) ? real : null;
    }

    /// <summary>The path relative to the root with forward slashes (for links).</summary>
    public string Relative(string canonical)
    {
        var rel = System.IO.Path.GetRelativePath(Path, canonical);
        return rel == "." ? "" : rel.Replace(System.IO.Path.DirectorySeparatorChar, '/');
    }

    private bool Inside(string full) =>
        string.Equals(full, Path, StringComparison.Ordinal)
        || full.StartsWith(Path + System.IO.Path.DirectorySeparatorChar, StringComparison.Ordinal);

    /// <summary>Follows symbolic links in every existing part of the path; the parts that do not exist are kept as written.</summary>
    private static string Canonical(string full, int depth = 0)
    {
        const int MaxLinkDepth = 32;
        var root = System.IO.Path.GetPathRoot(full)!;
        var current = root;
        var parts = full[root.Length..].Split(System.IO.Path.DirectorySeparatorChar, StringSplitOptions.RemoveEmptyEntries);
        for (var i = 0; i < parts.Length; i++)
        {
            var next = System.IO.Path.Combine(current, parts[i]);
            FileSystemInfo info = Directory.Exists(next) ? new DirectoryInfo(next) : new FileInfo(next);
            if (info.LinkTarget is not null && depth < MaxLinkDepth
                && info.ResolveLinkTarget(returnFinalTarget: true) is { } target)
            {
                // The target may itself sit below linked folders: canonicalise it in turn.
                current = Canonical(System.IO.Path.GetFullPath(target.FullName), depth + 1);
                continue;
            }

            if (!info.Exists && info.LinkTarget is null)
            {
                return System.IO.Path.Combine([current, .. parts[i..]]);
            }

            current = next;
        }

        return current.Length > root.Length ? current.TrimEnd(System.IO.Path.DirectorySeparatorChar) : current;
    }
}
