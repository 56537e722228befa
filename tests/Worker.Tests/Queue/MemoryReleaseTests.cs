using System.Runtime.InteropServices;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Queue;

public sealed class MemoryReleaseTests
{
    /// <summary>glibc's chunk header flag for a block mapped on its own (malloc.c, <c>IS_MMAPPED</c>).</summary>
    private const long MappedFlag = 0x2;

    [Fact]
    public void After_start_a_large_block_freed_leaves_most_later_blocks_over_128_KiB_mapped_on_their_own()
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

        // 200 blocks of 512 KiB (100 MiB): a block may still come from free space the arena already holds (earlier tests on
        // this thread freed theirs), but no arena of this process holds 50 MiB free, so with the threshold fixed most are
        // mapped on their own, and with it raised none are. One block alone made the check depend on the tests run before.
        const int Blocks = 200;
        var blocks = new IntPtr[Blocks];
        var mapped = 0;
        try
        {
            for (var i = 0; i < Blocks; i++)
            {
                blocks[i] = Marshal.AllocHGlobal(512 << 10);

                // The size word before the block holds the flags; a header check that no other thread's allocations can disturb.
                mapped += (Marshal.ReadInt64(blocks[i], -8) & MappedFlag) != 0 ? 1 : 0;
            }
        }
        finally
        {
            foreach (var block in blocks)
            {
                if (block != IntPtr.Zero)
                {
                    Marshal.FreeHGlobal(block);
                }
            }
        }

        Assert.True(mapped >= Blocks / 2, $"{mapped} of {Blocks} blocks of 512 KiB after a freed 4 MiB one were mapped on their own");
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
