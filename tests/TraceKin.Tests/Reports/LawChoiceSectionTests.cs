using TraceKin.Fitting;

namespace TraceKin.Tests.Reports;

/// <summary>How the report and a fit explain themselves, in our words (presentation; no source needed beyond the
/// Akaike weight, w = 1/(1 + exp(−Δ/2)) for two models: Burnham &amp; Anderson 2002, eq. 2.14).</summary>
public sealed class LawChoiceSectionTests(AnalysedSample sample) : IClassFixture<AnalysedSample>
{
    [Fact]
    public void The_power_law_or_saturation_section_gives_delta_AICc_the_Akaike_weights_and_the_rule_that_decided()
    {
        var html = File.ReadAllText(sample.ReportPath);
        var at = html.IndexOf("id=\"law-choice\"", StringComparison.Ordinal);
        Assert.True(at > 0, "no law-choice section");
        var section = html[at..html.IndexOf("</div>", at, StringComparison.Ordinal)];
        var sat = sample.Result.Findings!.Saturation!;
        var delta = sat.AiccPowerLaw - sat.AiccSaturation;
        Assert.Contains("Akaike weight of", section);
        Assert.Contains("Rule: the saturation law is used when", section);
        Assert.Contains("Used here: the power law", section);
        var w = 1 / (1 + Math.Exp(-delta / 2));
        Assert.Contains(TraceKin.Reports.ReportNumber.Plain(w, 2), section);
        Assert.DoesNotContain("evidence ratio", section, StringComparison.OrdinalIgnoreCase);
    }

    [Fact]
    public void A_fit_explains_itself_in_sentences_and_names_what_to_distrust()
    {
        var fit = sample.Result.Findings!.OrderFit!;
        var text = fit.ToReport();
        Assert.StartsWith("Fitted: ", text);
        Assert.Contains("Outcome: converged after", text);
        Assert.Contains("degree(s) of freedom", text);
        Assert.DoesNotContain("[fit statistics]", text);
        var notConverged = fit with { Exit = FitExit.MaxIterations, ExitDetail = "no convergence within 100 iterations" };
        Assert.Contains("not a result", notConverged.ToReport());
    }

    [Fact]
    public void Result_headings_name_their_species_and_the_log_log_orders_carry_them()
    {
        var html = File.ReadAllText(sample.ReportPath);
        Assert.Contains("Orders in complex, H+ from the log–log line (cross-check)", html);
        Assert.Contains("Shape of ln v0 against ln [X]0 for complex, H+", html);
        Assert.DoesNotContain("<h3>log log orders</h3>", html);
        var at = html.IndexOf("from the log–log line", StringComparison.Ordinal);
        var table = html[at..html.IndexOf("</table>", at, StringComparison.Ordinal)];
        Assert.Contains(">complex<", table);
        Assert.Contains(">H+<", table);
    }
}
