using TraceKin.Series;

namespace TraceKin.Tests.Series;

/// <summary>
/// Verdicts on orders by two one-sided tests (Schuirmann 1987, J. Pharmacokinet. Biopharm. 15, 657): equivalent to a
/// simple value n0 within ±δ when the 90 % interval n̂ ± t(0.95, ν)·se lies inside [n0 − δ, n0 + δ]. The examples are
/// worked by hand with Student t quantiles from a printed table (NIST/SEMATECH e-Handbook of Statistical Methods,
/// §1.3.6.7.2, "Critical values of the Student's t distribution"): t(0.95, 20) = 1.725, t(0.975, 20) = 2.086,
/// t(0.95, 5) = 2.015, t(0.975, 5) = 2.571, t(0.95, ∞) = 1.645, t(0.975, ∞) = 1.960.
/// </summary>
public sealed class OrderVerdictTests
{
    private static Order O(double n, double se, int dof, double t975) => new("A", n, se, dof, n - t975 * se, n + t975 * se, "test");

    [Fact]
    public void An_order_whose_90_percent_interval_lies_inside_the_margin_is_equivalent()
    {
        // n̂ = 1.02, se = 0.01, ν = 20: 90 % interval 1.02 ± 1.725·0.01 = 1.00275 to 1.03725, inside 0.95 to 1.05.
        var v = OrderEquivalence.Judge(O(1.02, 0.01, 20, 2.086), 0.05);
        Assert.Equal(OrderVerdictKind.Equivalent, v.Verdict);
        Assert.Equal(1.0, v.SimpleValue);
        Assert.Equal(1.00275, v.Ci90Low, 1e-4);
        Assert.Equal(1.03725, v.Ci90High, 1e-4);
        // t₂ = (1.05 − 1.02)/0.01 = 3.0: one-sided p = 0.0036 by the table (between 0.005 at 2.845 and 0.0025 at 3.153).
        Assert.InRange(v.PUpper, 0.0025, 0.005);
        Assert.True(v.PLower < 1e-6); // t₁ = 7
    }

    [Fact]
    public void A_very_precise_order_that_differs_from_one_statistically_is_still_equivalent_to_one()
    {
        // n̂ = 1.0005, se = 0.0001, ν = 10 000 (t ≈ the normal quantiles): the 95 % interval 1.000304 to 1.000696 excludes
        // 1, yet the 90 % interval 1.000336 to 1.000664 lies well inside 0.95 to 1.05.
        var o = O(1.0005, 0.0001, 10_000, 1.960);
        Assert.True(o.Ci95Low > 1);
        var v = OrderEquivalence.Judge(o, 0.05);
        Assert.Equal(OrderVerdictKind.Equivalent, v.Verdict);
        Assert.Equal(1.000336, v.Ci90Low, 1e-5);
    }

    [Fact]
    public void An_order_consistent_with_one_but_too_imprecise_is_said_so()
    {
        // n̂ = 1.03, se = 0.015, ν = 20: 90 % interval 1.00413 to 1.05587 reaches past 1.05 (t₂ = 1.33 < 1.725), while the
        // 95 % interval 0.99871 to 1.06129 contains 1.
        var v = OrderEquivalence.Judge(O(1.03, 0.015, 20, 2.086), 0.05);
        Assert.Equal(OrderVerdictKind.ConsistentButImprecise, v.Verdict);
        Assert.Equal(1.0, v.SimpleValue);
        Assert.Equal(1.05587, v.Ci90High, 1e-4);
        Assert.Contains("too imprecise", v.Text);
        // ν = 5, n̂ = 0.97, se = 0.04: 90 % interval 0.8894 to 1.0506, 95 % interval 0.8672 to 1.0728.
        var w = OrderEquivalence.Judge(O(0.97, 0.04, 5, 2.571), 0.05);
        Assert.Equal(OrderVerdictKind.ConsistentButImprecise, w.Verdict);
        Assert.Equal(0.8894, w.Ci90Low, 1e-3);
    }

    [Fact]
    public void An_order_far_from_every_simple_value_is_different()
    {
        // n̂ = 1.12, se = 0.01, ν = 20: 95 % interval 1.0991 to 1.1409 holds neither 1 nor 3/2.
        var v = OrderEquivalence.Judge(O(1.12, 0.01, 20, 2.086), 0.05);
        Assert.Equal(OrderVerdictKind.Different, v.Verdict);
        Assert.Contains("differs from every simple value", v.Text);
    }

    [Fact]
    public void A_wider_margin_turns_a_consistent_order_into_an_equivalent_one()
    {
        // Same n̂ = 1.03 ± 0.015 (ν = 20): 90 % interval 1.00413 to 1.05587 lies inside 0.90 to 1.10.
        Assert.Equal(OrderVerdictKind.Equivalent, OrderEquivalence.Judge(O(1.03, 0.015, 20, 2.086), 0.10).Verdict);
    }

    [Fact]
    public void Orders_are_rounded_and_k_refitted_only_when_every_order_is_equivalent()
    {
        // Truth v0 = 0.35·[A]·[B] with 0.5 % noise over a wide, replicated design (invented series): both orders come
        // out within a few thousandths of 1 with tight intervals, so both are equivalent and k is refitted at (1, 1).
        var levels = new[] { 0.001, 0.002, 0.004, 0.008, 0.016 };
        var runs = SeriesData.PowerLaw(0.35, [("A", 1, levels), ("B", 1, levels.Select(x => 10 * x).ToArray())], 0.005, seed: 21);
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default with { Laws = ["power"] });
        Assert.All(f.OrderVerdicts, v => Assert.Equal(OrderVerdictKind.Equivalent, v.Verdict));
        Assert.NotNull(f.RoundedOrders);
        Assert.DoesNotContain(f.Warnings, w => w.Code == "orders-not-simple");
        // The free-order results stay beside the rounded ones.
        Assert.NotNull(f.RateConstantAtFittedOrders);
        // A margin too tight for this precision: not every order equivalent, so no rounding, and the warning says why.
        var tight = OrderAnalysis.Analyse(runs, ModelSettings.Default with { Laws = ["power"], OrderMargin = 0.001 });
        Assert.Null(tight.RoundedOrders);
        Assert.Contains(tight.Warnings, w => w.Code == "orders-not-simple" && w.Message.Contains("±0.001"));
    }

    [Fact]
    public void A_tiny_significant_curvature_in_a_huge_series_is_not_called_a_wrong_law()
    {
        // 2,000 runs of v0 = k·[A]^(1 + 0.002·ln([A]/[A]ref)) (a departure of 0.01 in local order across the range, far
        // inside the ±0.05 margin) with 0.2 % noise: significant, not relevant (invented series).
        var rng = new Random(3);
        var runs = new List<RunPoint>();
        for (var i = 0; i < 2000; i++)
        {
            var a = 0.001 * Math.Exp(rng.NextDouble() * Math.Log(10));
            var l = Math.Log(a / 0.00316);
            var v = 2.0 * Math.Exp((1 + 0.002 * l) * Math.Log(a)) * (1 + TraceKin.Simulation.RateLawSimulator.Gaussian(rng, 0.002));
            runs.Add(SeriesData.Point($"R{i}", v, 0.002, 298.15, ("A", a)));
        }
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default with { Laws = ["power"] });
        var c = Assert.Single(f.Curvature);
        Assert.True(c.Significant, $"p = {c.PValue}");
        Assert.False(c.Relevant);
        Assert.InRange(Math.Abs(c.LocalOrderAtHighest - c.LocalOrderAtLowest), 0.005, 0.02);
        Assert.DoesNotContain(f.Warnings, w => w.Code == "power-law-wrong-shape");
    }

    [Fact]
    public void A_saturating_series_gets_the_curvature_verdict_with_the_local_order_at_both_ends()
    {
        // v0 = Vmax·[S]/(Km + [S]) over 0.2–20 Km with 1 % noise (invented series; Michaelis & Menten 1913): the local order
        // Km/(Km + [S]) runs from about 0.83 to about 0.05, far beyond the margin.
        var rng = new Random(8);
        const double vmax = 1e-6, km = 1e-3;
        var runs = Enumerable.Range(0, 16).Select(i =>
        {
            var s = km * 0.2 * Math.Pow(100, i / 15.0);
            var v = vmax * s / (km + s) * (1 + TraceKin.Simulation.RateLawSimulator.Gaussian(rng, 0.01));
            return SeriesData.Point($"S{i}", v, 0.01, 298.15, ("S", s));
        }).ToList();
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        var c = Assert.Single(f.Curvature);
        Assert.True(c.Relevant);
        Assert.True(c.LocalOrderAtLowest > c.LocalOrderAtHighest + 0.3, $"{c.LocalOrderAtLowest} to {c.LocalOrderAtHighest}");
        var w = Assert.Single(f.Warnings, x => x.Code == "power-law-wrong-shape");
        Assert.Contains("local order in S runs from", w.Message);
    }
}
