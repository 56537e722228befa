namespace LatticeSweep.Worker.Output;

/// <summary>Checks before any work that results can be written where they are to go.</summary>
public static class OutputFolderCheck
{
    /// <summary>Creates the folder and writes and removes a probe file; throws <see cref="OutputFolderException"/> with a plain reason.</summary>
    public static void EnsureWritable(string folder)
    {
        try
        {
            Directory.CreateDirectory(folder);
            var probe = Path.Combine(folder, $".write-check-{Guid.NewGuid():N}");
            File.WriteAllText(probe, "");
            File.Delete(probe);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new OutputFolderException($"cannot write results to {folder}: {ex.Message} (choose another --out, or fix the folder's permissions)", ex);
        }
    }
}

/// <summary>The output folder cannot be written: bad input, exit code 2.</summary>
public sealed class OutputFolderException : Exception
{
    public OutputFolderException()
    {
    }

    public OutputFolderException(string message)
        : base(message)
    {
    }

    public OutputFolderException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
