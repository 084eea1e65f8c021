using TraceKin.Analysis;
using TraceKin.Fitting;
using TraceKin.Rates;
using TraceKin.Reports;
using TraceKin.Traces;

namespace TraceKin.Tests.Rates;

/// <summary>
/// rates.laws: the integrated laws a run is fitted with, restricted to a list (docs/formats.md "[rates]", docs/methods.md
/// "Imposed laws"). Traces are closed-form integrated rate laws with seeded noise (common practice, no source).
/// </summary>
public sealed class ImposedLawsTests
{
    private const double A0 = 0.05;

    // The key sits on line 5, indented by three blanks: column 4.
    private static SeriesConfig Parse(string lawsValue) =>
        SeriesConfig.FromText("[signal]\nkind = \"absorbance\"\nspecies = \"A\"\n[rates]\n   laws = " + lawsValue + "\n", "series.toml");

    private static InputException Rejected(string lawsValue)
    {
        var ex = Assert.Throws<InputException>(() => Parse(lawsValue));
        // Every rejection names the file, the key's line and column and the key (the located-error convention, DEVELOPERS.md).
        Assert.Equal("rates.laws", ex.Problem.Key);
        Assert.Equal(("series.toml", 5, 4), (ex.Problem.File, ex.Problem.Line, ex.Problem.Column));
        Assert.StartsWith("series.toml:5:4 [rates.laws]: found ", ex.Message);
        return ex;
    }

    [Fact]
    public void Without_the_key_every_law_competes_and_the_setting_is_not_listed()
    {
        var config = SeriesConfig.FromText("[signal]\nkind = \"absorbance\"\nspecies = \"A\"\n[rates]\ndrift = \"off\"\n", "series.toml");
        Assert.Null(config.Rates.Laws);
        Assert.Null(RateSettings.Default.Laws);
        // The report's settings list stays as it was for every series that does not use the key.
        Assert.DoesNotContain(SettingsProvenance.Rows(config), r => r.Key == "rates.laws");
    }

    [Fact]
    public void Law_names_are_read_in_their_canonical_spelling_and_given_order_and_listed_as_written()
    {
        var config = Parse("[\"Pseudo-First Order\", \" first order \"]");
        Assert.Equal(["pseudo-first order", "first order"], config.Rates.Laws);
        var row = Assert.Single(SettingsProvenance.Rows(config), r => r.Key == "rates.laws");
        Assert.Equal(("[pseudo-first order, first order]", "series.toml"), (row.Value, row.Source));
    }

    [Fact]
    public void The_accepted_names_are_the_law_names_of_law_fits_csv()
    {
        // The law column of law-fits.csv is each RateLaw's Name (drift variants add " + drift").
        RateLaw[] laws = [new ZeroOrderLaw(), new FirstOrderLaw(), new SecondOrderLaw(), new MixedSecondOrderLaw(), new PseudoFirstOrderLaw(1), new NthOrderLaw()];
        Assert.Equal(laws.Select(l => l.Name), RateSettings.LawNames);
    }

    [Fact]
    public void A_single_string_is_rejected_as_not_an_array()
    {
        var ex = Rejected("\"first order\"");
        Assert.Contains("not an array", ex.Problem.Found);
        Assert.Contains("an array of quoted law names", ex.Problem.Expected);
        Assert.Contains("[\"first order\"]", ex.Problem.Hint);
    }

    [Fact]
    public void A_number_is_rejected_as_not_an_array()
    {
        var ex = Rejected("3");
        Assert.Equal("3", ex.Problem.Found);
        Assert.Contains("an array of quoted law names", ex.Problem.Expected);
    }

    [Fact]
    public void An_element_that_is_not_a_string_is_rejected_with_its_position()
    {
        var ex = Rejected("[\"first order\", 2]");
        Assert.Equal("2 as element 2", ex.Problem.Found);
    }

    [Fact]
    public void An_unknown_law_is_rejected_listing_every_allowed_name()
    {
        var ex = Rejected("[\"first order\", \"third order\"]");
        Assert.Equal("\"third order\" as element 2", ex.Problem.Found);
        foreach (var name in RateSettings.LawNames) Assert.Contains($"\"{name}\"", ex.Problem.Expected);
    }

    [Fact]
    public void An_empty_array_is_rejected()
    {
        var ex = Rejected("[]");
        Assert.Equal("an empty array", ex.Problem.Found);
        Assert.Contains("at least one integrated law", ex.Problem.Expected);
    }

    [Fact]
    public void A_law_listed_twice_is_rejected()
    {
        var ex = Rejected("[\"first order\", \"zero order\", \"First Order\"]");
        Assert.Contains("\"first order\" twice (elements 1 and 3)", ex.Problem.Found);
        Assert.Equal("each law at most once", ex.Problem.Expected);
    }

    private static (double[] T, double[] Y, double[] W) FirstOrderTrace(int points, double k = 0.01, int seed = 7)
    {
        var tr = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(k, A0, t), 400, points, 2e-4, seed);
        return (tr.Times, tr.Values, Enumerable.Repeat(1.0, points).ToArray());
    }

    private static void SameFit(FitResult expected, FitResult actual)
    {
        Assert.Equal(expected.AicC, actual.AicC);
        Assert.Equal(expected.ChiSquare, actual.ChiSquare);
        Assert.Equal(expected.Parameters.Select(p => (p.Name, p.Value, p.StdError)), actual.Parameters.Select(p => (p.Name, p.Value, p.StdError)));
    }

    [Theory]
    [InlineData(400)]   // compared on 64 bins, the chosen law refitted on every sample
    [InlineData(2000)]  // compared on 32 bins, the chosen law refitted on 250
    public void A_listed_law_has_exactly_the_fit_it_has_among_every_law(int points)
    {
        // Each law's drift-free fit starts from the trace alone (IntegratedLawFitter.FitOne: its start, bounds and bins
        // come from the data; no other law's fit feeds it), so restricting the list can change the comparison but
        // never a listed law's own numbers.
        var (t, y, w) = FirstOrderTrace(points);
        var every = IntegratedLawFitter.Fit(t, y, w, -1, A0, null, "auto");
        var first = IntegratedLawFitter.Fit(t, y, w, -1, A0, null, "auto", laws: ["first order"]);
        var two = IntegratedLawFitter.Fit(t, y, w, -1, A0, null, "auto", laws: ["second order", "first order"]);

        var chosen = every.Fits.Single(f => f.Chosen);
        Assert.Equal("first order", chosen.Law);
        SameFit(chosen.Fit, first.Fits.Single(f => f.Chosen && f.Law == "first order").Fit);
        SameFit(chosen.Fit, two.Fits.Single(f => f.Chosen && f.Law == "first order").Fit);
        // A law that is listed but not chosen keeps its comparison fit too.
        SameFit(every.Fits.Single(f => f.Law == "second order").Fit, two.Fits.Single(f => f.Law == "second order").Fit);
        // Only listed laws are fitted (with their drift variants where "auto" asks for them); order n is not listed.
        Assert.All(first.Fits, f => Assert.StartsWith("first order", f.Law));
        Assert.All(two.Fits, f => Assert.True(f.Law.StartsWith("first order") || f.Law.StartsWith("second order"), f.Law));
        // One law, one weight: the choice is imposed.
        Assert.Equal(1.0, first.Fits.Single(f => f.Chosen).AkaikeWeight, 12);
    }

    [Fact]
    public void Pseudo_first_order_listed_alone_is_the_first_order_fit_divided_by_the_partner()
    {
        // A with its partner B in 20-fold excess: [A] = [A]0·exp(−k·[B]0·t) (closed-form integrated rate law, common
        // practice, no source); the pseudo-first-order law is first order in time with kk·[B]0 (docs/methods.md).
        const double b0 = 20 * A0, k2 = 0.2;
        var (t, y, w) = FirstOrderTrace(2000, k2 * b0);
        var first = IntegratedLawFitter.Fit(t, y, w, -1, A0, b0, "off", laws: ["first order"]);
        var pseudo = IntegratedLawFitter.Fit(t, y, w, -1, A0, b0, "off", laws: ["pseudo-first order"]);

        var f1 = first.Fits.Single(f => f.Chosen).Fit;
        var chosen = Assert.Single(pseudo.Fits); // the helper first-order fit is not listed
        Assert.Equal(("pseudo-first order", true), (chosen.Law, chosen.Chosen));
        Assert.Equal(f1.AicC, chosen.Fit.AicC);
        Assert.Equal(f1.Parameters[LawModel.K].Value * (1 / b0), chosen.RateConstant);
        Assert.Equal(f1.Parameters[LawModel.Y0].Value, chosen.Fit.Parameters[LawModel.Y0].Value);
        Assert.Equal("L/(mol·s)", chosen.RateConstantUnit);
        Assert.InRange(chosen.RateConstant, 0.97 * k2, 1.03 * k2);
    }

    [Fact]
    public void Zero_order_imposed_on_an_exponential_decay_is_flagged_and_not_the_headline()
    {
        // First order to 98 % conversion (k·t = 4): a straight line with a kink cannot follow it (common practice, no source).
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, 400, 2e-4, 3);
        var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default with { Laws = ["zero order"], Drift = "off" }, "run");

        Assert.Equal("zero order", r.ChosenLaw?.Law);
        Assert.True(r.ChosenLaw!.LackOfFit);
        Assert.True(r.NoIntegerLawFits);
        var w = Assert.Single(r.Warnings, x => x.Code == "imposed-law-lack-of-fit");
        Assert.Contains("zero order", w.Message);
        Assert.False(WarningTiers.IsNote(w));
        Assert.StartsWith("polynomial", r.Headline.Method);
        Assert.Contains("the imposed law shows lack of fit", r.HeadlineRule);
    }

    [Fact]
    public void The_same_trace_with_the_right_law_imposed_passes_and_says_it_was_imposed()
    {
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, 400, 2e-4, 3);
        var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default with { Laws = ["first order"], Drift = "off" }, "run");

        Assert.False(r.ChosenLaw!.LackOfFit);
        Assert.DoesNotContain(r.Warnings, x => x.Code is "imposed-law-lack-of-fit" or "no-integer-law");
        Assert.Equal("integrated law (first order) at t0, imposed by rates.laws (first order)", r.Headline.Method);
        Assert.Contains("imposed by rates.laws", r.HeadlineRule);
        // One law and no drift variant: nothing to average, so no law-choice part of the uncertainty.
        Assert.Equal(0, r.Headline.ModelStdError);
        Assert.InRange(r.Headline.Value, 0.99 * 0.01 * A0, 1.01 * 0.01 * A0);
    }

    [Fact]
    public void A_run_the_only_listed_law_does_not_apply_to_says_so_and_gets_no_law_rate()
    {
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, 400, 2e-4, 3);
        var settings = RateSettings.Default with { Laws = ["pseudo-first order"] };

        // No partner in the plan: the pseudo-first-order law needs [B]0.
        var none = RateAnalysis.Analyse(trace, -1, A0, settings, "run", null);
        Assert.Empty(none.Fits);
        Assert.Null(none.ChosenLaw);
        var w = Assert.Single(none.Warnings, x => x.Code == "imposed-laws-inapplicable");
        Assert.Contains("pseudo-first order", w.Message);
        Assert.Contains("[B]0", w.Message);
        Assert.False(WarningTiers.IsNote(w));
        Assert.DoesNotContain(none.Warnings, x => x.Code is "no-law-fit" or "no-integer-law");
        Assert.StartsWith("polynomial", none.Headline.Method);
        Assert.Contains("no law rates.laws lists applies to this run", none.HeadlineRule);

        // A partner in 2-fold excess only: the ≥ 10-fold rule of thumb (common practice, no source) is kept.
        var small = RateAnalysis.Analyse(trace, -1, A0, settings, "run", 2 * A0);
        Assert.Empty(small.Fits);
        Assert.Contains("10-fold", Assert.Single(small.Warnings, x => x.Code == "imposed-laws-inapplicable").Message);
    }

    [Fact]
    public void A_listed_law_that_does_not_apply_is_a_note_when_another_listed_law_is_fitted()
    {
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, 400, 2e-4, 3);
        var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default with { Laws = ["pseudo-first order", "first order"] }, "run", 2 * A0);
        Assert.Equal("first order", r.ChosenLaw?.Law);
        var w = Assert.Single(r.Warnings, x => x.Code == "imposed-law-skipped");
        Assert.Contains("pseudo-first order", w.Message);
        Assert.True(WarningTiers.IsNote(w));
    }

    [Theory]
    [InlineData(null, "off")]
    [InlineData(null, "on")]
    [InlineData(2 * A0, "off")]
    [InlineData(20 * A0, "off")]
    [InlineData(20 * A0, "on")]
    public void The_reason_a_law_is_not_applicable_is_given_exactly_when_it_is_not_fitted(double? partner, string drift)
    {
        // The applicability rules (docs/formats.md "[rates]" laws): the partner laws need [B]0, pseudo-first order a
        // ≥ 10-fold excess (common practice, no source), order n no drift term. The warning must match what was fitted.
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, 200, 2e-4, 3);
        var w = Enumerable.Repeat(1.0, 200).ToArray();
        foreach (var law in RateSettings.LawNames)
        {
            var fitted = IntegratedLawFitter.Fit(trace.Times, trace.Values, w, -1, A0, partner, drift, laws: [law]).Fits.Count > 0;
            var inapplicable = IntegratedLawFitter.Inapplicable([law], A0, partner, drift, endKnown: false);
            Assert.True(fitted != (inapplicable.Count == 1), $"{law}, [B]0 = {partner}, drift {drift}: fitted {fitted}, reasons {inapplicable.Count}");
        }
    }

    [Fact]
    public void Order_n_listed_alone_is_fitted_from_its_own_start()
    {
        // d[A]/dt = −k[A]^1.5: [A] = [A]0·(1 + 0.5·k·[A]0^0.5·t)^(−2) (closed-form integrated rate law, common practice, no source).
        var trace = SyntheticTrace.Make(t => A0 * Math.Pow(1 + 0.5 * 0.1 * Math.Sqrt(A0) * t, -2), 600, 400, 5e-5, 5);
        var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default with { Laws = ["order n"] }, "run");
        var nth = Assert.Single(r.Fits);
        Assert.Equal(("order n", true, true), (nth.Law, nth.Chosen, nth.Fit.Converged));
        Assert.Equal(1.5, nth.Fit.Value("n"), 0.05);
        // No law of fixed order was tried, so nothing is said about them.
        Assert.False(r.NoIntegerLawFits);
        Assert.DoesNotContain(r.Warnings, x => x.Code == "no-integer-law");
    }
}
