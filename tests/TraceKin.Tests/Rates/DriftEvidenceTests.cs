using TraceKin.Rates;
using TraceKin.Traces;

namespace TraceKin.Tests.Rates;

/// <summary>
/// A straight trace (zero order: the reaction's own terms already span a linear drift) is no evidence of a drift:
/// the score test has no residual direction left to test, and no run may be told that "the residuals suggest a
/// baseline drift". Truth: a zero-order product curve, [P] = v·t (closed-form integrated rate law, common practice,
/// no source), with Gaussian noise from fixed seeds.
/// </summary>
public sealed class DriftEvidenceTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    public void A_straight_product_curve_gets_no_drift_claim(int seed)
    {
        const double v = 2e-8;
        var trace = SyntheticTrace.Make(t => v * t, 300, 100, 0.01 * v * 300, seed);
        var product = new Trace("P", Quantity.Concentration, "mol/L", trace.Times, trace.Values);
        var r = RateAnalysis.Analyse(product, 1, null, RateSettings.Default, "straight");
        Assert.Equal("zero order", r.ChosenLaw?.Law);
        Assert.DoesNotContain(r.Warnings, w => w.Code == "drift-not-separable");
        Assert.InRange(r.Headline.Value, 0.97 * v, 1.03 * v);
    }
}
