namespace LatticeSweep.Dashboard.Security;

/// <summary>
/// The only folder the dashboard reads files from. Every path is made absolute, every symbolic
/// link in it resolved until none is left (or the path is refused), and then checked to lie
/// inside the root; anything else is treated as absent, so a traversal attempt and a missing file
/// look the same (404).
/// </summary>
internal sealed class OutputRoot
{
    public OutputRoot(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        Path = Canonical(System.IO.Path.GetFullPath(path))
            ?? throw new Hosting.DashboardStartException($"--out: the output root {path} cannot be resolved (a loop of symbolic links, or more than {LinkFreePath.MaxLinks} of them)");
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

    /// <summary>The path with every link resolved (<see cref="LinkFreePath"/>), without a trailing separator; null when refused.</summary>
    private static string? Canonical(string full) =>
        LinkFreePath.Resolve(full) is { } real ? (real.Length > 1 ? real.TrimEnd(System.IO.Path.DirectorySeparatorChar) : real) : null;
}
