using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using Microsoft.AspNetCore.Mvc;
using Microsoft.AspNetCore.Mvc.RazorPages;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>An entry of a dataset folder listing.</summary>
public sealed record FolderEntry(string Name, string Url, bool IsFolder, long? SizeBytes, DateTimeOffset ModifiedAt);

/// <summary>
/// Browses the output root: a folder lists its entries, a file downloads. Any path that is not
/// inside the root once made absolute and its links followed gets 404, as does a hidden file
/// (a writer's temporary).
/// </summary>
internal sealed class FilesModel : PageModel
{
    private readonly SweepBoard _board;

    public FilesModel(SweepBoard board)
    {
        _board = board;
    }

    public string RelativePath { get; private set; } = "";

    public IReadOnlyList<FolderEntry> Entries { get; private set; } = [];

    public IReadOnlyList<(string Name, string Url)> Crumbs { get; private set; } = [];

    public IActionResult OnGet(string? path)
    {
        // A catch-all keeps %2F encoded: decode it so that it is checked like any other separator.
        var relative = Uri.UnescapeDataString(path ?? "");
        if (relative.Split('/').Any(part => part.StartsWith('.') && part is not ("." or "..")))
        {
            return NotFound();
        }

        if (_board.Root.Resolve(relative) is not { } full)
        {
            return NotFound();
        }

        if (System.IO.File.Exists(full))
        {
            return PhysicalFile(full, ContentType(full), System.IO.Path.GetFileName(full));
        }

        if (!Directory.Exists(full))
        {
            return NotFound();
        }

        RelativePath = _board.Root.Relative(full);
        var crumbs = new List<(string, string)> { ("output root", Links.Files("")) };
        var walked = "";
        foreach (var part in RelativePath.Split('/', StringSplitOptions.RemoveEmptyEntries))
        {
            walked = walked.Length == 0 ? part : walked + "/" + part;
            crumbs.Add((part, Links.Files(walked)));
        }

        Crumbs = crumbs;
        var folder = new DirectoryInfo(full);
        Entries = [.. folder.EnumerateFileSystemInfos()
            .Where(e => !e.Name.StartsWith('.'))
            .Where(e => _board.Root.Contain(e.FullName) is not null)
            .OrderBy(e => e is FileInfo).ThenBy(e => e.Name, StringComparer.Ordinal)
            .Select(e => new FolderEntry(e.Name, Links.Files(RelativePath.Length == 0 ? e.Name : RelativePath + "/" + e.Name),
                e is DirectoryInfo, e is FileInfo f ? f.Length : null, new DateTimeOffset(e.LastWriteTimeUtc, TimeSpan.Zero)))];
        return Page();
    }

    private static string ContentType(string file) => System.IO.Path.GetExtension(file).ToLowerInvariant() switch
    {
        ".json" => "application/json",
        ".parquet" => "application/vnd.apache.parquet",
        ".toml" or ".txt" or ".csv" or ".log" => "text/plain; charset=utf-8",
        _ => "application/octet-stream",
    };
}
