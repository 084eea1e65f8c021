using System.Text.Json;
using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Series;
using TraceKin.Setup;
using TraceKin.Tests.Reports;
using TraceKin.Tests.Support;
using TraceKin.Traces;

namespace TraceKin.Tests.Series;

/// <summary>
/// The registry of series-level laws: the names [model] laws accepts, and the one path every competing law without a
/// section of its own takes into summary.json, the report and the headline (round trips on the invented acid demo).
/// </summary>
public sealed class SeriesLawsTests(AnalysedSample sample) : IClassFixture<AnalysedSample>
{

    [Fact]
    public void The_power_law_comes_first_and_the_saturation_law_competes_with_it()
    {
        Assert.Equal(["power", "saturation"], SeriesLaws.Names.Take(2));
        Assert.Equal(["power", "saturation"], SeriesLaws.Defaults.Take(2));
        Assert.Equal(SeriesLaws.Defaults, ModelSettings.Default.Laws);
    }

    [Fact]
    public void An_unknown_law_lists_every_registered_name()
    {
        var ex = Assert.Throws<InputException>(() =>
            SeriesConfig.FromText("[signal]\nkind = \"absorbance\"\nspecies = \"A\"\n[model]\nlaws = [\"hyperbolic\"]\n", "series.toml"));
        Assert.Equal("model.laws[0]", ex.Problem.Key);
        Assert.Equal(string.Join(" or ", SeriesLaws.Names.Select(n => $"\"{n}\"")), ex.Problem.Expected);
        Assert.StartsWith("\"power\" or \"saturation\"", ex.Problem.Expected);
    }

    [Fact]
    public void Every_registered_law_is_documented_in_formats_md_and_methods_md()
    {
        var formats = File.ReadAllText(Path.Combine(RepoPaths.Docs, "formats.md"));
        var methods = File.ReadAllText(Path.Combine(RepoPaths.Docs, "methods.md"));
        Assert.All(SeriesLaws.Names, n => Assert.Contains($"\"{n}\"", formats));
        Assert.All(SeriesLaws.Competitors, l => Assert.Contains(l.Name, methods, StringComparison.OrdinalIgnoreCase));
    }

    [Fact]
    public void Leaving_the_saturation_law_out_fits_the_power_law_alone()
    {
        var f = OrderAnalysis.Analyse(SaturatingRuns(), new ModelSettings { Laws = ["power"] });
        Assert.Null(f.Saturation);
        Assert.Equal("power", f.ChosenLaw);
        Assert.Empty(f.OtherLaws);
    }

    [Fact]
    public void A_series_that_saturates_chooses_the_saturation_law_through_the_registry()
    {
        // v = Vmax·S/(Km + S) with Vmax = 2e-5 mol/(L·s), Km = 2e-3 mol/L, noise-free but for 0.5 % steps (invented demo data).
        var f = OrderAnalysis.Analyse(SaturatingRuns(), ModelSettings.Default);
        Assert.NotNull(f.Saturation);
        Assert.Equal("saturation", f.ChosenLaw);
        Assert.Equal(2e-3, f.Saturation!.Km.Value, 2e-4);
        Assert.Empty(f.OtherLaws);
    }

    [Fact]
    public void A_competing_law_without_a_block_of_its_own_is_written_to_summary_json_within_the_schema()
    {
        var r = WithOtherLaw(chosen: false);
        using var ms = new MemoryStream();
        SummaryJson.WriteTo(r, ms, plots: false);
        using var doc = JsonDocument.Parse(ms.ToArray());
        Assert.Empty(SchemaCheck.Check(doc.RootElement));
        var other = doc.RootElement.GetProperty("otherLaws")[0];
        Assert.Equal("trial", other.GetProperty("law").GetString());
        Assert.Equal("c", other.GetProperty("estimates")[0].GetProperty("name").GetString());
        Assert.False(other.GetProperty("usedInstead").GetBoolean());
    }

    [Fact]
    public void Summary_json_has_no_other_laws_block_when_none_was_fitted()
    {
        using var doc = JsonDocument.Parse(File.ReadAllText(sample.SummaryPath));
        Assert.False(doc.RootElement.TryGetProperty("otherLaws", out _));
    }

    [Fact]
    public void A_chosen_competing_law_heads_the_report_with_its_formula_and_estimates()
    {
        var r = WithOtherLaw(chosen: true);
        var html = ReportHtml.Render(r, null);
        var (doc, errors) = ReportHtmlTests.Parse(html);
        Assert.Empty(errors);
        var e = r.Findings!.OtherLaws[0].Estimates[0];
        Assert.Equal("v = c·[A]0, " + ReportNumber.Result(e.Name, e.Value, e.StdError, e.Unit, e.Ci95Low, e.Ci95High), doc.GetElementById("rate-law")!.TextContent);
        Assert.NotNull(doc.QuerySelector("div[data-law=\"trial\"]"));
        Assert.Contains("Used here: the trial law.", doc.QuerySelector("div[data-law=\"trial\"] p")!.TextContent);
    }

    /// <summary>The acid demo's result with a made-up competing law whose fit is the demo's own power-law fit (a round trip).</summary>
    private SeriesResult WithOtherLaw(bool chosen)
    {
        var f = sample.Result.Findings!;
        var fit = f.PowerLawFit!;
        var est = Estimate.Symmetric("c", fit.Parameters[0].Value, fit.Parameters[0].StdError, "1/s", fit.DegreesOfFreedom, "trial");
        var other = new CompetingLawFindings("trial", "v = c·[A]0", [est], fit, fit.AicC, fit.AicC + 1, Math.Exp(0.5), chosen);
        return sample.Result with { Findings = f with { OtherLaws = [other], ChosenLaw = chosen ? "trial" : f.ChosenLaw } };
    }

    private static List<RunPoint> SaturatingRuns()
    {
        const double vmax = 2e-5, km = 2e-3;
        double[] s = [0.5e-3, 1e-3, 2e-3, 4e-3, 8e-3, 16e-3, 32e-3];
        return s.Select((c, i) =>
        {
            var v = vmax * c / (km + c) * (1 + 0.005 * ((i % 3) - 1));
            return new RunPoint($"R{i + 1}", v, 0.01 * v, new Dictionary<string, double> { ["S"] = c }, 298.15);
        }).ToList();
    }
}
