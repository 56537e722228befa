using System.Text;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// A sweep's id: its name made safe for a folder name, and the first 8 hex digits of its spec
/// hash. The same job file submitted again gets the same id (and continues that sweep); a changed
/// one gets a new id and a new folder.
/// </summary>
public static class SweepIds
{
    public static string For(string sweepName, string specHash)
    {
        ArgumentNullException.ThrowIfNull(sweepName);
        ArgumentException.ThrowIfNullOrEmpty(specHash);
        var name = new StringBuilder();
        foreach (var ch in sweepName.Trim().ToLowerInvariant())
        {
            name.Append(char.IsAsciiLetterOrDigit(ch) || ch is '-' or '_' ? ch : '-');
        }

        var safe = name.ToString().Trim('-', '_');
        if (safe.Length == 0)
        {
            safe = "sweep";
        }

        if (safe.Length > 60)
        {
            safe = safe[..60];
        }

        var hash = new string([.. specHash.Where(char.IsAsciiLetterOrDigit)]).ToLowerInvariant();
        return $"{safe}-{hash[..Math.Min(8, hash.Length)]}";
    }
}
