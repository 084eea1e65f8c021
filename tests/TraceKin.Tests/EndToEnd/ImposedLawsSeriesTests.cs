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
        using var series = RepoPaths.CopyOf(RepoPaths.Sample("violet-complex-acid"));
        using var outDir = new RepoPaths.TempDir();
        var toml = Path.Combine(series.Path, "series.toml");
        File.WriteAllText(toml, File.ReadAllText(toml).Replace("[rates]\n", "[rates]\nlaws = [\"pseudo-first order\"]\ndrift = \"off\"\n"));
        var result = AnalysedSample.Analyse(series.Path, outDir.Path, plots: false);

        using var truth = JsonDocument.Parse(File.ReadAllText(Path.Combine(series.Path, "truth.json")));
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
        using var series = RepoPaths.CopyOf(RepoPaths.Sample("teal-lactonase-plate"));
        using var outDir = new RepoPaths.TempDir();
        var toml = Path.Combine(series.Path, "series.toml");
        File.WriteAllText(toml, File.ReadAllText(toml).Replace("[rates]\n", "[rates]\nlaws = [\"first order\", \"mixed second order\"]\n"));
        var result = AnalysedSample.Analyse(series.Path, outDir.Path, plots: false);

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
        using var series = RepoPaths.CopyOf(RepoPaths.Sample(sample));
        using var outDir = new RepoPaths.TempDir();
        var toml = Path.Combine(series.Path, "series.toml");
        var text = File.ReadAllText(toml).Replace("\ndrift = \"auto\"", "").Replace("[rates]\n", "[rates]\n" + setting + "\n");
        File.WriteAllText(toml, text);
        var result = AnalysedSample.Analyse(series.Path, outDir.Path, plots: false);

        Assert.Empty(result.Runs);
        var problem = Assert.Single(result.Rejected);
        // Located at the laws key: its line in the file written above (common practice, no source: errors name file, line, key).
        var line = text.Split('\n').ToList().FindIndex(l => l.StartsWith("laws = ", StringComparison.Ordinal)) + 1;
        Assert.Equal(("series.toml", line), (problem.File, problem.Line));
        Assert.Contains("at least one law these settings fit", problem.Expected);
        Assert.Contains(why, problem.Expected);
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
