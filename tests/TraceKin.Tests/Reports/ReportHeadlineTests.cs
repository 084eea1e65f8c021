using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

// The report's first lines: the rate law with k, its interval and unit; the temperature dependence where there is one;
// orders under a heading that names the species. Layout checks on the bundled invented demos (no source needed).
public sealed class ReportHeadlineTests : IDisposable
{
    private readonly RepoPaths.TempDir _dir = new();

    public void Dispose() => _dir.Dispose();

    private (AngleSharp.Html.Dom.IHtmlDocument Doc, TraceKin.Analysis.SeriesResult Result) Analyse(string sample)
    {
        var result = AnalysedSample.Analyse(RepoPaths.Sample(sample), _dir.Path, plots: false);
        var (doc, errors) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(_dir.Path, ReportHtml.FileName)));
        Assert.Empty(errors);
        return (doc, result);
    }

    [Fact]
    public void The_acid_demo_opens_its_results_with_the_rate_law_and_k_with_interval_and_unit()
    {
        var (doc, r) = Analyse("violet-complex-acid");
        var f = r.Findings!;
        var k = f.RateConstant!;
        var first = doc.QuerySelector("#results > h2 + p")!;
        Assert.Equal("rate-law", first.Id);
        var expectedLaw = "v = k·" + string.Join("·", f.Orders.Select(o => $"[{o.Species}]^" +
            (f.RoundedOrders is { } ro ? ro[o.Species].ToString(System.Globalization.CultureInfo.InvariantCulture) : ReportNumber.Plain(o.Value, 3))));
        Assert.Equal($"{expectedLaw}, k = {ReportNumber.Estimate(k.Value, k.StdError, k.Unit, k.Ci95Low, k.Ci95High)}", first.TextContent);
        Assert.Equal("Reaction orders in " + string.Join(", ", f.Orders.Select(o => o.Species)), doc.QuerySelector("#results h3")!.TextContent);
        Assert.Null(doc.GetElementById("temperature-dependence"));
    }

    [Fact]
    public void The_temperature_demo_states_Ea_and_the_activation_parameters_under_the_rate_law()
    {
        var (doc, r) = Analyse("amber-ester-warmth");
        var a = r.Findings!.Temperature!.Arrhenius!.ActivationEnergy;
        Assert.StartsWith("v = k·[", doc.GetElementById("rate-law")!.TextContent, StringComparison.Ordinal);
        var line = doc.GetElementById("temperature-dependence")!.TextContent;
        Assert.StartsWith($"Ea = {ReportNumber.Estimate(a.Value, a.StdError, a.Unit, a.Ci95Low, a.Ci95High)}; ΔH‡ = ", line, StringComparison.Ordinal);
        Assert.Contains("; ΔS‡ = ", line, StringComparison.Ordinal);
    }

    // Rule of our own (ReportNumber.Determined): the 95 % interval no wider than the value.
    [Theory]
    [InlineData(124.0, 170.0, -230.0, 480.0, "Km not determined (95 % CI −230 to 480 mol/L)")]
    [InlineData(0.3502, 0.0011, 0.3479, 0.3525, "Km = 0.3502 ± 0.0011 mol/L (95 % CI 0.3479 to 0.3525)")]
    [InlineData(2.4, 0.95, 0.5, 4.3, "Km not determined (95 % CI 0.50 to 4.30 mol/L)")]
    [InlineData(2.4, 0.95, double.NaN, 4.3, "Km not determined (no 95 % interval)")]
    public void A_size_whose_interval_is_wider_than_itself_is_not_determined(double value, double se, double low, double high, string printed) =>
        Assert.Equal(printed, ReportNumber.Result("Km", value, se, "mol/L", low, high));
}

public sealed class NotDeterminedGenericTests
{
    [Fact]
    public void A_saturation_constant_with_an_interval_wider_than_itself_is_not_printed_as_a_result()
    {
        // Invented numbers shaped like a saturation fit that the series cannot support (rule: ReportNumber.Determined).
        var km = new TraceKin.Series.Estimate("Km", 124, 170, "mol/L", 5, -230, 480, "saturation fit");
        var html = ReportHtml.RenderGeneric(km);
        Assert.Contains("not determined (95 % CI −230 to 480 mol/L)", html, StringComparison.Ordinal);
        Assert.DoesNotContain("124", html, StringComparison.Ordinal);
        // ΔS‡ near zero is a result, whatever its size.
        var ds = new TraceKin.Series.Estimate("ΔS‡", 2.0, 3.0, "J/(mol·K)", 5, -5.7, 9.7, "Eyring fit");
        Assert.Contains("2.0 ± 3.0 J/(mol·K)", ReportHtml.RenderGeneric(ds), StringComparison.Ordinal);
    }
}
