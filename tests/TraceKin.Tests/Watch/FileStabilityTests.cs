using TraceKin.Cli.Watch;

namespace TraceKin.Tests.Watch;

// The settle rule is our own design (common practice for watched folders, no source): a file is taken once its
// size and last-write time have stayed the same for the settle interval. Times here come from a fake clock.
public class FileStabilityTests
{
    private static readonly DateTimeOffset Start = new(2026, 3, 2, 9, 0, 0, TimeSpan.Zero);
    private static readonly TimeSpan Settle = TimeSpan.FromMilliseconds(500);

    private static FileSignature Written(long length, DateTimeOffset at) => new(length, at.UtcDateTime);

    [Fact]
    public void A_fresh_file_becomes_stable_exactly_one_settle_interval_after_it_was_first_seen()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        var sig = Written(100, Start);
        Assert.Equal(Start + Settle, s.Observe("a.csv", sig));
        Assert.False(s.IsStable("a.csv", sig));
        clock.Advance(TimeSpan.FromMilliseconds(499));
        Assert.False(s.IsStable("a.csv", sig));
        clock.Advance(TimeSpan.FromMilliseconds(1));
        Assert.True(s.IsStable("a.csv", sig));
    }

    [Fact]
    public void A_file_that_grows_restarts_its_settle_interval_from_the_moment_it_was_seen_to_change()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        s.Observe("a.csv", Written(100, Start));
        clock.Advance(TimeSpan.FromMilliseconds(400));
        var grown = Written(250, Start + TimeSpan.FromMilliseconds(400));
        Assert.Equal(Start + TimeSpan.FromMilliseconds(900), s.Observe("a.csv", grown));
        clock.Advance(TimeSpan.FromMilliseconds(300)); // 700 ms: the old signature would have settled, the new one has not
        Assert.False(s.IsStable("a.csv", grown));
        clock.Advance(TimeSpan.FromMilliseconds(200));
        Assert.True(s.IsStable("a.csv", grown));
    }

    [Fact]
    public void A_rewrite_of_the_same_length_is_caught_by_its_last_write_time()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        s.Observe("a.csv", Written(100, Start));
        clock.Advance(TimeSpan.FromMilliseconds(450));
        var rewritten = Written(100, Start + TimeSpan.FromMilliseconds(450));
        Assert.False(s.IsStable("a.csv", rewritten));
        clock.Advance(TimeSpan.FromMilliseconds(100)); // 550 ms after the first look, 100 ms after the rewrite
        Assert.False(s.IsStable("a.csv", rewritten));
        clock.Advance(TimeSpan.FromMilliseconds(400));
        Assert.True(s.IsStable("a.csv", rewritten));
    }

    [Fact]
    public void A_file_last_written_long_before_it_is_first_seen_is_stable_at_once()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        var old = Written(100, Start - TimeSpan.FromMinutes(10));
        Assert.True(s.IsStable("a.csv", old));
    }

    [Fact]
    public void A_last_write_within_the_time_stamp_slack_is_not_trusted_on_first_sight()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        // Written 2 s ago: older than the settle interval, but a coarse time stamp could hide a later write.
        var recent = Written(100, Start - TimeSpan.FromSeconds(2));
        Assert.False(s.IsStable("a.csv", recent));
        clock.Advance(Settle);
        Assert.True(s.IsStable("a.csv", recent));
    }

    [Fact]
    public void A_file_that_could_not_be_opened_waits_a_full_settle_interval_again()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        var sig = Written(100, Start);
        s.Observe("a.csv", sig);
        clock.Advance(Settle);
        Assert.True(s.IsStable("a.csv", sig));
        s.Restart("a.csv");
        Assert.False(s.IsStable("a.csv", sig));
        clock.Advance(Settle);
        Assert.True(s.IsStable("a.csv", sig));
    }

    [Fact]
    public void Files_settle_independently_of_each_other()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        s.Observe("a.csv", Written(1, Start));
        clock.Advance(TimeSpan.FromMilliseconds(300));
        s.Observe("b.csv", Written(1, Start + TimeSpan.FromMilliseconds(300)));
        clock.Advance(TimeSpan.FromMilliseconds(200));
        Assert.True(s.IsStable("a.csv", Written(1, Start)));
        Assert.False(s.IsStable("b.csv", Written(1, Start + TimeSpan.FromMilliseconds(300))));
    }

    private static FileSignature HalfRow(long length, DateTimeOffset at) => new(length, at.UtcDateTime, Unterminated: true);

    [Fact]
    public void A_file_paused_in_the_middle_of_a_row_is_not_settled_after_the_settle_interval_but_after_the_longer_one()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        var sig = HalfRow(100, Start);
        var longer = FileStability.UnterminatedFactor * Settle;
        Assert.Equal(Start + longer, s.Observe("a.csv", sig));
        clock.Advance(Settle + TimeSpan.FromMilliseconds(1)); // paused for longer than the settle interval
        Assert.False(s.IsStable("a.csv", sig));
        clock.Advance(longer - Settle - TimeSpan.FromMilliseconds(2)); // 1 ms short of the longer interval
        Assert.False(s.IsStable("a.csv", sig));
        clock.Advance(TimeSpan.FromMilliseconds(1));
        Assert.True(s.IsStable("a.csv", sig));
    }

    [Fact]
    public void A_half_row_that_is_completed_settles_after_the_normal_interval_from_its_completion()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        s.Observe("a.csv", HalfRow(100, Start));
        clock.Advance(TimeSpan.FromMilliseconds(700));
        var done = Written(104, Start + TimeSpan.FromMilliseconds(700));
        Assert.Equal(clock.GetUtcNow() + Settle, s.Observe("a.csv", done));
        clock.Advance(Settle);
        Assert.True(s.IsStable("a.csv", done));
    }

    [Fact]
    public void An_old_file_without_a_final_line_end_is_trusted_on_first_sight_only_when_older_than_the_longer_interval()
    {
        var clock = new FakeClock(Start);
        var s = new FileStability(clock, Settle);
        var longer = FileStability.UnterminatedFactor * Settle;
        Assert.True(s.IsStable("old.csv", HalfRow(100, Start - longer - FileStability.TimestampSlack)));
        // Older than the settle interval and its slack, but not than the longer interval: it waits.
        Assert.False(s.IsStable("recent.csv", HalfRow(100, Start - Settle - FileStability.TimestampSlack - TimeSpan.FromMilliseconds(1))));
    }

    [Theory]
    [InlineData("time,A\n0,1\n", false)]
    [InlineData("time,A\r\n0,1\r\n", false)]
    [InlineData("time,A\r0,1\r", false)]
    [InlineData("time,A\n0,1\n2,0.", true)]
    [InlineData("", true)]
    public void A_signature_records_whether_the_last_byte_ends_a_line(string text, bool unterminated)
    {
        var path = Path.Combine(Path.GetTempPath(), $"tracekin-sig-{Guid.NewGuid():N}.csv");
        try
        {
            File.WriteAllText(path, text);
            Assert.Equal(unterminated, FileSignature.Of(path)!.Value.Unterminated);
        }
        finally { File.Delete(path); }
    }

    [Fact]
    public void A_utf16_file_ending_with_a_line_end_counts_as_ended()
    {
        var path = Path.Combine(Path.GetTempPath(), $"tracekin-sig-{Guid.NewGuid():N}.csv");
        try
        {
            File.WriteAllText(path, "time,A\n0,1\n", new System.Text.UnicodeEncoding(bigEndian: false, byteOrderMark: true));
            Assert.False(FileSignature.Of(path)!.Value.Unterminated);
            File.WriteAllText(path, "time,A\n0,1", new System.Text.UnicodeEncoding(bigEndian: true, byteOrderMark: true));
            Assert.True(FileSignature.Of(path)!.Value.Unterminated);
        }
        finally { File.Delete(path); }
    }
}
