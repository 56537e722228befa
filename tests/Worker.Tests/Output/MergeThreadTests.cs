using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// The merge's own thread (<see cref="MergeThread"/>) and the file stream whose asynchronous calls run
/// inline (<see cref="InlineStream"/>): a Parquet file written and read through it is what DuckDB reads,
/// its calls are done when they return, and the merge thread hands back the work's result or its error.
/// </summary>
public sealed class MergeThreadTests : IDisposable
{
    private static readonly ColumnDef[] Columns =
    [
        new("point_id", ColumnType.Text, "", ""),
        new("value_thz", ColumnType.Double, "THz", ""),
    ];

    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public async Task A_parquet_file_written_through_an_inline_stream_reads_back_in_duckdb_with_every_row()
    {
        var path = _dir.Combine("inline.parquet");
        var ids = Enumerable.Range(0, 5000).Select(i => (string?)$"p{i:d5}").ToArray();
        var values = Enumerable.Range(0, 5000).Select(i => i % 9 == 0 ? null : (double?)(i * 0.25)).ToArray();
        await using (var file = new FileStream(path, FileMode.CreateNew, FileAccess.ReadWrite))
        {
            await using (var writer = await ParquetTableWriter.CreateAsync(new InlineStream(file), Columns, new Dictionary<string, string>(), CancellationToken.None))
            {
                var rows = new TableRows("demo", Columns, ids.Length, [ids, values]);
                await writer.WriteRowGroupAsync(rows, 0, 3000, CancellationToken.None);
                await writer.WriteRowGroupAsync(rows, 3000, 2000, CancellationToken.None);
            }

            file.Flush(flushToDisk: true);
        }

        using var db = new DuckDb();
        Assert.Equal(5000L, Convert.ToInt64(db.Scalar($"SELECT count(DISTINCT point_id) FROM read_parquet('{path}')"), System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal(4444L, Convert.ToInt64(db.Scalar($"SELECT count(value_thz) FROM read_parquet('{path}')"), System.Globalization.CultureInfo.InvariantCulture));
        // Sum of i / 4 over i in 0..4999 not divisible by 9: (sum of all - 9 * sum of 0..555) / 4, exact in binary.
        var expected = ((4999.0 * 5000 / 2) - (9.0 * 555 * 556 / 2)) / 4;
        Assert.Equal(expected, Convert.ToDouble(db.Scalar($"SELECT sum(value_thz) FROM read_parquet('{path}')"), System.Globalization.CultureInfo.InvariantCulture));

        // Read back through the stream: the reader sees the same columns and rows.
        await using var read = new FileStream(path, FileMode.Open, FileAccess.Read);
        await using var reader = await Parquet.ParquetReader.CreateAsync(new InlineStream(read));
        Assert.Equal(2, reader.RowGroupCount);
        Assert.Equal(["point_id", "value_thz"], reader.Schema.GetDataFields().Select(f => f.Name));
    }

    [Fact]
    public async Task Its_asynchronous_reads_writes_and_flushes_are_done_when_they_return()
    {
        var path = _dir.Combine("bytes.bin");
        await using var file = new FileStream(path, FileMode.CreateNew, FileAccess.ReadWrite);
        await using var stream = new InlineStream(file);
        var write = stream.WriteAsync(new byte[] { 1, 2, 3, 4, 5 }.AsMemory());
        Assert.True(write.IsCompletedSuccessfully);
        var writeArray = stream.WriteAsync([6, 7], 0, 2);
        Assert.True(writeArray.IsCompletedSuccessfully);
        Assert.True(stream.FlushAsync().IsCompletedSuccessfully);
        Assert.Equal(7, stream.Length);

        stream.Position = 1;
        var buffer = new byte[4];
        var read = stream.ReadAsync(buffer.AsMemory());
        Assert.True(read.IsCompletedSuccessfully);
        Assert.Equal(4, await read);
        Assert.Equal(new byte[] { 2, 3, 4, 5 }, buffer);
        var rest = stream.ReadAsync(buffer, 0, 4);
        Assert.True(rest.IsCompletedSuccessfully);
        Assert.Equal(2, await rest);
        Assert.Equal(0, await stream.ReadAsync(buffer.AsMemory()));

        // A cancelled call throws and does nothing.
        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();
        Assert.Throws<OperationCanceledException>(() => { _ = stream.WriteAsync(new byte[] { 9 }.AsMemory(), cancelled.Token); });
        Assert.Equal(7, stream.Length);
    }

    [Fact]
    public void The_merge_thread_runs_the_work_on_a_thread_of_its_own_that_has_ended_when_it_returns()
    {
        Thread? ranOn = null;
        var result = MergeThread.Run("merge demo", async () =>
        {
            ranOn = Thread.CurrentThread;
            await Task.CompletedTask;
            return 42;
        });

        Assert.Equal(42, result);
        Assert.NotNull(ranOn);
        Assert.NotSame(Thread.CurrentThread, ranOn);
        Assert.Equal("merge demo", ranOn!.Name);
        Assert.False(ranOn.IsAlive);
    }

    [Fact]
    public void The_merge_thread_hands_back_the_works_error_with_its_type_and_message()
    {
        var error = Assert.Throws<InvalidDataException>(() => MergeThread.Run<int>("merge demo", () => throw new InvalidDataException("part-c1.parquet: not sorted")));
        Assert.Equal("part-c1.parquet: not sorted", error.Message);
        var faulted = Assert.Throws<IOException>(() => MergeThread.Run<int>("merge demo", () => Task.FromException<int>(new IOException("disk full"))));
        Assert.Equal("disk full", faulted.Message);
    }
}
