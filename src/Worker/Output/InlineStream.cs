namespace LatticeSweep.Worker.Output;

/// <summary>
/// A file stream whose asynchronous reads, writes and flushes run on the calling thread and are done
/// when they return. A <see cref="FileStream"/> opened for synchronous I/O (as the merge opens its
/// files) runs each asynchronous read on a thread-pool thread, and the awaiting code goes on on that
/// thread: a merge wandered over the whole pool, and every thread it touched kept, in its slots of .NET's
/// shared <c>ArrayPool</c>, the large arrays Parquet.Net rents for a row group (bench/README, round 18).
/// Through this stream the merge stays on the one thread that <see cref="MergeThread"/> gives it.
/// It does not own the file: whoever opened the file disposes it.
/// </summary>
internal sealed class InlineStream(FileStream file) : Stream
{
    public override bool CanRead => file.CanRead;

    public override bool CanSeek => file.CanSeek;

    public override bool CanWrite => file.CanWrite;

    public override long Length => file.Length;

    public override long Position
    {
        get => file.Position;
        set => file.Position = value;
    }

    public override void Flush() => file.Flush();

    public override Task FlushAsync(CancellationToken cancellationToken)
    {
        cancellationToken.ThrowIfCancellationRequested();
        file.Flush();
        return Task.CompletedTask;
    }

    public override int Read(byte[] buffer, int offset, int count) => file.Read(buffer, offset, count);

    public override int Read(Span<byte> buffer) => file.Read(buffer);

    public override Task<int> ReadAsync(byte[] buffer, int offset, int count, CancellationToken cancellationToken)
    {
        cancellationToken.ThrowIfCancellationRequested();
        return Task.FromResult(file.Read(buffer, offset, count));
    }

    public override ValueTask<int> ReadAsync(Memory<byte> buffer, CancellationToken cancellationToken = default)
    {
        cancellationToken.ThrowIfCancellationRequested();
        return new ValueTask<int>(file.Read(buffer.Span));
    }

    public override long Seek(long offset, SeekOrigin origin) => file.Seek(offset, origin);

    public override void SetLength(long value) => file.SetLength(value);

    public override void Write(byte[] buffer, int offset, int count) => file.Write(buffer, offset, count);

    public override void Write(ReadOnlySpan<byte> buffer) => file.Write(buffer);

    public override Task WriteAsync(byte[] buffer, int offset, int count, CancellationToken cancellationToken)
    {
        cancellationToken.ThrowIfCancellationRequested();
        file.Write(buffer, offset, count);
        return Task.CompletedTask;
    }

    public override ValueTask WriteAsync(ReadOnlyMemory<byte> buffer, CancellationToken cancellationToken = default)
    {
        cancellationToken.ThrowIfCancellationRequested();
        file.Write(buffer.Span);
        return ValueTask.CompletedTask;
    }
}
