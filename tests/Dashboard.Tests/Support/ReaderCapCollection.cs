namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>
/// Tests that assert whether a file's reader is kept open run alone: the cap on kept readers
/// (<c>ParquetColumnFile.MaxReadersKept</c>) is shared by the whole process, so a parallel test that
/// holds many readers could make a new one close at once and fail the assertion for no fault of the code.
/// </summary>
[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class ReaderCapCollection
{
    public const string Name = "kept readers, alone";
}
