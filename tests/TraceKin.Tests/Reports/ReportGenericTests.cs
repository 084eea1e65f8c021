using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

/// <summary>Series results without a dedicated report section are still shown, with value ± SE, unit and interval.</summary>
public sealed class ReportGenericTests
{
    // Invented shapes, like those a temperature-dependence result would have.
    private sealed record Estimate(double Value, double StdError, string Unit, double Ci95Low, double Ci95High);
    private sealed record TemperatureFit(Estimate ActivationEnergy, Estimate PreExponential, int Dof, string Method);

    [Fact]
    public void An_unknown_result_record_is_rendered_as_a_table_of_estimates()
    {
        var html = ReportHtml.RenderGeneric(new TemperatureFit(
            new Estimate(52.3456, 1.234, "kJ/mol", 49.1, 55.6),
            new Estimate(3.2e8, 0.41e8, "L/(mol·s)", 2.2e8, 4.2e8), 4, "linear least squares on ln k against 1/T"));
        var (doc, errors) = ReportHtmlTests.Parse($"<!DOCTYPE html><html><head><title>t</title></head><body>{html}</body></html>");
        Assert.Empty(errors);
        var rows = doc.QuerySelectorAll("table.generic tr").ToDictionary(r => r.Children[0].TextContent, r => r.Children[1].TextContent);
        Assert.Equal("52.3 ± 1.2 kJ/mol (95 % interval 49.1 to 55.6)", rows["activation energy"]);
        Assert.Equal("(3.20 ± 0.41) × 10⁸ L/(mol·s) (95 % interval (2.20 to 4.20) × 10⁸)", rows["pre exponential"]);
        Assert.Equal("4", rows["dof"]);
        Assert.Equal("linear least squares on ln k against 1/T", rows["method"]);
    }

    [Fact]
    public void A_list_of_records_becomes_one_table_row_each_with_text_escaped()
    {
        var html = ReportHtml.RenderGeneric(new[] { ("R<1>", 0.5), ("R2", 0.25) }.Select(t => new { Run = t.Item1, Share = t.Item2 }).ToList());
        var (doc, _) = ReportHtmlTests.Parse($"<!DOCTYPE html><html><head><title>t</title></head><body>{html}</body></html>");
        Assert.Equal(["run", "share"], doc.QuerySelectorAll("table.generic th").Select(th => th.TextContent).ToArray());
        Assert.Equal(["R<1>", "0.5000", "R2", "0.2500"], doc.QuerySelectorAll("table.generic td").Select(td => td.TextContent).ToArray());
    }
}
