using System.Collections.Concurrent;
using System.Security.Cryptography;
using TraceKin.Analysis;
using TraceKin.Tests.Plates;

namespace TraceKin.Tests.Analysis;

/// <summary>
/// Runs kept from one analysis to the next (what `watch` does): only a run whose export, plan row, blanks or
/// series.toml changed is read and analysed again, and the results equal a fresh analysis. Invented plate data.
/// </summary>
public class RunStoreTests
{
    private const string Plan = """
        run,file,channel,[S]0 (mmol/L),role,group,subtract
        a1,one.csv,A1,0.4,sample,,buffer
        a2,one.csv,A2,0.6,sample,,buffer
        b1,two.csv,A1,0.8,sample,,
        k1,blank.csv,A1,0,blank,buffer,
        """;

    private static string Blank(int seed) => PlateFolder.Wide([("A1", 0, 0.01)], seed: seed);

    private sealed class Series : IDisposable
    {
        public readonly PlateFolder Folder = new(PlateFolder.Toml.Replace("blank = 0.04", "blank = 0"));
        public readonly RunStore Store = new();
        public Series()
        {
            Folder.Write("plan.csv", Plan);
            Folder.Write("one.csv", PlateFolder.Wide([("A1", 0.0004, 0.01), ("A2", 0.0006, 0.01)], seed: 1));
            Folder.Write("two.csv", PlateFolder.Wide([("A1", 0.0008, 0.01)], seed: 2));
            Folder.Write("blank.csv", Blank(5));
        }

        /// <summary>One pass as the watcher makes it: the inputs' SHA-256s, then the analysis; the files parsed are counted.</summary>
        public (SeriesResult Result, string[] Parsed) Pass()
        {
            var shas = Directory.GetFiles(Folder.Path).ToDictionary(f => Path.GetFileName(f), f => Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(f))));
            Store.BeginPass(shas);
            var parsed = new ConcurrentBag<string>();
            var result = SeriesRunner.Analyse(Folder.Path, new AnalysisOptions { Workers = 2, Reuse = Store, ExportParsed = parsed.Add });
            Store.EndPass();
            return (result, parsed.Order(StringComparer.Ordinal).ToArray());
        }

        public void Dispose() => Folder.Dispose();
    }

    private static (string, double, double)[] Rates(SeriesResult r) => r.Runs.Select(x => (x.Id, x.Rates.Headline.Value, x.Rates.Headline.StdError)).ToArray();

    [Fact]
    public void An_unchanged_series_reads_nothing_again_and_gives_the_same_results()
    {
        using var s = new Series();
        var (first, parsed) = s.Pass();
        Assert.Equal(["blank.csv", "one.csv", "two.csv"], parsed);
        Assert.Equal((0, 4), s.Store.LastPass);

        var (second, again) = s.Pass();
        Assert.Empty(again);
        Assert.Equal((4, 0), s.Store.LastPass);
        Assert.Equal(Rates(first), Rates(second));
        Assert.Equal(first.Findings!.Orders.Select(o => o.Value), second.Findings!.Orders.Select(o => o.Value));
    }

    [Fact]
    public void A_rewritten_export_re_analyses_its_own_runs_and_those_that_subtract_it()
    {
        using var s = new Series();
        s.Pass();
        s.Folder.Write("two.csv", PlateFolder.Wide([("A1", 0.0008, 0.01)], seed: 3));
        var (_, parsed) = s.Pass();
        Assert.Equal(["two.csv"], parsed);
        Assert.Equal((3, 1), s.Store.LastPass);

        // the blank's export: the blank run itself and the two samples that subtract its group
        s.Folder.Write("blank.csv", Blank(6));
        var (changed, parsedAgain) = s.Pass();
        Assert.Equal(["blank.csv", "one.csv"], parsedAgain);
        Assert.Equal((1, 3), s.Store.LastPass);

        // and the kept results equal an analysis from scratch
        var fresh = SeriesRunner.Analyse(s.Folder.Path, new AnalysisOptions { Workers = 1 });
        Assert.Equal(Rates(fresh), Rates(changed));
    }

    [Fact]
    public void A_changed_plan_row_re_analyses_that_run_and_a_changed_series_toml_every_run()
    {
        using var s = new Series();
        s.Pass();
        s.Folder.Write("plan.csv", Plan.Replace("b1,two.csv,A1,0.8", "b1,two.csv,A1,0.9"));
        s.Pass();
        Assert.Equal((3, 1), s.Store.LastPass);

        s.Folder.Write("series.toml", PlateFolder.Toml.Replace("blank = 0.04", "blank = 0").Replace("window_conversion = 0.2", "window_conversion = 0.15"));
        s.Pass();
        Assert.Equal((0, 4), s.Store.LastPass);
    }
}
