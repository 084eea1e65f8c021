using System.Text.Json;
using TraceKin.Cli;
using TraceKin.Cli.Commands;
using TraceKin.Cli.Watch;

namespace TraceKin.Tests.Watch;

// `watch --once` over an inbox, in-process, with a zero settle interval (the files are complete when written):
// bad series among good ones, exit codes, and output folders it must not use. Robustness tests, no source needed;
// the exports are invented round-trip data from SampleWriter.
public sealed class WatchOnceTests : IDisposable
{
    private readonly string _inbox = SeriesFixture.TempFolder("once-inbox");
    private readonly string _out = SeriesFixture.TempFolder("once-out");
    private readonly string _elsewhere = SeriesFixture.TempFolder("once-elsewhere");

    public void Dispose()
    {
        foreach (var d in new[] { _inbox, _out, _elsewhere })
            try { Directory.Delete(d, recursive: true); } catch (IOException) { }
    }

    private string Series(string name, int runs)
    {
        var folder = Path.Combine(_inbox, name);
        Directory.CreateDirectory(folder);
        var (config, plan) = SeriesFixture.Parse(runs);
        File.WriteAllText(Path.Combine(folder, "series.toml"), SeriesFixture.GoodToml);
        File.WriteAllText(Path.Combine(folder, "plan.csv"), SeriesFixture.PlanText(runs));
        for (var i = 1; i <= runs; i++)
            File.WriteAllText(Path.Combine(folder, SeriesFixture.FileOf(i)), SeriesFixture.ExportText(plan, config, i, seed: i));
        return folder;
    }

    private (int Code, string Error) Once(string? outDir = null, bool plots = false)
    {
        var options = new WatchOptions { Inbox = _inbox, Out = outDir ?? _out, Once = true, Settle = TimeSpan.Zero, Workers = 1, Jobs = 2, Plots = plots };
        var error = new StringWriter();
        // A --once pass must end by itself; a hang is a failure, not a stuck test run.
        var run = Task.Run(() => WatchCommand.Run(options, error: error));
        Assert.True(run.Wait(TimeSpan.FromSeconds(120)), "watch --once did not finish");
        return (run.Result, error.ToString());
    }

    private JsonDocument Summary(string series) => JsonDocument.Parse(File.ReadAllText(Path.Combine(_out, series, "summary.json")));

    private static void NoStackTrace(string error) => Assert.DoesNotContain("   at ", error, StringComparison.Ordinal);

    [Fact]
    public void A_bad_plan_and_an_unreadable_export_among_good_series_give_located_messages_exit_2_and_the_good_series_results()
    {
        Series("alpha", 4);
        var beta = Series("beta", 4);
        File.WriteAllText(Path.Combine(beta, "plan.csv"), SeriesFixture.PlanText(4).Replace("\nR002,r002.csv,25.0,", "\nR002,r002.csv,warm,", StringComparison.Ordinal));
        var gamma = Series("gamma", 4);
        File.Delete(Path.Combine(gamma, SeriesFixture.FileOf(3)));
        Directory.CreateDirectory(Path.Combine(gamma, SeriesFixture.FileOf(3))); // a folder where the plan names an export
        Series("delta", 4);

        var (code, error) = Once();

        Assert.Equal(ExitCodes.SomeRejected, code);
        Assert.Contains(error.Split('\n'), l => l.StartsWith("gamma/r003.csv: rejected", StringComparison.Ordinal) && l.Contains("folder", StringComparison.Ordinal));
        Assert.Contains("beta/plan.csv: rejected", error, StringComparison.Ordinal);
        Assert.Contains("alpha/r004.csv: analysed", error, StringComparison.Ordinal);
        foreach (var good in new[] { "alpha", "delta" })
        {
            using var s = Summary(good);
            Assert.Equal(4, s.RootElement.GetProperty("runs").GetArrayLength());
            Assert.Equal(0, s.RootElement.GetProperty("rejected").GetArrayLength());
        }
        using (var b = Summary("beta"))
        {
            var p = Assert.Single(b.RootElement.GetProperty("rejected").EnumerateArray());
            Assert.Equal("plan.csv", p.GetProperty("file").GetString());
            Assert.Equal(3, p.GetProperty("line").GetInt32()); // the second run's row, after the header
            Assert.True(p.GetProperty("column").GetInt32() > 0);
        }
        using (var g = Summary("gamma"))
        {
            Assert.Equal(3, g.RootElement.GetProperty("runs").GetArrayLength());
            var p = Assert.Single(g.RootElement.GetProperty("rejected").EnumerateArray());
            // Located at the plan cell that names it; the export itself is in "input".
            Assert.Equal(SeriesFixture.FileOf(3), p.GetProperty("input").GetString());
            Assert.Contains("folder", p.GetProperty("message").GetString(), StringComparison.Ordinal);
        }

        // Run again on the same inbox: nothing is analysed again, and the exit code still tells of the problems.
        var records = Ledger.ReadAll(Path.Combine(_out, Ledger.FileName)).Count;
        Assert.Equal(ExitCodes.SomeRejected, Once().Code);
        Assert.Equal(records, Ledger.ReadAll(Path.Combine(_out, Ledger.FileName)).Count);
    }

    [Fact]
    public void An_inbox_of_good_series_exits_0()
    {
        Series("alpha", 3);
        Series("beta", 3);
        Assert.Equal(ExitCodes.Ok, Once().Code);
        Assert.True(File.Exists(Path.Combine(_out, "beta", "report.html")));
    }

    [Fact]
    public void A_series_whose_plots_folder_is_a_link_fails_with_exit_2_writes_nothing_through_it_and_the_others_are_served()
    {
        Series("alpha", 3);
        Series("delta", 3);
        Directory.CreateDirectory(Path.Combine(_out, "alpha"));
        Directory.CreateSymbolicLink(Path.Combine(_out, "alpha", "plots"), _elsewhere);

        var (code, _) = Once(plots: true);

        Assert.Equal(ExitCodes.SomeRejected, code);
        Assert.Empty(Directory.EnumerateFileSystemEntries(_elsewhere));
        Assert.False(File.Exists(Path.Combine(_out, "alpha", "summary.json")));
        Assert.True(File.Exists(Path.Combine(_out, "delta", "plots", "run-R001.png")));
        using var d = Summary("delta");
        Assert.Equal(3, d.RootElement.GetProperty("runs").GetArrayLength());
        Assert.DoesNotContain(Ledger.ReadAll(Path.Combine(_out, Ledger.FileName)), r => r.Series == "alpha");
    }

    [Fact]
    public void An_out_that_is_a_file_is_a_usage_error_without_a_stack_trace()
    {
        Series("alpha", 2);
        var file = Path.Combine(_elsewhere, "results.txt");
        File.WriteAllText(file, "mine");
        var (code, error) = Once(file);
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains("is a file, not a folder", error, StringComparison.Ordinal);
        NoStackTrace(error);
        Assert.Equal("mine", File.ReadAllText(file));
    }

    [Fact]
    public void A_ledger_that_is_a_link_is_refused_and_its_target_is_untouched()
    {
        Series("alpha", 2);
        var target = Path.Combine(_elsewhere, "ledger");
        File.WriteAllText(target, "keep");
        File.CreateSymbolicLink(Path.Combine(_out, Ledger.FileName), target);
        var (code, error) = Once();
        Assert.Equal(ExitCodes.CannotWrite, code);
        Assert.Contains("is a symbolic link", error, StringComparison.Ordinal);
        NoStackTrace(error);
        Assert.Equal("keep", File.ReadAllText(target));
        Assert.False(Directory.Exists(Path.Combine(_out, "alpha")));
    }

    [Fact]
    public void A_second_watch_on_an_out_held_by_an_analysis_is_refused()
    {
        Series("alpha", 2);
        using var held = OutputLock.TryTake(_out, "analyse", out _);
        Assert.NotNull(held);
        var (code, error) = Once();
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains("tracekin analyse) is already writing to", error, StringComparison.Ordinal);
    }
}
