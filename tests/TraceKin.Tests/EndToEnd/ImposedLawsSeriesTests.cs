using TraceKin.Analysis;
using System.Text.Json;
using TraceKin.Tests.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.EndToEnd;

/// <summary>
/// The violet demo (acid in 125- to 500-fold excess over the complex; sample-traces/violet-complex-acid/truth.json:
/// k = 0.35 L/(mol·s)) with rates.laws = ["pseudo-first order"]: every run fitted with that law alone, and every output
/// saying that the law was imposed.
/// </summary>
public sealed class ImposedLawsSeriesTests
{
    [Fact]
    public void Every_run_gets_the_imposed_law_and_the_outputs_say_it_was_imposed()
    {
        using var outDir = new RepoPaths.TempDir();
        var (result, _) = AnalyseWith("violet-complex-acid", "laws = [\"pseudo-first order\"]\ndrift = \"off\"", outDir.Path);

        using var truth = JsonDocument.Parse(File.ReadAllText(Path.Combine(RepoPaths.Sample("violet-complex-acid"), "truth.json")));
        var k = truth.RootElement.GetProperty("rateConstant").GetProperty("value").GetDouble();
        Assert.Equal(8, result.Runs.Count);
        foreach (var run in result.Runs)
        {
            var law = Assert.Single(run.Rates.Fits);
            Assert.Equal(("pseudo-first order", true, false), (law.Law, law.Chosen, law.LackOfFit));
            // Each run's own k is the second-order constant: within 3 % of the truth, the tolerance SampleSeriesTests allows the
            // series k (common practice, no source).
            Assert.InRange(law.RateConstant, 0.97 * k, 1.03 * k);
            Assert.EndsWith("imposed by rates.laws (pseudo-first order)", run.Rates.Headline.Method);
        }

        using var summary = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir.Path, "summary.json")));
        Assert.Equal(["pseudo-first order"], summary.RootElement.GetProperty("imposedLaws").EnumerateArray().Select(e => e.GetString()));
        Assert.Empty(SchemaCheck.Check(summary.RootElement));

        var report = File.ReadAllText(Path.Combine(outDir.Path, "report.html"));
        Assert.Contains("Integrated laws imposed", report);
        Assert.Contains("<td class=\"name\">rates.laws</td>\n<td>[pseudo-first order]</td>\n<td>series.toml</td>", report);
    }

    /// <summary>The teal plate demo fixes each well's end level by rates.limiting_reactant, under which the partner laws are
    /// never fitted (docs/methods.md, "Imposed laws"): such a listed law is said once for the series, not on every well.</summary>
    [Fact]
    public void A_listed_law_the_settings_never_fit_is_said_once_for_the_series()
    {
        using var outDir = new RepoPaths.TempDir();
        var (result, _) = AnalyseWith("teal-lactonase-plate", "laws = [\"first order\", \"mixed second order\"]", outDir.Path);

        Assert.Empty(result.Rejected);
        var once = Assert.Single(result.Warnings, w => w.Code == "imposed-law-never-fitted");
        Assert.Equal("series", once.Where);
        Assert.Contains("mixed second order is fitted to no run", once.Message);
        Assert.All(result.Runs, r => Assert.DoesNotContain(r.Warnings, w => w.Code is "imposed-law-skipped" or "imposed-laws-inapplicable"));
        Assert.All(result.Runs.Where(r => r.Plan.Role != "blank"), r => Assert.Equal("first order", Assert.Single(r.Rates.Fits, f => !f.Law.EndsWith("drift", StringComparison.Ordinal)).Law));
    }

    [Theory]
    [InlineData("teal-lactonase-plate", "laws = [\"mixed second order\", \"pseudo-first order\"]", "rates.limiting_reactant")]
    [InlineData("violet-complex-acid", "laws = [\"order n\"]\ndrift = \"on\"", "rates.drift = \"on\"")]
    public void A_list_of_only_laws_the_settings_never_fit_is_refused_at_its_key(string sample, string setting, string why)
    {
        using var outDir = new RepoPaths.TempDir();
        var (result, text) = AnalyseWith(sample, setting, outDir.Path);

        Assert.Empty(result.Runs);
        var problem = Assert.Single(result.Rejected);
        // Located at the laws key: its line in the file written above (common practice, no source: errors name file, line, key).
        var line = text.Split('\n').ToList().FindIndex(l => l.StartsWith("laws = ", StringComparison.Ordinal)) + 1;
        Assert.Equal(("series.toml", line), (problem.File, problem.Line));
        Assert.Contains("at least one law these settings fit", problem.Expected);
        Assert.Contains(why, problem.Expected);
    }

    /// <summary>A demo analysed (no plots) with these lines added to its [rates] table; the series.toml text it was given.</summary>
    private static (SeriesResult Result, string Toml) AnalyseWith(string sample, string ratesLines, string outDir)
    {
        using var series = RepoPaths.CopyOf(RepoPaths.Sample(sample));
        var toml = Path.Combine(series.Path, "series.toml");
        var text = File.ReadAllText(toml).Replace("[rates]\n", "[rates]\n" + ratesLines + "\n");
        Assert.Contains(ratesLines, text);
        File.WriteAllText(toml, text);
        return (AnalysedSample.Analyse(series.Path, outDir, plots: false), text);
    }

    [Fact]
    public void Without_the_setting_summary_json_has_no_imposed_laws()
    {
        using var outDir = new RepoPaths.TempDir();
        AnalysedSample.Analyse(RepoPaths.Sample("violet-complex-acid"), outDir.Path, plots: false);
        using var summary = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir.Path, "summary.json")));
        Assert.False(summary.RootElement.TryGetProperty("imposedLaws", out _));
        Assert.DoesNotContain("Integrated laws imposed", File.ReadAllText(Path.Combine(outDir.Path, "report.html")));
    }
}
