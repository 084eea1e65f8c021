using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Analysis;

/// <summary>
/// A large series keeps, once the per-run tables have written a run's fits, only what the report and summary still
/// read (the chosen fit and any that did not converge); the tables still hold every fit. Invented demo series; the
/// threshold is lowered so eight runs count as "large".
/// </summary>
public sealed class CompactRetentionTests
{
    [Fact]
    public void Beyond_the_threshold_the_result_keeps_the_chosen_and_unconverged_fits_and_the_tables_keep_them_all()
    {
        using var outDir = new RepoPaths.TempDir();
        using var tables = new RunTables(outDir.Path);
        var series = RepoPaths.Sample("violet-complex-acid");
        var compact = SeriesRunner.Analyse(series, new AnalysisOptions { Workers = 2, Retention = TraceRetention.None, KeepEveryFitUpTo = 4, RunSink = tables });
        tables.Write(compact, outDir.Path);
        var full = SeriesRunner.Analyse(series, new AnalysisOptions { Workers = 1 });

        Assert.Equal(full.Runs.Count, compact.Runs.Count);
        foreach (var (c, f) in compact.Runs.Zip(full.Runs))
        {
            Assert.Equal(f.Rates.Fits.Where(x => x.Chosen || !x.Fit.Converged).Select(x => x.Law), c.Rates.Fits.Select(x => x.Law));
            Assert.Single(c.Rates.Fits, x => x.Chosen);
            Assert.Equal(f.Rates.Headline.Value, c.Rates.Headline.Value); // the numbers are the same run's
        }
        Assert.True(full.Runs.Sum(x => x.Rates.Fits.Count) > compact.Runs.Sum(x => x.Rates.Fits.Count), "fits were dropped");
        var rows = File.ReadAllLines(Path.Combine(outDir.Path, RunTables.FitsFile)).Length - 1;
        Assert.Equal(full.Runs.Sum(x => x.Rates.Fits.Count), rows);
        // The series results do not depend on what the runs keep.
        Assert.Equal(full.Findings!.Orders.Select(o => o.Value), compact.Findings!.Orders.Select(o => o.Value));
    }

    [Fact]
    public void Beyond_the_threshold_a_kept_run_holds_its_headline_estimate_and_shares_what_repeats_between_runs()
    {
        using var outDir = new RepoPaths.TempDir();
        using var tables = new RunTables(outDir.Path);
        var compact = SeriesRunner.Analyse(RepoPaths.Sample("violet-complex-acid"), new AnalysisOptions { Workers = 2, Retention = TraceRetention.None, KeepEveryFitUpTo = 4, RunSink = tables });
        tables.Write(compact, outDir.Path);
        var runs = compact.Runs;
        Assert.True(runs.Count >= 2);
        foreach (var r in runs)
        {
            // the other estimates are in initial-rates.csv, the runs test in law-fits.csv
            Assert.Same(r.Rates.Headline, Assert.Single(r.Rates.Estimates));
            Assert.All(r.Rates.Fits, f => Assert.Null(f.Runs));
            // and the kept fits' parameters in law-parameters.csv
            Assert.All(r.Rates.Fits, f => Assert.Empty(f.Fit.Parameters));
            Assert.Empty(r.Converted.Concentration.Values);
        }
        // equal values are one object: the format decisions, the headline's method text, the emptied concentration trace
        var (a, b) = (runs[0], runs[1]);
        Assert.Equal(a.Export.Detected, b.Export.Detected);
        Assert.Same(a.Export.Detected, b.Export.Detected);
        if (a.Rates.Headline.Method == b.Rates.Headline.Method) Assert.Same(a.Rates.Headline.Method, b.Rates.Headline.Method);
        if (a.Converted.Concentration == b.Converted.Concentration) Assert.Same(a.Converted.Concentration, b.Converted.Concentration);
        // initial-rates.csv still has every estimate of every run (one row each, after the header)
        var rows = File.ReadAllLines(Path.Combine(outDir.Path, RunTables.RatesFile)).Length - 1;
        Assert.True(rows > runs.Count, $"{rows} estimate rows for {runs.Count} runs");
    }

    [Fact]
    public void Beyond_the_threshold_summary_json_runs_csv_and_the_per_run_tables_are_the_same_as_with_every_fit_kept()
    {
        // What the runs no longer hold (the other fits and estimates, the kept fits' parameters, the runs tests) is
        // read by none of these outputs: each is byte for byte what it is when every run keeps everything.
        var series = RepoPaths.Sample("violet-complex-acid");
        using var compactDir = new RepoPaths.TempDir();
        using var fullDir = new RepoPaths.TempDir();
        SeriesResult Run(string dir, int keepUpTo)
        {
            using var outputs = new SeriesOutputs(dir, plots: false);
            var r = SeriesRunner.Analyse(series, new AnalysisOptions { Workers = 2, Retention = TraceRetention.None, KeepEveryFitUpTo = keepUpTo, RunSink = outputs.RunSink });
            Assert.Empty(outputs.Write(r));
            return r;
        }
        var compact = Run(compactDir.Path, 4);
        Run(fullDir.Path, int.MaxValue);
        Assert.Contains(compact.Runs, r => r.Rates.Fits.Count > 0 && r.Rates.Fits.All(f => f.Fit.Parameters.Count == 0));
        foreach (var file in RunTables.FileNames.Concat([SummaryJson.FileName, RunsCsv.FileName, PairRatiosCsv.FileName]))
            Assert.Equal(File.ReadAllBytes(Path.Combine(fullDir.Path, file)), File.ReadAllBytes(Path.Combine(compactDir.Path, file)));
        Assert.True(File.ReadAllLines(Path.Combine(compactDir.Path, RunTables.ParametersFile)).Length > compact.Runs.Count, "every fit's parameters are in the table");
    }

    [Fact]
    public void Without_a_sink_every_fit_is_kept_however_large_the_series()
    {
        var r = SeriesRunner.Analyse(RepoPaths.Sample("violet-complex-acid"), new AnalysisOptions { Workers = 2, Retention = TraceRetention.None, KeepEveryFitUpTo = 4 });
        Assert.All(r.Runs, x => Assert.True(x.Rates.Fits.Count >= 6));
    }
}
