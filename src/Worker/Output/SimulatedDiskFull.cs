using System.Globalization;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// A test seam that makes the results folder behave as if its disk filled up: when the environment
/// variable <see cref="Variable"/> is set to N, this process may write N bytes of part files in all,
/// and every write beyond that fails the way a full disk does on Linux (an <see cref="IOException"/>
/// "No space left on device", error number 28, after writing what still fits). Everything after the
/// write (clean-up, retries, the points' failure, <c>resume</c>) is the real code path.
/// </summary>
/// <remarks>
/// Why a seam: a really full file system needs a small mounted one (tmpfs, a loop device), which
/// needs privileges a CI container does not have, and a read-only folder does not stop root.
/// Unset (always, outside tests) it costs one environment lookup per process.
/// </remarks>
internal static class SimulatedDiskFull
{
    /// <summary>Bytes of part files this process may write before the simulated disk is full.</summary>
    public const string Variable = "LATSWEEP_TEST_DISK_FULL_AFTER_BYTES";

    /// <summary>Error number of "No space left on device" on Linux (ENOSPC).</summary>
    public const int NoSpaceErrorNumber = 28;

    private static long _remaining = ReadBudget();

    /// <summary>True when the variable is set for this process.</summary>
    public static bool Active { get; } = _remaining >= 0;

    /// <summary>The stream to write a part through: <paramref name="file"/> itself unless the seam is on.</summary>
    public static Stream Wrap(Stream file, string path) => Active ? new BudgetStream(file, path) : file;

    private static long ReadBudget() =>
        long.TryParse(Environment.GetEnvironmentVariable(Variable), NumberStyles.Integer, CultureInfo.InvariantCulture, out var bytes) && bytes >= 0
            ? bytes
            : -1;

    /// <summary>Takes up to <paramref name="wanted"/> bytes from the budget; returns how many may be written.</summary>
    private static int Take(int wanted)
    {
        while (true)
        {
            var left = Interlocked.Read(ref _remaining);
            var granted = (int)Math.Min(wanted, Math.Max(0, left));
            if (Interlocked.CompareExchange(ref _remaining, left - granted, left) == left)
            {
                return granted;
            }
        }
    }

    private sealed class BudgetStream(Stream inner, string path) : Stream
    {
        public override bool CanRead => inner.CanRead;
        public override bool CanSeek => inner.CanSeek;
        public override bool CanWrite => inner.CanWrite;
        public override long Length => inner.Length;

        public override long Position
        {
            get => inner.Position;
            set => inner.Position = value;
        }

        public override void Flush() => inner.Flush();
        public override Task FlushAsync(CancellationToken cancellationToken) => inner.FlushAsync(cancellationToken);
        public override int Read(byte[] buffer, int offset, int count) => inner.Read(buffer, offset, count);
        public override long Seek(long offset, SeekOrigin origin) => inner.Seek(offset, origin);
        public override void SetLength(long value) => inner.SetLength(value);

        public override void Write(byte[] buffer, int offset, int count)
        {
            var granted = Take(count);
            inner.Write(buffer, offset, granted);
            if (granted < count)
            {
                throw Full();
            }
        }

        public override void Write(ReadOnlySpan<byte> buffer)
        {
            var granted = Take(buffer.Length);
            inner.Write(buffer[..granted]);
            if (granted < buffer.Length)
            {
                throw Full();
            }
        }

        public override async ValueTask WriteAsync(ReadOnlyMemory<byte> buffer, CancellationToken cancellationToken = default)
        {
            var granted = Take(buffer.Length);
            await inner.WriteAsync(buffer[..granted], cancellationToken).ConfigureAwait(false);
            if (granted < buffer.Length)
            {
                throw Full();
            }
        }

        public override Task WriteAsync(byte[] buffer, int offset, int count, CancellationToken cancellationToken) =>
            WriteAsync(buffer.AsMemory(offset, count), cancellationToken).AsTask();

        public override void WriteByte(byte value) => Write([value], 0, 1);

        // The message .NET gives for ENOSPC on Linux.
        private IOException Full() => new($"No space left on device : '{path}'", NoSpaceErrorNumber);
    }
}
