using System.Security.Cryptography;
using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

// The one output path of analyse and watch (SeriesOutputs): a writer that fails in any way loses only its own output,
// the report still comes and says what is missing, and each picture is drawn once and embedded from the same bytes.
// The series is the invented violet-complex-acid sample (round trip, no reference values needed).
public sealed class SeriesOutputsTests
{
    private static readonly string Sample = RepoPaths.Sample("violet-complex-acid");

    /// <summary>A series plot that breaks while drawing with a defect of ours (not a file error).</summary>
    public sealed class BrokenPlot(string fileName) : ISeriesPlot
    {
        public string FileName => fileName;
        public byte[]? Draw(SeriesResult result) => throw new InvalidOperationException("the axis range is empty (test)");
    }

    /// <summary>A table writer that breaks with a defect of ours.</summary>
    private sealed class BrokenTable : ISeriesReportWriter
    {
        public IReadOnlyList<string> Files => ["extra-table.csv"];
        public void Write(SeriesResult result, string outDir) => throw new NotSupportedException("a column type without a format (test)");
    }

    /// <summary>A table writer that fails late: after the plots are done, while the report may already be drawn.</summary>
    private sealed class SlowBrokenTable : ISeriesReportWriter
    {
        public IReadOnlyList<string> Files => ["late-table.csv"];
        public void Write(SeriesResult result, string outDir)
        {
            Thread.Sleep(TimeSpan.FromSeconds(2));
            throw new FormatException("a cell that cannot be formatted (test)");
        }
    }

    /// <summary>The default series plots with <see cref="OrderPlot"/> replaced by one that throws.</summary>
    public static IReadOnlyList<ISeriesPlot> WithBrokenOrderPlot() =>
        ReportSet.SeriesPlots().Select(p => p is OrderPlot ? new BrokenPlot(OrderPlot.FileName) : p).ToList();

    private static (SeriesResult Result, IReadOnlyList<OutputFailure> Failures) Analyse(string outDir, IReadOnlyList<ISeriesPlot>? plots = null,
        IReadOnlyList<ISeriesReportWriter>? more = null, bool queue = true)
    {
        using var outputs = new SeriesOutputs(outDir, plots: true, queueRunPlots: queue, seriesPlots: plots, moreWriters: more);
        var result = SeriesRunner.Analyse(Sample, new AnalysisOptions { Workers = 2, RunSink = outputs.RunSink, Retention = TraceRetention.None });
        return (result, outputs.Write(result));
    }

    [Theory]
    [InlineData(true)]  // analyse: run plots queued to background writers
    [InlineData(false)] // watch: each run plot written before its sink returns
    public void A_plot_and_a_table_that_throw_non_io_exceptions_lose_only_their_own_files_and_the_report_lists_them(bool queue)
    {
        using var dir = new RepoPaths.TempDir();
        var (_, failures) = Analyse(dir.Path, WithBrokenOrderPlot(), [new BrokenTable()], queue);

        Assert.Equal(["extra-table.csv", "plots/orders.png"], failures.Select(f => f.Output));
        Assert.Equal("InvalidOperationException: the axis range is empty (test)", failures.Single(f => f.Output == "plots/orders.png").Error);
        Assert.StartsWith("NotSupportedException:", failures.Single(f => f.Output == "extra-table.csv").Error, StringComparison.Ordinal);
        foreach (var f in (string[])["report.html", "summary.json", "runs.csv", PairRatiosCsv.FileName, .. RunTables.FileNames, "plots/k-per-run.png", "plots/rate-concentration.png", "plots/run-R1.png"])
            Assert.True(File.Exists(Path.Combine(dir.Path, f)), f);
        Assert.False(File.Exists(Path.Combine(dir.Path, "plots", OrderPlot.FileName)));

        var (doc, errors) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(dir.Path, ReportHtml.FileName)));
        Assert.Empty(errors);
        Assert.Equal("needs-attention", doc.GetElementById("attention")!.ClassName);
        var listed = doc.QuerySelectorAll($"#warnings li[data-code=\"{OutputFailure.Code}\"]").Select(li => li.TextContent).ToList();
        Assert.Equal(2, listed.Count);
        Assert.Contains(listed, t => t.StartsWith("plots/orders.png: this output could not be written (InvalidOperationException: the axis range is empty (test))", StringComparison.Ordinal));
        Assert.Contains(listed, t => t.StartsWith("extra-table.csv: this output could not be written (NotSupportedException:", StringComparison.Ordinal));
        // The missing plot is not shown; the others are.
        var shown = doc.QuerySelectorAll("figure.plot").Select(f => f.GetAttribute("data-file")).ToList();
        Assert.DoesNotContain(OrderPlot.FileName, shown);
        Assert.Contains(RateConstantPlot.FileName, shown);
        Assert.Equal(8, shown.Count(f => f!.StartsWith("run-", StringComparison.Ordinal)));
    }

    [Fact]
    public void A_table_that_fails_after_the_plots_are_done_is_still_listed_in_the_report()
    {
        // The page is drawn while the numbers are still being written; a failure that comes later must reach it.
        using var dir = new RepoPaths.TempDir();
        var (_, failures) = Analyse(dir.Path, more: [new SlowBrokenTable()]);
        Assert.Equal("late-table.csv", Assert.Single(failures).Output);
        var (doc, _) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(dir.Path, ReportHtml.FileName)));
        var item = Assert.Single(doc.QuerySelectorAll($"#warnings li[data-code=\"{OutputFailure.Code}\"]"));
        Assert.StartsWith("late-table.csv: this output could not be written (FormatException: a cell that cannot be formatted (test))", item.TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public void Every_plot_in_the_report_is_the_very_bytes_of_its_file()
    {
        using var dir = new RepoPaths.TempDir();
        var (result, failures) = Analyse(dir.Path);
        Assert.Empty(failures);
        var (doc, _) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(dir.Path, ReportHtml.FileName)));
        var figures = doc.QuerySelectorAll("figure.plot").ToList();
        // 3 series plots (orders, rate-concentration, k per run) and the 8 run plots.
        Assert.Equal(3 + result.Runs.Count, figures.Count);
        foreach (var f in figures)
        {
            var src = f.QuerySelector("img")!.GetAttribute("src")!;
            const string prefix = "data:image/png;base64,";
            Assert.StartsWith(prefix, src, StringComparison.Ordinal);
            Assert.Equal(File.ReadAllBytes(Path.Combine(dir.Path, "plots", f.GetAttribute("data-file")!)), Convert.FromBase64String(src[prefix.Length..]));
        }
        Assert.Equal(Directory.EnumerateFiles(Path.Combine(dir.Path, "plots")).Count(), figures.Count);
    }

    [Fact]
    public void The_page_drawn_in_memory_has_the_bytes_of_the_page_written_as_a_stream()
    {
        // SeriesOutputs writes either one, depending on whether the numbers are still being written.
        using var dir = new RepoPaths.TempDir();
        var (result, _) = Analyse(dir.Path);
        var plots = ReportPlots.FromFolder(Path.Combine(dir.Path, "plots"));
        using var again = new RepoPaths.TempDir();
        ReportHtml.Write(result, again.Path, plots);
        Assert.Equal(new System.Text.UTF8Encoding(false).GetBytes(ReportHtml.Render(result, plots)), File.ReadAllBytes(Path.Combine(again.Path, ReportHtml.FileName)));
        // and both are the page SeriesOutputs wrote from the pictures it held in memory
        Assert.Equal(File.ReadAllBytes(Path.Combine(dir.Path, ReportHtml.FileName)), File.ReadAllBytes(Path.Combine(again.Path, ReportHtml.FileName)));
    }

    [Fact]
    public void A_series_plot_with_nothing_to_show_leaves_no_old_picture_of_that_name_behind()
    {
        // A watch pass after the temperatures stopped varying: the earlier arrhenius.png would otherwise stay.
        using var dir = new RepoPaths.TempDir();
        Directory.CreateDirectory(Path.Combine(dir.Path, "plots"));
        File.WriteAllBytes(Path.Combine(dir.Path, "plots", ArrheniusPlot.FileName), [1, 2, 3]);
        var (_, failures) = Analyse(dir.Path);
        Assert.Empty(failures);
        Assert.False(File.Exists(Path.Combine(dir.Path, "plots", ArrheniusPlot.FileName)));
    }

    [Fact]
    public void Run_plots_are_held_for_the_report_only_up_to_the_number_it_embeds()
    {
        // Beyond MaxEmbeddedRunPlots runs the report links every run plot, so none is kept in memory.
        using var dir = new RepoPaths.TempDir();
        var few = new ReportPlots(dir.Path);
        for (var i = 0; i < ReportHtml.MaxEmbeddedRunPlots; i++) few.AddRun($"run-{i}.png", [(byte)i]);
        Assert.Equal(new byte[] { 7 }, few.Embed("run-7.png"));
        var many = new ReportPlots(dir.Path);
        for (var i = 0; i <= ReportHtml.MaxEmbeddedRunPlots; i++) many.AddRun($"run-{i}.png", [(byte)i]);
        Assert.Null(many.Embed("run-7.png")); // not held, and not in the (empty) folder
        // A plot not drawn in this pass (watch redraws changed runs only) is embedded from its file.
        File.WriteAllBytes(Path.Combine(dir.Path, "run-old.png"), [9, 9]);
        Assert.Equal(new byte[] { 9, 9 }, many.Embed("run-old.png"));
    }

    [Fact]
    public void The_setup_hashes_are_taken_when_read_and_the_report_neither_reads_nor_hashes_the_files_again()
    {
        using var copy = RepoPaths.CopyOf(Sample);
        var result = SeriesRunner.Analyse(copy.Path, new AnalysisOptions { Workers = 2 });
        // SHA-256 (FIPS 180-4) of the files as they were analysed, computed here independently.
        var planSha = Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(Path.Combine(copy.Path, "plan.csv"))));
        var tomlSha = Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(Path.Combine(copy.Path, "series.toml"))));
        Assert.Equal(planSha, result.SetupHashes["plan.csv"]);
        Assert.Equal(tomlSha, result.SetupHashes["series.toml"]);

        // The files change (or go) after the analysis: the report still shows what was analysed.
        var settingsBefore = SettingsTable(ReportHtml.Render(result, null));
        File.Delete(Path.Combine(copy.Path, "series.toml"));
        File.WriteAllText(Path.Combine(copy.Path, "plan.csv"), "run,file\n");
        var html = ReportHtml.Render(result, null);
        var (doc, _) = ReportHtmlTests.Parse(html);
        var hashes = doc.QuerySelectorAll("#provenance tbody tr").ToDictionary(tr => tr.Children[0].TextContent, tr => tr.Children[2].TextContent);
        Assert.Equal(planSha, hashes["plan.csv"]);
        Assert.Equal(tomlSha, hashes["series.toml"]);
        Assert.Equal(settingsBefore, SettingsTable(html));
        Assert.Contains(SettingsTable(html), row => row.EndsWith("|series.toml", StringComparison.Ordinal));
    }

    [Fact]
    public void A_setup_file_that_is_missing_is_said_so_in_place_of_its_hash()
    {
        using var copy = RepoPaths.CopyOf(Sample);
        File.Delete(Path.Combine(copy.Path, "series.toml"));
        var result = SeriesRunner.Analyse(copy.Path, new AnalysisOptions { Workers = 1 });
        Assert.Equal(SeriesResult.SetupMissing, result.SetupHashes["series.toml"]);
        Assert.Matches("^[0-9a-f]{64}$", result.SetupHashes["plan.csv"]);
    }

    private static List<string> SettingsTable(string html) =>
        ReportHtmlTests.Parse(html).Doc.QuerySelectorAll("#settings table.settings tbody tr")
            .Select(tr => string.Join("|", tr.Children.Select(c => c.TextContent))).ToList();
}
