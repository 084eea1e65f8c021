namespace TraceKin.Tests.Cli;

/// <summary>Progress lines of a batch (presentation; no source needed).</summary>
public sealed class BatchProgressTests
{
    [Theory]
    [InlineData(120, 400, 2.0, "120 of 400 run(s) done, 60 runs/s, about 5 s left")]
    [InlineData(30, 20000, 10.0, "30 of 20000 run(s) done, 3.0 runs/s, about 1 h 51 min left")]
    [InlineData(900, 1000, 3.0, "900 of 1000 run(s) done, 300 runs/s, about 1 s left")]
    [InlineData(12, 0, 4.0, "12 run(s) done, 3.0 runs/s")]
    public void A_progress_line_gives_the_total_the_pace_and_the_time_left(int done, int total, double seconds, string expected) =>
        Assert.Equal(expected, TraceKin.Cli.Commands.BatchProgress.Line(done, total, seconds));
}
