namespace LatticeSweep.Worker.Output;

/// <summary>
/// The sweep folder's advisory lock (<c>.output.lock</c>): chunk writers commit their parts under a
/// shared hold, the merge swaps a table's files under an exclusive one, so a part is never renamed
/// into a table folder while that folder is being replaced. .NET takes it with flock(2) on Unix
/// (FileShare.None: exclusive; otherwise shared); the kernel drops it when the holder dies.
/// </summary>
internal static class OutputLock
{
    public const string FileName = ".output.lock";

    /// <summary>How long a writer or a merge waits for the other before giving up with an I/O fault.</summary>
    public static readonly TimeSpan Patience = TimeSpan.FromMinutes(30);

    public static IDisposable Shared(string sweepFolder) => Take(sweepFolder, FileShare.ReadWrite);

    public static IDisposable Exclusive(string sweepFolder) => Take(sweepFolder, FileShare.None);

    private static FileStream Take(string sweepFolder, FileShare share)
    {
        Directory.CreateDirectory(sweepFolder);
        var path = Path.Combine(sweepFolder, FileName);
        var start = Environment.TickCount64;
        var wait = 5;
        while (true)
        {
            try
            {
                return new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, share);
            }
            catch (IOException) when (Environment.TickCount64 - start < Patience.TotalMilliseconds)
            {
                Thread.Sleep(wait);
                wait = Math.Min(wait * 2, 200);
            }
        }

    }
}
