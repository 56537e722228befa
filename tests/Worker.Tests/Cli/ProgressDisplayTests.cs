using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Cli;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

public sealed class ProgressDisplayTests
{
    [Fact]
    public void On_a_terminal_the_bar_is_redrawn_in_place_and_log_lines_clear_it_first()
    {
        var err = new StringWriter();
        var display = new ProgressDisplay(err, interactive: true, new SteppingTime());

        display.Update(new SweepCounts(10, 10, 0, 0, 0, 0));
        display.Update(new SweepCounts(10, 5, 1, 3, 1, 0));
        display.WriteLine("[12:00:00 INF] a log line");
        display.Finish();

        var text = err.ToString();
        Assert.StartsWith("\r[", text, StringComparison.Ordinal);
        Assert.Contains("4/10 (40 %)  done 3  failed 1", text, StringComparison.Ordinal);
        Assert.Contains("\r" + new string(' ', 10), text, StringComparison.Ordinal);
        Assert.Contains("a log line" + Environment.NewLine + "[", text, StringComparison.Ordinal);
    }

    [Fact]
    public void Off_a_terminal_progress_is_plain_periodic_lines_with_rate_and_eta()
    {
        var err = new StringWriter();
        var display = new ProgressDisplay(err, interactive: false, new SteppingTime()) { LineInterval = TimeSpan.Zero };

        display.Update(new SweepCounts(10, 10, 0, 0, 0, 0));
        display.Update(new SweepCounts(10, 6, 0, 4, 0, 0));
        display.Update(new SweepCounts(10, 6, 0, 4, 0, 0)); // unchanged: no new line

        var lines = err.ToString().Split(Environment.NewLine, StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(2, lines.Length);
        Assert.DoesNotContain('\r', err.ToString());
        Assert.StartsWith("progress: 4/10", lines[1], StringComparison.Ordinal);
        Assert.Contains("points/s", lines[1], StringComparison.Ordinal);
        Assert.Contains("ETA ", lines[1], StringComparison.Ordinal);
    }
}
