using System.Text;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Queue;

public sealed class StageTimingsTests
{
    [Fact]
    public void Resident_pages_are_the_second_field_of_statm()
    {
        // Format of /proc/PID/statm: size resident shared text lib data dt, in pages (proc(5)).
        Assert.Equal(3374, StageTimings.ResidentPages("4143 3374 1654 1 0 2021 0\n"u8));
        Assert.Equal(1234567890123, StageTimings.ResidentPages("99999999999999 1234567890123 1 1 0 1 0"u8));
    }

    [Theory]
    [InlineData("")]
    [InlineData("4143")]
    [InlineData("4143 ")]
    [InlineData("4143 x 1")]
    public void Resident_pages_are_zero_when_statm_has_no_second_number(string statm) =>
        Assert.Equal(0, StageTimings.ResidentPages(Encoding.ASCII.GetBytes(statm)));

    [Fact]
    public void Resident_pages_of_this_process_match_the_file_read_whole()
    {
        if (!OperatingSystem.IsLinux())
        {
            return;
        }

        // Two reads of a live process's RSS differ by what it touched in between: within 5 % here.
        var whole = long.Parse(File.ReadAllText("/proc/self/statm").Split(' ')[1], System.Globalization.CultureInfo.InvariantCulture);
        var parsed = StageTimings.ResidentPages(File.ReadAllBytes("/proc/self/statm"));
        Assert.InRange(parsed, whole * 0.95, whole * 1.05);
    }
}
