namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>Paths in the repository the tests run from.</summary>
internal static class Repository
{
    public static string Root()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Batch.sln")))
        {
            dir = dir.Parent;
        }

        return dir?.FullName ?? throw new InvalidOperationException("Batch.sln not found above the test output folder");
    }
}
