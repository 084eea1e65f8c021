using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Analysis;

/// <summary>
/// The outputs of `analyse` must not depend on how many runs are analysed at once: runs are computed independently
/// and the results are put back in plan order, so one worker and four workers must write the same bytes
/// (reproducibility is common practice, no source). The bundled demo series is the input.
/// </summary>
public class DeterminismTests
{
    private static readonly string Sample = RepoPaths.Sample("violet-complex-acid");

    [Fact]
    public void One_worker_and_four_workers_write_byte_identical_summary_tables_and_plots()
    {
        using var one = new RepoPaths.TempDir();
        using var four = new RepoPaths.TempDir();
        var a = Write(one.Path, workers: 1);
        var b = Write(four.Path, workers: 4);

        Assert.Equal(8, a.Runs.Count);
        Assert.Equal(a.Runs.Select(r => r.Id), b.Runs.Select(r => r.Id));
        foreach (var file in (string[])[SummaryJson.FileName, RunsCsv.FileName, .. RunTables.FileNames])
            Assert.Equal(File.ReadAllBytes(Path.Combine(one.Path, file)), File.ReadAllBytes(Path.Combine(four.Path, file)));
        var plots = Directory.GetFiles(Path.Combine(one.Path, "plots")).Select(Path.GetFileName).Order(StringComparer.Ordinal).ToList();
        Assert.Equal(8, plots.Count(p => p!.StartsWith("run-", StringComparison.Ordinal))); // and the series plots
        foreach (var png in plots)
            Assert.Equal(File.ReadAllBytes(Path.Combine(one.Path, "plots", png!)), File.ReadAllBytes(Path.Combine(four.Path, "plots", png!)));
    }

    [Fact]
    public void Display_retention_keeps_every_reported_number_of_full_retention()
    {
        using var full = new RepoPaths.TempDir();
        using var display = new RepoPaths.TempDir();
        var a = Write(full.Path, workers: 2, TraceRetention.Full);
        var b = Write(display.Path, workers: 2, TraceRetention.Display, retainedColumns: 20);

        Assert.All(b.Runs, r => Assert.True(r.TracesThinned));
        Assert.Contains(b.Runs, r => r.Converted.Concentration.Count < a.Runs.Single(x => x.Id == r.Id).Converted.Concentration.Count);
        Assert.Equal(File.ReadAllBytes(Path.Combine(full.Path, SummaryJson.FileName)), File.ReadAllBytes(Path.Combine(display.Path, SummaryJson.FileName)));
        Assert.Equal(File.ReadAllBytes(Path.Combine(full.Path, RunsCsv.FileName)), File.ReadAllBytes(Path.Combine(display.Path, RunsCsv.FileName)));
    }

    [Fact]
    public void No_retention_keeps_every_output_byte_of_full_retention()
    {
        // The command line keeps no per-point arrays after a run's plot is drawn: summary, table, report and plots
        // must not change by a byte, and the global fit must still see its points (round trip, invented sample).
        using var series = SampleWithGlobalFit();
        using var full = new RepoPaths.TempDir();
        using var none = new RepoPaths.TempDir();
        var a = Write(full.Path, workers: 2, TraceRetention.Full, folder: series.Path);
        var b = Write(none.Path, workers: 2, TraceRetention.None, folder: series.Path);

        Assert.All(b.Runs, r => Assert.Equal(0, r.Converted.Concentration.Count));
        Assert.All(b.Runs, r => Assert.All(r.Rates.Fits, f => Assert.Empty(f.Fitted)));
        Assert.Equal(a.Findings!.GlobalFit!.Fit.ChiSquare, b.Findings!.GlobalFit!.Fit.ChiSquare);
        foreach (var file in (string[])[SummaryJson.FileName, RunsCsv.FileName, ReportHtml.FileName, .. RunTables.FileNames])
            Assert.Equal(File.ReadAllBytes(Path.Combine(full.Path, file)), File.ReadAllBytes(Path.Combine(none.Path, file)));
        foreach (var png in Directory.EnumerateFiles(Path.Combine(full.Path, "plots")).Select(Path.GetFileName))
            Assert.Equal(File.ReadAllBytes(Path.Combine(full.Path, "plots", png!)), File.ReadAllBytes(Path.Combine(none.Path, "plots", png!)));
    }

    [Fact]
    public void Display_retention_keeps_every_number_of_the_global_progress_curve_fit()
    {
        // The global fit reads the runs' traces after the parallel stage, when only display copies are left: it must
        // still see exactly the points of the full traces it would have used.
        using var series = SampleWithGlobalFit();
        using var full = new RepoPaths.TempDir();
        using var display = new RepoPaths.TempDir();
        var a = Write(full.Path, workers: 2, TraceRetention.Full, folder: series.Path);
        var b = Write(display.Path, workers: 2, TraceRetention.Display, retainedColumns: 20, folder: series.Path);

        Assert.NotNull(a.Findings!.GlobalFit);
        Assert.Equal(a.Findings.GlobalFit!.Fit.ChiSquare, b.Findings!.GlobalFit!.Fit.ChiSquare);
        Assert.Equal(File.ReadAllBytes(Path.Combine(full.Path, SummaryJson.FileName)), File.ReadAllBytes(Path.Combine(display.Path, SummaryJson.FileName)));
    }

    [Fact]
    public void Thinned_run_keeps_its_arrays_aligned_at_the_envelope_samples()
    {
        var full = SeriesRunner.Analyse(Sample, new AnalysisOptions { Workers = 1 }).Runs[0];
        var thin = RunThinning.Thin(full, columns: 10);
        var c = full.Converted.Concentration;
        var t = thin.Converted.Concentration;

        Assert.InRange(t.Count, 10, 40); // at most first, min, max and last per column
        Assert.Same(t.Times, thin.Export.Channels.Single(ch => ch.Count == t.Count).Times);
        for (var i = 0; i < t.Count; i++)
        {
            var k = Array.IndexOf(c.Times, t.Times[i]);
            Assert.True(k >= 0, "every kept time is a sample of the full trace");
            Assert.Equal(c.Values[k], t.Values[i]);
            if (i < thin.Rates.Headline.Fitted.Length) Assert.Equal(full.Rates.Headline.Fitted[k], thin.Rates.Headline.Fitted[i]);
        }
        Assert.Equal(full.Rates.Headline.Value, thin.Rates.Headline.Value);
        Assert.Equal(full.Rates.Headline.PointsUsed, thin.Rates.Headline.PointsUsed);
        // The envelope keeps each column's extremes, so the drawn range of the trace is unchanged.
        Assert.Equal(c.Values.Min(), t.Values.Min());
        Assert.Equal(c.Values.Max(), t.Values.Max());
    }

    /// <summary>A copy of the sample series with the global progress-curve fit switched on.</summary>
    private static RepoPaths.TempDir SampleWithGlobalFit()
    {
        var series = RepoPaths.CopyOf(Sample);
        var toml = Path.Combine(series.Path, "series.toml");
        File.WriteAllText(toml, File.ReadAllText(toml).Replace("[model]\n", "[model]\nglobal_fit = true\n"));
        return series;
    }

    private static SeriesResult Write(string outDir, int workers, TraceRetention retention = TraceRetention.Display, int retainedColumns = 200, string? folder = null)
    {
        // Run plots and the per-run tables from the run sinks, then every series output, as analyse writes them.
        using var outputs = new SeriesOutputs(outDir, plots: true);
        var result = SeriesRunner.Analyse(folder ?? Sample, new AnalysisOptions { Workers = workers, RunSink = outputs.RunSink, Retention = retention, RetainedColumns = retainedColumns });
        Assert.Empty(outputs.Write(result));
        return result;
    }
}
