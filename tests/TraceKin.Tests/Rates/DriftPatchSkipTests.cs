using TraceKin.Rates;

namespace TraceKin.Tests.Rates;

/// <summary>
/// With <c>rates.drift = "auto"</c> the other laws' drift variants take part in the choice only when the best drift-free
/// law is itself improved by its drift term by more than 7 AICc; otherwise they are excluded as patches. They are then
/// not fitted at all. These tests check, on seeded traces that run into their tail (where drift variants are fitted),
/// that leaving them out changes no number of any fit that remains, nor the choice, nor the run's reason for excluding
/// drift, and that the saving does happen. Traces are invented from closed-form laws (common practice, no source).
/// </summary>
public sealed class DriftPatchSkipTests
{
    private sealed record Case(string Name, double[] T, double[] Y, double? A0, double? Partner);

    private static IEnumerable<Case> Cases()
    {
        var seed = 4100;
        foreach (var points in new[] { 60, 200, 2000 })
            foreach (var drift in new[] { 0.0, 0.03, 0.08 })
            {
                const double a0 = 1e-3, k1 = 0.02;
                var first = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(k1, a0, t), 300, points, 4e-6, ++seed, driftFraction: drift);
                yield return new Case($"first {points} drift {drift}", first.Times, first.Values, a0, null);
                var second = SyntheticTrace.Make(t => SyntheticTrace.SecondOrder(60, a0, t), 300, points, 4e-6, ++seed, driftFraction: drift);
                yield return new Case($"second {points} drift {drift}", second.Times, second.Values, a0, null);
                // A + B with B in 100-fold excess, as in a screening series: pseudo-first and mixed second order compete.
                var mixed = SyntheticTrace.Make(t => SyntheticTrace.MixedSecondOrder(0.2, 1e-3, 0.1, t), 300, points, 4e-6, ++seed, driftFraction: drift);
                yield return new Case($"mixed {points} drift {drift}", mixed.Times, mixed.Values, 1e-3, 0.1);
                var noPlan = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(k1, a0, t), 300, points, 4e-6, ++seed, driftFraction: drift);
                yield return new Case($"first, no [A]0, {points} drift {drift}", noPlan.Times, noPlan.Values, null, null);
            }
    }

    [Fact]
    public void Leaving_out_the_drift_variants_that_could_only_be_excluded_changes_no_reported_number()
    {
        int skipped = 0, cases = 0;
        foreach (var c in Cases())
        {
            var w = Enumerable.Repeat(1.0, c.T.Length).ToArray();
            var every = IntegratedLawFitter.Fit(c.T, c.Y, w, -1, c.A0, c.Partner, "auto", fitEveryDrift: true);
            var lean = IntegratedLawFitter.Fit(c.T, c.Y, w, -1, c.A0, c.Partner, "auto");
            cases++;
            foreach (var f in lean.Fits)
            {
                var g = every.Fits.SingleOrDefault(x => x.Law == f.Law);
                Assert.True(g is not null, $"{c.Name}: {f.Law} is not among the fits with every drift variant");
                Same(c.Name, g!, f);
            }
            var missing = every.Fits.Where(g => lean.Fits.All(f => f.Law != g.Law)).ToList();
            foreach (var g in missing)
            {
                Assert.True(g.Drift, $"{c.Name}: {g.Law} is missing but has no drift term");
                Assert.False(g.Chosen, $"{c.Name}: the chosen fit {g.Law} is missing");
                Assert.True(double.IsNaN(g.AkaikeWeight) || !g.Fit.Converged, $"{c.Name}: {g.Law} took part in the choice yet was left out");
                Assert.NotNull(g.ExcludedBecause ?? (g.Fit.Converged ? null : "not converged"));
            }
            if (missing.Count > 0) skipped++;
            Assert.Equal(every.DriftExcluded, lean.DriftExcluded);
            Assert.Equal(every.DriftEvidence, lean.DriftEvidence);
            Assert.Equal(every.DriftChosen, lean.DriftChosen);
            Assert.Equal(every.NoIntegerLawFits, lean.NoIntegerLawFits);
            Assert.Equal(every.Participants.Select(p => p.Fit.Law), lean.Participants.Select(p => p.Fit.Law));
        }
        // The saving is real: most traces that reach their tail leave some drift variant out.
        Assert.True(skipped >= cases / 3, $"{skipped} of {cases} traces left a drift variant out");
    }

    private static void Same(string name, LawFit a, LawFit b)
    {
        var where = $"{name}: {a.Law}";
        Assert.True(a.Chosen == b.Chosen, where + " chosen");
        Assert.True(a.Fit.Exit == b.Fit.Exit, where + " exit");
        Assert.True(a.Fit.Parameters.Select(p => p.Value).SequenceEqual(b.Fit.Parameters.Select(p => p.Value)), where + " parameters");
        Assert.True(a.Fit.Parameters.Select(p => p.StdError).SequenceEqual(b.Fit.Parameters.Select(p => p.StdError)), where + " standard errors");
        Assert.True(a.Fit.ChiSquare.Equals(b.Fit.ChiSquare), where + " chi-square");
        Assert.True(a.DeltaAicc.Equals(b.DeltaAicc), where + " ΔAICc");
        Assert.True(a.AkaikeWeight.Equals(b.AkaikeWeight), where + " Akaike weight");
        Assert.True(a.LackOfFit == b.LackOfFit, where + " lack of fit");
        Assert.True(a.ExcludedBecause == b.ExcludedBecause, where + $" excluded because: '{a.ExcludedBecause}' against '{b.ExcludedBecause}'");
    }
}
