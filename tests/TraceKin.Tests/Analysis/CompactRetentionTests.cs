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
    public void Without_a_sink_every_fit_is_kept_however_large_the_series()
    {
        var r = SeriesRunner.Analyse(RepoPaths.Sample("violet-complex-acid"), new AnalysisOptions { Workers = 2, Retention = TraceRetention.None, KeepEveryFitUpTo = 4 });
        Assert.All(r.Runs, x => Assert.True(x.Rates.Fits.Count >= 6));
    }
}
