using System.Globalization;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Queue;

public sealed class MemoryTraceTests
{
    [Fact]
    public void A_line_has_a_number_for_every_column_of_the_header()
    {
        var names = MemoryTrace.Header.Split(' ');
        var values = MemoryTrace.Line(12.5).Split(' ');

        Assert.Equal(names.Length, values.Length);
        Assert.All(values, v => Assert.True(double.TryParse(v, NumberStyles.Float, CultureInfo.InvariantCulture, out _), $"'{v}' is not a number"));
        Assert.Equal("12.5", values[Array.IndexOf(names, "s")]);
    }

    [Fact]
    public void On_linux_the_resident_memory_splits_into_anonymous_and_file_backed_and_the_gc_reports_its_committed_bytes()
    {
        if (!OperatingSystem.IsLinux())
        {
            return;
        }

        GC.Collect();
        var names = MemoryTrace.Header.Split(' ');
        var values = MemoryTrace.Line(0).Split(' ').Select(v => double.Parse(v, CultureInfo.InvariantCulture)).ToArray();
        double Column(string name) => values[Array.IndexOf(names, name)];

        Assert.True(Column("rss_mb") > 0);
        Assert.True(Column("anon_mb") > 0 && Column("file_mb") > 0);
        Assert.Equal(Column("rss_mb"), Column("anon_mb") + Column("file_mb"), 0.2);
        Assert.True(Column("gc_committed_mb") >= Column("gc_heap_mb") - 0.1, "the GC commits at least the heap it reports");
        Assert.True(Column("gcs0") >= Column("gcs1") && Column("gcs1") >= Column("gcs2") && Column("gcs2") >= 1);
        Assert.True(Column("threads") >= 1);
    }
}
