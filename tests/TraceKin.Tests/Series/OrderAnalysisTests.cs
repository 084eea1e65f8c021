using TraceKin.Series;

namespace TraceKin.Tests.Series;

/// <summary>Synthetic series with known truths (invented data, fixed seeds): orders, rounding, design diagnostics.</summary>
public class OrderAnalysisTests
{
    [Fact]
    public void Integer_orders_one_and_two_are_recovered_within_five_hundredths_and_k_is_refitted_at_them()
    {
        // Truth: v0 = 0.35·[A]·[B]², 2 % noise on each rate (invented series).
        var runs = SeriesData.PowerLaw(0.35, [("A", 1, [0.001, 0.002, 0.004]), ("B", 2, [0.01, 0.02, 0.04])], 0.02, seed: 11);
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        Assert.Equal(1.0, f.Orders.Single(o => o.Species == "A").Value, 0.05);
        Assert.Equal(2.0, f.Orders.Single(o => o.Species == "B").Value, 0.05);
        Assert.All(f.Orders, o => Assert.StartsWith("weighted nonlinear", o.Method));
        Assert.NotNull(f.RoundedOrders);
        Assert.Equal(2.0, f.RoundedOrders!["B"]);
        // 9 runs with 2 % noise: the mean of the per-run k has a relative error of about 0.7 %; allow 3 %.
        Assert.Equal(0.35, f.RateConstant!.Value, 0.35 * 0.03);
        Assert.Equal("L^2/(mol^2·s)", f.RateConstant.Unit);
        Assert.NotNull(f.RateConstantAtFittedOrders);
        // The log–log line is kept as a cross-check and agrees with the nonlinear fit.
        Assert.Equal(f.Orders[0].Value, f.LogLogOrders[0].Value, 0.05);
        Assert.True(f.Design!.Separable);
        Assert.InRange(f.Design.ConditionNumber, 1.0, 1.0 + 1e-9); // a full factorial design is orthogonal
    }

    [Fact]
    public void Half_order_is_recovered_within_five_hundredths_and_rounded_to_one_half()
    {
        // Truth: v0 = 2.0e-3·[A]^0.5·[B]^1 (invented series).
        var runs = SeriesData.PowerLaw(2.0e-3, [("A", 0.5, [0.01, 0.03, 0.09, 0.27]), ("B", 1, [0.05, 0.1, 0.2])], 0.02, seed: 5);
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        var a = f.Orders.Single(o => o.Species == "A");
        Assert.Equal(0.5, a.Value, 0.05);
        Assert.InRange(0.5, a.Ci95Low, a.Ci95High);
        Assert.Equal(0.5, f.RoundedOrders!["A"]);
        Assert.Equal("L^0.5/(mol^0.5·s)", f.RateConstant!.Unit); // (mol/L)^(1 − 3/2)/s
        Assert.InRange(2.0e-3, f.RateConstant.Ci95Low, f.RateConstant.Ci95High);
    }

    [Fact]
    public void Species_that_always_vary_together_give_a_diagnostic_and_no_orders()
    {
        // [B]0 is always half of [A]0, so n(A) and n(B) cannot be told apart (common practice, no source).
        var runs = new[] { 0.001, 0.002, 0.004, 0.008, 0.016 }
            .Select((a, i) => SeriesData.Point($"R{i + 1}", 0.5 * a * a / 2, 0.02, 298.15, ("A", a), ("B", a / 2))).ToList();
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        Assert.Empty(f.Orders);
        Assert.Null(f.RateConstant);
        Assert.False(f.Design!.Separable);
        var w = Assert.Single(f.Warnings, x => x.Code == "orders-not-separable");
        Assert.Contains("A", w.Where);
        Assert.Contains("B", w.Where);
        Assert.Contains("never vary independently", w.Message);
    }

    [Fact]
    public void Strongly_correlated_but_separable_design_is_fitted_and_flagged()
    {
        // [B]0 follows [A]0 except in one run: separable, but badly conditioned (invented series).
        var a = new[] { 0.010, 0.020, 0.040, 0.080, 0.160, 0.040 };
        var b = new[] { 0.010, 0.020, 0.040, 0.080, 0.160, 0.044 };
        var runs = a.Select((x, i) => SeriesData.Point($"R{i + 1}", 3.0 * x * b[i], 0.01, 298.15, ("A", x), ("B", b[i]))).ToList();
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        Assert.True(f.Design!.Separable);
        Assert.True(f.Design.ConditionNumber > OrderDesign.StrongCollinearity);
        Assert.Contains(f.Warnings, x => x.Code == "design-ill-conditioned");
    }

    [Fact]
    public void An_order_whose_interval_misses_every_simple_value_is_not_rounded()
    {
        // Truth n(A) = 1.25, with 0.5 % noise the interval excludes both 1 and 3/2 (invented series).
        var runs = SeriesData.PowerLaw(1.0, [("A", 1.25, [0.01, 0.02, 0.04, 0.08, 0.16])], 0.005, seed: 3);
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default with { Laws = ["power"] });
        Assert.Null(f.RoundedOrders);
        Assert.Contains(f.Warnings, x => x.Code == "orders-not-simple");
        Assert.Equal(f.RateConstantAtFittedOrders, f.RateConstant);
    }
}
