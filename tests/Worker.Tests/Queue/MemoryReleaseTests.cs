using System.Runtime.InteropServices;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Queue;

public sealed class MemoryReleaseTests
{
    /// <summary>glibc's chunk header flag for a block mapped on its own (malloc.c, <c>IS_MMAPPED</c>).</summary>
    private const long MappedFlag = 0x2;

    [Fact]
    public void After_start_a_large_block_freed_leaves_the_next_blocks_over_128_KiB_mapped_on_their_own()
    {
        // glibc only: elsewhere (musl, macOS, Windows) there is no such threshold and nothing is set.
        if (!OperatingSystem.IsLinux() || !IsGlibc() || ThresholdsFromEnvironment())
        {
            return;
        }

        MemoryRelease.LimitNativeArenas();

        // Left to itself, glibc raises its mmap threshold to the size of a mapped block freed (here 4 MiB), and later
        // blocks under it come from the arenas, whose freed pages it then keeps (bench/README, round 28 (grid memory)).
        Marshal.FreeHGlobal(Marshal.AllocHGlobal(4 << 20));
        var block = Marshal.AllocHGlobal(512 << 10);
        try
        {
            // The size word before the block holds the flags; a header check that no other thread's allocations can disturb.
            var size = Marshal.ReadInt64(block, -8);
            Assert.True((size & MappedFlag) != 0, $"a 512 KiB block after a freed 4 MiB one came from an arena (size word 0x{size:x})");
        }
        finally
        {
            Marshal.FreeHGlobal(block);
        }
    }

    private static bool ThresholdsFromEnvironment() =>
        Environment.GetEnvironmentVariable("MALLOC_TRIM_THRESHOLD_") is not null
        || Environment.GetEnvironmentVariable("MALLOC_MMAP_THRESHOLD_") is not null
        || Environment.GetEnvironmentVariable("GLIBC_TUNABLES") is not null;

    private static bool IsGlibc()
    {
        try
        {
            return GnuLibcVersion() != IntPtr.Zero;
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            return false;
        }
    }

    [DllImport("libc", EntryPoint = "gnu_get_libc_version")]
    private static extern IntPtr GnuLibcVersion();
}
