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
