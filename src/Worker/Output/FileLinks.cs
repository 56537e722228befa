using System.Runtime.InteropServices;

namespace LatticeSweep.Worker.Output;

/// <summary>A second name for a file (a hard link, so nothing is copied), or a copy where links are not possible.</summary>
internal static class FileLinks
{
    public static void LinkOrCopy(string existing, string newPath)
    {
        if (!OperatingSystem.IsWindows() && Link(existing, newPath) == 0)
        {
            return;
        }

        File.Copy(existing, newPath);
    }

    [DllImport("libc", EntryPoint = "link", SetLastError = true)]
    private static extern int Link([MarshalAs(UnmanagedType.LPUTF8Str)] string existing, [MarshalAs(UnmanagedType.LPUTF8Str)] string newPath);
}
