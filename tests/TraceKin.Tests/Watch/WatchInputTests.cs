using System.Text.Json;
using Serilog;
using TraceKin.Cli.Watch;
using TraceKin.Tests.Analysis;
using Xunit.Abstractions;

namespace TraceKin.Tests.Watch;

// The watcher copies inputs before analysing them, so it applies the input rule itself, before any open: a named pipe
// is never opened (the pass must not block), and a link out of the series folder is never copied. Both are reported
// with the reason found in the inbox, while the other runs are analysed. Invented round-trip data.
public sealed class WatchInputTests(ITestOutputHelper output) : IDisposable
{
    private static readonly TimeSpan Settle = TimeSpan.FromSeconds(1);
    private readonly string _inbox = SeriesFixture.TempFolder("inbox");
    private readonly string _out = SeriesFixture.TempFolder("out");
    private readonly string _outside = SeriesFixture.TempFolder("outside");

    public void Dispose()
    {
        foreach (var d in new[] { _inbox, _out, _outside })
            try { Directory.Delete(d, recursive: true); }
            catch (IOException) { }
    }

    [Fact]
    public async Task A_pipe_and_a_link_out_of_the_folder_are_refused_without_blocking_and_the_other_runs_are_analysed()
    {
        var folder = Path.Combine(_inbox, "alpha");
        Directory.CreateDirectory(folder);
        var (config, plan) = SeriesFixture.Parse(6);
        File.WriteAllText(Path.Combine(folder, "series.toml"), SeriesFixture.GoodToml);
        File.WriteAllText(Path.Combine(folder, "plan.csv"), SeriesFixture.PlanText(6));
        for (var i = 1; i <= 4; i++)
            File.WriteAllText(Path.Combine(folder, SeriesFixture.FileOf(i)), SeriesFixture.ExportText(plan, config, i, seed: i));
        var secret = Path.Combine(_outside, "secret.csv");
        File.WriteAllText(secret, SeriesFixture.ExportText(plan, config, 6, seed: 6));
        File.CreateSymbolicLink(Path.Combine(folder, SeriesFixture.FileOf(6)), secret);
        var fifo = ProbeSeries.MakeFifo(Path.Combine(folder, SeriesFixture.FileOf(5)), out var reason);
        if (fifo is null)
        {
            Assert.True(Environment.GetEnvironmentVariable("CI") is null, $"cannot make a FIFO: {reason}; CI requires this check");
            output.WriteLine($"FIFO check not run: {reason}");
            return;
        }

        var clock = new FakeClock(DateTimeOffset.UtcNow - TimeSpan.FromHours(1));
        using var ledger = Ledger.Open(_out);
        var options = new WatchOptions { Inbox = _inbox, Out = _out, Settle = Settle, Workers = 1, Plots = false };
        var watch = new SeriesWatch(folder, options, new FileStability(clock, Settle), ledger, clock, new LoggerConfiguration().CreateLogger(), _ => { });
        var passes = Task.Run(() =>
        {
            for (var i = 0; i < 4; i++)
            {
                watch.Pass();
                clock.Advance(Settle);
            }
        });
        if (await Task.WhenAny(passes, Task.Delay(TimeSpan.FromMinutes(1))) != passes)
        {
            using (new FileStream(fifo, FileMode.Open, FileAccess.Write)) { }
            Assert.Fail("the watch pass did not return within a minute: it opened the pipe"); // a hang guard, not a speed check
        }
        await passes;

        using var summary = JsonDocument.Parse(File.ReadAllText(Path.Combine(_out, "alpha", "summary.json")));
        var root = summary.RootElement;
        Assert.Equal(4, root.GetProperty("runs").GetArrayLength());
        var rejected = root.GetProperty("rejected").EnumerateArray().Select(p => p.GetProperty("message").GetString()!).ToList();
        Assert.Equal(2, rejected.Count);
        Assert.Contains(rejected, m => m.StartsWith("plan.csv:6:6: found \"r005.csv\", a named pipe (FIFO)", StringComparison.Ordinal));
        Assert.Contains(rejected, m => m.StartsWith($"plan.csv:7:6: found \"r006.csv\", a path through a symbolic link that resolves to {secret}, outside the series folder", StringComparison.Ordinal));
        Assert.DoesNotContain(rejected, m => m.Contains(SeriesWatch.WorkFolder, StringComparison.Ordinal)); // the inbox's reason, not the copy's
        Assert.False(File.Exists(Path.Combine(_out, SeriesWatch.WorkFolder, "alpha", SeriesFixture.FileOf(6))));
    }
}
