using Serilog;
using Serilog.Core;
using Serilog.Events;
using TraceKin.Cli.Commands;
using TraceKin.Cli.Watch;
using TraceKin.Reports;
using TraceKin.Tests.Reports;
using TraceKin.Tests.Support;
using TraceKin.Tests.Watch;

namespace TraceKin.Tests.Cli;

// analyse and watch write through the same SeriesOutputs: a series plot that throws a non-IO exception costs that plot
// only; report.html, summary.json and runs.csv are written, the report lists the missing plot, the log says it and
// the failure is counted (analyse exits CannotWrite, watch does not commit the pass). Robustness, no source needed;
// the series is the invented violet-complex-acid sample.
public sealed class OutputFailureTests
{
    private static readonly string Sample = RepoPaths.Sample("violet-complex-acid");

    private sealed class Capture : ILogEventSink
    {
        public List<string> Lines { get; } = [];
        public void Emit(LogEvent e)
        {
            lock (Lines) Lines.Add($"{e.Level} {e.RenderMessage()}");
        }
    }

    private static void EveryOtherOutputIsThereAndTheReportListsTheMissingPlot(string outDir)
    {
        foreach (var f in new[] { "report.html", "summary.json", "runs.csv", "plots/k-per-run.png", "plots/run-R8.png" })
            Assert.True(File.Exists(Path.Combine(outDir, f)), f);
        Assert.False(File.Exists(Path.Combine(outDir, "plots", OrderPlot.FileName)));
        var (doc, errors) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(outDir, ReportHtml.FileName)));
        Assert.Empty(errors);
        var item = Assert.Single(doc.QuerySelectorAll($"#warnings li[data-code=\"{OutputFailure.Code}\"]"));
        Assert.StartsWith("plots/orders.png: this output could not be written (InvalidOperationException: the axis range is empty (test))", item.TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public void Analyse_with_a_plot_that_throws_writes_the_report_summary_and_runs_and_counts_and_logs_the_failure()
    {
        using var dir = new RepoPaths.TempDir();
        var sink = new Capture();
        int failures;
        using (var log = new LoggerConfiguration().MinimumLevel.Debug().WriteTo.Sink(sink).CreateLogger())
            (_, failures) = AnalyseCommand.Analyse(Sample, dir.Path, plots: true, workers: 2, log, seriesPlots: SeriesOutputsTests.WithBrokenOrderPlot());

        Assert.Equal(1, failures);
        EveryOtherOutputIsThereAndTheReportListsTheMissingPlot(dir.Path);
        Assert.Contains(sink.Lines, l => l.StartsWith("Error could not write \"plots/orders.png\": \"InvalidOperationException: the axis range is empty (test)\"", StringComparison.Ordinal));
    }

    [Fact]
    public void A_watch_pass_with_a_plot_that_throws_writes_the_other_outputs_logs_the_failure_and_is_not_committed()
    {
        var inbox = SeriesFixture.TempFolder("inbox");
        var outDir = SeriesFixture.TempFolder("out");
        try
        {
            var folder = Path.Combine(inbox, "violet-complex-acid");
            RepoPaths.CopyDir(Sample, folder);
            var settle = TimeSpan.FromSeconds(1);
            var clock = new FakeClock(DateTimeOffset.UtcNow - TimeSpan.FromHours(1));
            var sink = new Capture();
            using var log = new LoggerConfiguration().WriteTo.Sink(sink).CreateLogger();
            using var ledger = Ledger.Open(outDir);
            var options = new WatchOptions { Inbox = inbox, Out = outDir, Settle = settle, Workers = 1, Plots = true, SeriesPlots = SeriesOutputsTests.WithBrokenOrderPlot() };
            var watch = new SeriesWatch(folder, options, new FileStability(clock, settle), ledger, clock, log, _ => { });

            SeriesPass? pass = null;
            for (var i = 0; i < 6 && pass?.Failed != true; i++) { pass = watch.Pass(); clock.Advance(settle); }

            Assert.True(pass!.Failed);
            Assert.False(pass.Analysed);
            EveryOtherOutputIsThereAndTheReportListsTheMissingPlot(Path.Combine(outDir, "violet-complex-acid"));
            Assert.Contains(sink.Lines, l => l.StartsWith("Error \"violet-complex-acid\": could not write \"plots/orders.png\": \"InvalidOperationException:", StringComparison.Ordinal));
            // Not committed: the next pass tries the series again.
            Assert.Empty(Ledger.ReadAll(ledger.Path));
        }
        finally
        {
            foreach (var d in new[] { inbox, outDir })
                try { Directory.Delete(d, recursive: true); } catch (IOException) { }
        }
    }
}
