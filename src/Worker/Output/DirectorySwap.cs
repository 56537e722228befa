using System.Runtime.InteropServices;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Swaps two directories in one step (Linux renameat2 with RENAME_EXCHANGE), so a reader listing a
/// table folder sees either all of the old files or all of the new ones. Where the file system
/// cannot exchange, two renames are used and a reader may, for an instant, find the folder missing
/// (never both sets of files); <see cref="TableMerger"/> finishes such an interrupted swap.
/// </summary>
internal static class DirectorySwap
{
    private const int AtCurrentDirectory = -100;
    private const uint RenameExchange = 2;

    /// <summary>Puts <paramref name="replacement"/> at <paramref name="live"/>; the old content ends at <paramref name="replacement"/>.</summary>
    public static void Exchange(string live, string replacement)
    {
        if (OperatingSystem.IsLinux() && RenameAt2(AtCurrentDirectory, replacement, AtCurrentDirectory, live, RenameExchange) == 0)
        {
            return;
        }

        // No exchange here (another OS or file system): the old folder steps aside, the new one moves in.
        var aside = replacement + ".old";
        Directory.Move(live, aside);
        Directory.Move(replacement, live);
        Directory.Move(aside, replacement);
    }

    [DllImport("libc", EntryPoint = "renameat2", SetLastError = true)]
    private static extern int RenameAt2(int oldDirectory, [MarshalAs(UnmanagedType.LPUTF8Str)] string oldPath, int newDirectory, [MarshalAs(UnmanagedType.LPUTF8Str)] string newPath, uint flags);
}
