using GateTasks.Engine.Samples;

namespace GateTasks.Cli.Tests;

public class ProgressDisplayTests
{
    [Fact]
    public void Plain_lines_give_events_total_rate_and_time_left_and_close_the_pass()
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        var display = new ProgressDisplay(stdout, stderr, live: false, plainInterval: TimeSpan.Zero);
        // 1.2 M of 3 M rows in 2 s: 600 k rows/s, 1.8 M left → 3 s (by hand).
        display.Report(new ReadProgress("checking the sample", 1_200_000, 3_000_000, TimeSpan.FromSeconds(2), false));
        display.Report(new ReadProgress("checking the sample", 3_000_000, 3_000_000, TimeSpan.FromSeconds(5), true));
        var lines = stdout.ToString().Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        Assert.Equal([
            "progress: checking the sample: 1.2 M of 3.0 M events (40%), 600 k events/s, about 3 s left",
            "progress: checking the sample: 3.0 M of 3.0 M events (100%), 600 k events/s, done in 5 s",
        ], lines);
        Assert.Equal("", stderr.ToString()); // nothing on the terminal's line when not live
    }

    [Fact]
    public void A_short_pass_prints_nothing_in_plain_mode_and_an_unknown_total_gives_no_estimate()
    {
        var stdout = new StringWriter();
        var display = new ProgressDisplay(stdout, new StringWriter(), live: false, plainInterval: TimeSpan.FromHours(1));
        display.Report(new ReadProgress("reading", 500, null, TimeSpan.FromSeconds(1), false));
        display.Report(new ReadProgress("reading", 900, null, TimeSpan.FromSeconds(2), true));
        Assert.Equal("", stdout.ToString());
        Assert.Equal("reading: 500 events, 500 events/s", ProgressDisplay.Describe(new ReadProgress("reading", 500, null, TimeSpan.FromSeconds(1), false)));
    }

    [Fact]
    public void Live_mode_rewrites_one_line_and_clears_it_at_the_end()
    {
        var stderr = new StringWriter();
        var display = new ProgressDisplay(new StringWriter(), stderr, live: true, plainInterval: TimeSpan.Zero);
        display.Report(new ReadProgress("checking", 1000, 4000, TimeSpan.FromSeconds(1), false));
        display.Report(new ReadProgress("checking", 4000, 4000, TimeSpan.FromSeconds(2), true));
        var text = stderr.ToString();
        Assert.StartsWith("\rchecking: 1000 of 4000 events (25%), 1000 events/s, about 3 s left", text);
        Assert.EndsWith("\r", text);
        Assert.DoesNotContain("\n", text);
    }
}
