namespace LatticeSweep.Worker.Output;

/// <summary>A part file written to its temporary name, waiting to replace the final one.</summary>
internal sealed record PreparedPart(string TemporaryPath, string FinalPath)
{
    /// <summary>Renames the temporary file over the final name (atomic on one file system).</summary>
    public void Commit() => File.Move(TemporaryPath, FinalPath, overwrite: true);

    /// <summary>Removes the temporary file; the final one is left as it was.</summary>
    public void Discard() => ParquetPartWriter.TryDelete(TemporaryPath);
}
