namespace LatticeSweep.Dashboard.Security;

/// <summary>
/// Resolves every symbolic link in an absolute path, one link at a time (as the kernel does), so
/// that the result names the file itself and no link is left in it. A path that needs more than
/// <see cref="MaxLinks"/> links (a loop always does) is refused rather than kept half-resolved:
/// a check on a half-resolved path would check a path the kernel then follows further.
/// </summary>
internal static class LinkFreePath
{
    /// <summary>
    /// Links followed per path at most. Far above any real layout and above the kernel's own limit
    /// (40 on Linux), so every path the system could open is resolved; a loop reaches it quickly.
    /// </summary>
    public const int MaxLinks = 256;

    /// <summary>
    /// The path with every link resolved; parts that do not exist are kept as written (a file about
    /// to be created). Null when it needs more than <see cref="MaxLinks"/> links, or when a
    /// <c>..</c> follows a part that does not exist (it cannot be resolved without guessing).
    /// </summary>
    public static string? Resolve(string fullPath)
    {
        ArgumentException.ThrowIfNullOrEmpty(fullPath);
        var root = Path.GetPathRoot(fullPath);
        if (string.IsNullOrEmpty(root))
        {
            return null;
        }

        var pending = new Stack<string>();
        Push(pending, fullPath[root.Length..]);
        var current = root;
        var links = 0;
        while (pending.TryPop(out var part))
        {
            if (part is "" or ".")
            {
                continue;
            }

            if (part == "..")
            {
                current = Path.GetDirectoryName(current) ?? root;
                continue;
            }

            var next = Path.Combine(current, part);
            var target = new FileInfo(next).LinkTarget;
            if (target is not null)
            {
                if (++links > MaxLinks)
                {
                    return null;
                }

                // The link's text replaces this part: absolute from the root, relative from its folder.
                if (Path.IsPathRooted(target))
                {
                    current = Path.GetPathRoot(target) ?? root;
                    target = target[current.Length..];
                }

                Push(pending, target);
                continue;
            }

            if (!File.Exists(next) && !Directory.Exists(next))
            {
                var rest = new List<string> { part };
                while (pending.TryPop(out var p))
                {
                    if (p == "..")
                    {
                        return null;
                    }

                    if (p is not ("" or "."))
                    {
                        rest.Add(p);
                    }
                }

                return Path.Combine([current, .. rest]);
            }

            current = next;
        }

        return current;
    }

    private static void Push(Stack<string> pending, string relative)
    {
        var parts = relative.Split(Path.DirectorySeparatorChar, StringSplitOptions.RemoveEmptyEntries);
        for (var i = parts.Length - 1; i >= 0; i--)
        {
            pending.Push(parts[i]);
        }
    }
}
