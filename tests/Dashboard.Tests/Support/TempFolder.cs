namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>A fresh folder under the system temp folder, removed at the end.</summary>
internal sealed class TempFolder : IDisposable
{
    public TempFolder(string prefix = "latsweep-dash-")
    {
        Path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), prefix + Guid.NewGuid().ToString("N")[..12]);
        Directory.CreateDirectory(Path);
    }

    public string Path { get; }

    public string Combine(params string[] parts) => System.IO.Path.Combine([Path, .. parts]);

    public void Dispose()
    {
        try
        {
            Directory.Delete(Path, recursive: true);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }
}
