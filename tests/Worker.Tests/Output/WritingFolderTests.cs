using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// A table's <c>.writing/</c> folder goes once a chunk's parts are in place and it is empty; writers of other chunks that find
/// it gone between their steps make it again (invented demo rows).
/// </summary>
public sealed class WritingFolderTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public async Task Writers_of_many_chunks_that_remove_the_empty_folder_after_each_commit_all_commit_their_parts()
    {
        var folder = _dir.Combine("demo");
        Directory.CreateDirectory(folder);
        var rows = new TableRows("demo", DemoParts.Columns, 1,
            [new string?[] { "00000000000000aa" }, new string?[] { "total" }, new int?[] { 0 }, new long?[] { 1 }, new double?[] { 0.5 }, new bool?[] { true },
             new DateTime?[] { new DateTime(2026, 12, 5, 12, 0, 0, DateTimeKind.Utc) }]);
        var metadata = new Dictionary<string, string> { ["latticesweep.table"] = "demo" };

        // Four writers, each preparing, committing and removing the empty folder in turn, as chunks of one table do in a pool.
        var writers = Enumerable.Range(0, 4).Select(w => Task.Run(async () =>
        {
            for (var i = 0; i < 40; i++)
            {
                var part = await ParquetPartWriter.PrepareAsync(folder, $"w{w}-c{i:d2}", rows, metadata, CancellationToken.None);
                part.Commit();
                ParquetPartWriter.RemoveWritingFolderIfEmpty(folder);
            }
        })).ToArray();
        await Task.WhenAll(writers);

        Assert.Equal(160, Directory.GetFiles(folder, "part-*.parquet").Length);
        Assert.False(Directory.Exists(Path.Combine(folder, ParquetPartWriter.WritingFolderName)));
    }

    [Fact]
    public async Task Writers_whose_folder_another_thread_keeps_removing_all_commit_their_parts()
    {
        // A remover that takes the empty folder away as fast as they can hit each window between a writer's steps, among them the
        // one between mkdir finding the folder and .NET looking whether it is one (reported as "already exists").
        var folder = _dir.Combine("demo");
        Directory.CreateDirectory(folder);
        var rows = new TableRows("demo", DemoParts.Columns, 1,
            [new string?[] { "00000000000000ab" }, new string?[] { "total" }, new int?[] { 0 }, new long?[] { 2 }, new double?[] { 0.25 }, new bool?[] { false },
             new DateTime?[] { new DateTime(2026, 12, 5, 18, 0, 0, DateTimeKind.Utc) }]);
        using var stop = new CancellationTokenSource();
        // Threads of their own, so the spinning remover does not hold the pool's threads the writers' continuations need.
        var removers = Enumerable.Range(0, 1).Select(_ => Task.Factory.StartNew(() =>
        {
            while (!stop.IsCancellationRequested)
            {
                ParquetPartWriter.RemoveWritingFolderIfEmpty(folder);
                Thread.Yield();
            }
        }, TaskCreationOptions.LongRunning)).ToArray();

        var writers = Enumerable.Range(0, 3).Select(w => Task.Run(async () =>
        {
            for (var i = 0; i < 60; i++)
            {
                var part = await ParquetPartWriter.PrepareAsync(folder, $"r{w}-c{i:d3}", rows, new Dictionary<string, string>(), CancellationToken.None);
                part.Commit();
            }
        })).ToArray();
        try
        {
            await Task.WhenAll(writers);
        }
        finally
        {
            stop.Cancel();
            await Task.WhenAll(removers);
        }

        Assert.Equal(180, Directory.GetFiles(folder, "part-*.parquet").Length);
    }

    [Fact]
    public async Task A_folder_holding_a_part_being_written_stays()
    {
        var folder = _dir.Combine("demo");
        Directory.CreateDirectory(folder);
        var rows = new TableRows("demo", DemoParts.Columns, 0,
            [Array.Empty<string?>(), Array.Empty<string?>(), Array.Empty<int?>(), Array.Empty<long?>(), Array.Empty<double?>(), Array.Empty<bool?>(), Array.Empty<DateTime?>()]);
        var pending = await ParquetPartWriter.PrepareAsync(folder, "c01", rows, new Dictionary<string, string>(), CancellationToken.None);

        ParquetPartWriter.RemoveWritingFolderIfEmpty(folder);
        Assert.True(File.Exists(pending.TemporaryPath));

        pending.Commit();
        ParquetPartWriter.RemoveWritingFolderIfEmpty(folder);
        Assert.False(Directory.Exists(Path.Combine(folder, ParquetPartWriter.WritingFolderName)));
        Assert.True(File.Exists(Path.Combine(folder, ParquetPartWriter.PartFileName("c01"))));
    }
}
