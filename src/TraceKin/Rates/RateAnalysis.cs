using System.Globalization;
using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Rates;

/// <summary>
/// The Rates stage's front door: spikes, integrated-law fits and three initial-rate estimators for one concentration
/// trace, a documented headline choice, and warnings. Times are seconds from the moment of mixing (t0 = 0).
/// </summary>
public static class RateAnalysis
{
    /// <param name="concentration">[X](t) in mol/L, times in s from the moment of mixing.</param>
    /// <param name="coefficient">Stoichiometric coefficient ν of X (negative for a reactant).</param>
    /// <param name="referenceConcentration">The amount conversion is measured against (e.g. [X]0 from the plan); null = from the trace.</param>
    public static RunRates Analyse(Trace concentration, double coefficient, double? referenceConcentration, RateSettings settings, string where) =>
        Analyse(concentration, coefficient, referenceConcentration, settings, where, null);

    /// <param name="partnerConcentration">[B]0 of a second reactant, when known: enables the mixed second-order and
    /// pseudo-first-order laws.</param>
    /// <param name="endKnown">The followed species changes by exactly <paramref name="referenceConcentration"/> at complete
    /// reaction (a product whose limiting reactant's [X]0 the plan gives): the laws are fitted with that end level.</param>
    public static RunRates Analyse(Trace concentration, double coefficient, double? referenceConcentration, RateSettings settings, string where,
        double? partnerConcentration, bool endKnown = false)
    {
        var ci = CultureInfo.InvariantCulture;
        var warnings = new List<Warning>();
        var t = concentration.Times;
        var y = concentration.Values;
        var n = t.Length;
        if (n < 4)
            throw Fail.At(where, 0, 0, $"{n} samples", "at least 4 samples to estimate an initial rate", "check the export's time column");

        // Spikes: model-free candidates, confirmed against the fitted law (see SpikeFilter).
        var candidates = settings.Spikes ? SpikeFilter.Candidates(y) : new bool[n];
        var anyCandidate = Array.IndexOf(candidates, true) >= 0;
        double[] w;
        if (anyCandidate)
        {
            w = new double[n];
            for (var i = 0; i < n; i++) w[i] = candidates[i] ? 0 : 1;
        }
        else w = Ones(n);
        var selection = IntegratedLawFitter.Fit(t, y, w, coefficient, referenceConcentration, partnerConcentration, settings.Drift, endKnown, laws: settings.Laws);
        var spikes = candidates;
        if (anyCandidate && selection.Fits.FirstOrDefault(f => f.Chosen) is { } chosen && chosen.Fitted.Length == n)
        {
            double lo = double.PositiveInfinity, hi = double.NegativeInfinity;
            for (var i = 0; i < n; i++) { lo = Math.Min(lo, y[i]); hi = Math.Max(hi, y[i]); }
            var floor = 1e-9 * (hi - lo);
            var confirmed = SpikeFilter.FromFit(y, chosen.Fitted, floor);
            spikes = new bool[n];
            for (var i = 0; i < n; i++) spikes[i] = candidates[i] && confirmed[i];
            if (!spikes.AsSpan().SequenceEqual(candidates))
            {
                for (var i = 0; i < n; i++) w[i] = spikes[i] ? 0 : 1;
                selection = IntegratedLawFitter.Fit(t, y, w, coefficient, referenceConcentration, partnerConcentration, settings.Drift, endKnown, laws: settings.Laws);
            }
        }
        var spikeList = new List<Spike>();
        for (var i = 0; i < n; i++) if (spikes[i]) spikeList.Add(new Spike(i, t[i], y[i]));
        var valid = ValidSamples.Of(w);

        // Early window on the spike-free trace. Without a plan [X]0 (a product, say) the conversion is measured
        // against the chosen law's whole change |y0 − y_end| (its plateau), not against the part the trace shows.
        var chosenFit = selection.Fits.FirstOrDefault(f => f.Chosen);
        var total = referenceConcentration;
        if (total is null && chosenFit is { Fit.Converged: true } && selection.ChosenModel is not null)
        {
            var span = Math.Abs(chosenFit.Fit.Parameters[LawModel.Y0].Value - chosenFit.Fit.Parameters[LawModel.YEnd].Value);
            if (double.IsFinite(span) && span > 0) total = span;
        }
        var (end, count) = Window(t, y, valid, total, settings, minPoints: MinimumWindowPoints);
        // The estimators see the first `count` spike-free samples: the trace itself when no spike lies among them,
        // else a copy of just those (not of the whole trace).
        var (tv, yv) = valid.Prefix(t, y, count);
        var estimates = new List<InitialRate>();
        var poly = InitialRateEstimators.Polynomial(tv, yv, coefficient, count);
        var line = InitialRateEstimators.StraightLine(tv, yv, coefficient, count);
        var lawRate = chosenFit is not null && selection.ChosenModel is not null
            ? InitialRateEstimators.FromLaw(selection.ChosenModel, chosenFit, t, coefficient) : null;
        lawRate = InitialRateEstimators.Averaged(selection.Participants, lawRate, t, coefficient);
        // rates.laws: the law was imposed, not chosen among all; the method says so wherever the estimate is shown.
        var imposed = settings.Laws is { } listed ? $"imposed by rates.laws ({string.Join(", ", listed)})" : null;
        if (lawRate is not null && imposed is not null) lawRate = lawRate with { Method = $"{lawRate.Method}, {imposed}" };
        var inapplicable = IntegratedLawFitter.Inapplicable(settings.Laws, referenceConcentration, partnerConcentration, settings.Drift, endKnown);
        var noneApplies = settings.Laws is { } all && inapplicable.Count == all.Count;
        if (lawRate is not null) estimates.Add(lawRate);
        if (poly is not null) estimates.Add(poly);
        if (line is not null) estimates.Add(line);
        if (estimates.Count == 0)
            throw Fail.At(where, 0, 0, $"{count} usable points in the early window (ending {end:G4} s)", "at least 4 points to estimate an initial rate",
                "sample faster or widen rates.window_conversion");

        // Headline rule (docs/methods.md, "Initial rates and integrated laws").
        var lawUsable = lawRate is not null && chosenFit is { LackOfFit: false };
        InitialRate headline;
        string rule;
        string? unresolved = null;
        switch (settings.Method)
        {
            case "line" when line is not null:
                headline = line; rule = "straight line, as set in rates.method"; break;
            case "polynomial" when poly is not null:
                headline = poly; rule = "polynomial at t0, as set in rates.method"; break;
            case "law" when lawRate is not null:
                headline = lawRate; rule = "integrated law at t0, as set in rates.method"; break;
            default:
                (headline, rule, unresolved) = Choose(lawUsable ? lawRate : null, lawRate, chosenFit, poly, line, estimates,
                    noneApplies ? "no law rates.laws lists applies to this run" : "no integrated law converged", imposed);
                break;
        }
        // The rate of reaction (1/ν)·d[X]/dt is positive for a reaction that runs forward: a negative headline means
        // the trace runs against the stated coefficient (or an artefact won), and is never a result without a flag.
        if (!(headline.Value > 0))
        {
            unresolved ??= string.Format(ci, "the initial rate {0:G3} {1} is not positive: the trace runs against the coefficient ν = {2:G3} of the followed species",
                headline.Value, Units.RateUnit, coefficient);
            warnings.Add(new Warning("rate-wrong-sign", where, unresolved));
        }
        if (unresolved is not null)
            warnings.Add(new Warning("rate-unresolved", where, unresolved + "; this run is left out of the series fits (model.use_unresolved = true keeps it)"));
        else if (headline.StdError * FitResult.StudentT95(Math.Max(headline.Dof, 1)) > ImpreciseFraction * Math.Abs(headline.Value))
            warnings.Add(new Warning("rate-imprecise", where, string.Format(ci,
                "the 95 % interval of the initial rate is ±{0:P0} of its value (more than ±{1:P0}): more readings, less noise or a longer run would pin it",
                headline.StdError * FitResult.StudentT95(Math.Max(headline.Dof, 1)) / Math.Abs(headline.Value), ImpreciseFraction)));

        // Disagreement check between the estimates that aim at the slope at t0 itself; the straight line is a chord
        // (biased low by about half the conversion it spans), so it is compared only when it is the headline.
        foreach (var e in estimates)
        {
            if (ReferenceEquals(e, headline)) continue;
            if (ReferenceEquals(e, line)) continue;
            var combined = Math.Sqrt(e.StdError * e.StdError + headline.StdError * headline.StdError);
            if (Math.Abs(e.Value - headline.Value) > 2 * combined)
                warnings.Add(new Warning("initial-rate-disagreement", where, string.Format(ci,
                    "{0} gives {1:G4} but {2} gives {3:G4} {4}; they differ by more than twice their combined standard error ({5:G2})",
                    e.Method, e.Value, headline.Method, headline.Value, Units.RateUnit, combined)));
        }
        if (t[0] > 0)
            warnings.Add(new Warning("dead-time", where, string.Format(ci, "first sample {0:G4} s after mixing; the rate is extrapolated to t = 0", t[0])));
        if (spikeList.Count > 0)
            warnings.Add(new Warning("spikes", where, string.Format(ci, "{0} sample(s) excluded as spikes at t = {1}{2} s", spikeList.Count,
                string.Join(", ", spikeList.Take(10).Select(s => s.Time.ToString("G6", ci))), spikeList.Count > 10 ? ", …" : "")));
        if (noneApplies)
            warnings.Add(new Warning("imposed-laws-inapplicable", where, "rates.laws lists only " + Reasons(inapplicable) +
                "; so no integrated law was fitted: this run has no law-based rate or k, and its initial rate comes from the local estimators"));
        // A law the settings never fit is said once for the series (SeriesRunner), not on every run.
        else if (IntegratedLawFitter.NeverFitted(settings.Laws, settings.Drift, endKnown) is var never
                 && inapplicable.Where(x => !never.Contains(x)).ToList() is { Count: > 0 } skipped)
            warnings.Add(new Warning("imposed-law-skipped", where, "of the laws rates.laws lists, " + Reasons(skipped) +
                "; the others were fitted"));
        if (chosenFit is null)
        {
            if (!noneApplies)
                warnings.Add(new Warning("no-law-fit", where, imposed is null ? "no integrated rate law converged on this trace"
                    : $"none of the laws rates.laws lists converged on this trace ({string.Join(", ", settings.Laws!)})"));
        }
        else
        {
            if (selection.DriftChosen && chosenFit.Fit.Parameters.FirstOrDefault(p => p.Name == "drift") is { } d)
                warnings.Add(new Warning("baseline-drift", where, string.Format(ci,
                    "a linear baseline drift of {0:G3} ± {1:G2} per s was fitted (AICc lower by more than 7 with it)", d.Value, d.StdError)));
            else if (selection.DriftExcluded is { } why && selection.DriftEvidence >= 9)
                warnings.Add(new Warning("drift-not-separable", where, string.Format(ci,
                    "the residuals suggest a baseline drift (score {0:F1}), but {1}; no drift term was fitted, so a real drift would bias this rate",
                    selection.DriftEvidence, why)));
            else if (UnmodelledDrift(selection.FitTimes, selection.FitWeights, chosenFit.Fit.Residuals))
                warnings.Add(new Warning("unmodelled-drift", where, "the residuals of the late trace trend with time: the baseline may drift"));
        }
        if (imposed is not null && chosenFit is { LackOfFit: true })
        {
            // An imposed law is never reported as describing a trace it does not follow.
            var runsP = chosenFit.Runs is { } rt ? string.Format(ci, "runs test P = {0:G2}", rt.PValue) : "no runs test";
            warnings.Add(new Warning("imposed-law-lack-of-fit", where, string.Format(ci,
                "the law rates.laws imposes, {0}, does not describe this trace: its residuals show a pattern or scatter well above the trace's own noise ({1}); " +
                "its k is not a result{2}; with rates.method = \"auto\" the headline rate comes from the local estimators",
                chosenFit.Law, runsP, selection.NoIntegerLawFits ? "; no listed law fits" : "")));
        }
        else if (selection.NoIntegerLawFits && chosenFit is not null)
        {
            var nth = selection.Fits.FirstOrDefault(f => f.Law.StartsWith("order n", StringComparison.Ordinal) && f.Drift == selection.DriftChosen && f.Fit.Converged);
            var nText = nth is null ? "" : string.Format(ci, " (order n fit: n = {0:G3} ± {1:G2})", nth.Fit.Value("n"), nth.Fit["n"].StdError);
            warnings.Add(new Warning("no-integer-law", where, (imposed is null ? "no integer-order law fits this trace" : "no integer-order law rates.laws lists fits this trace")
                + ": every one shows a residual pattern or excess scatter" + nText));
        }

        return new RunRates(headline, estimates, selection.Fits, warnings)
        {
            DeadTime = t[0],
            Spikes = spikeList,
            HeadlineRule = rule,
            Unresolved = unresolved,
            NoIntegerLawFits = selection.NoIntegerLawFits,
        };
    }

    /// <summary>Fewest points in the early window the local estimators use (the window is widened to this many).</summary>
    public const int MinimumWindowPoints = 8;

    /// <summary>A headline whose 95 % interval is wider than ± this fraction of its value is flagged imprecise.</summary>
    public const double ImpreciseFraction = 0.10;

    /// <summary>Two estimates are irreconcilable when they differ by more than about three times their combined
    /// standard error (by chance 0.27 % of the time for honest errors; the 2·SE disagreement is only a note).</summary>
    internal static bool Conflict(InitialRate a, InitialRate b)
    {
        // "Three standard errors" at the confidence it has for normal errors (two-sided 0.27 %), taken from Student's t
        // with the fewer degrees of freedom of the two: a polynomial over a dozen readings knows its own error only
        // roughly, and |t₈| > 3 happens 1.7 % of the time.
        var dof = Math.Max(1, Math.Min(a.Dof, b.Dof));
        var limit = MathNet.Numerics.Distributions.StudentT.InvCDF(0, 1, dof, 1 - 0.00135);
        return Math.Abs(a.Value - b.Value) > limit * Math.Sqrt(a.StdError * a.StdError + b.StdError * b.StdError);
    }

    /// <summary>
    /// The "auto" headline: the integrated-law estimate when it is usable (converged, no lack of fit) and does not
    /// conflict with the polynomial at t0 (the local estimate that aims at t0 itself); without a usable law, the
    /// polynomial, unless it conflicts with the straight line. A conflict leaves the run unresolved: the estimate is
    /// still reported, flagged, and the run is left out of the series fits. The straight line and the polynomial
    /// share their window, so their agreement with each other is no evidence against the law.
    /// </summary>
    /// <param name="noLaw">Why there is no law estimate, when there is none.</param>
    /// <param name="imposed">What rates.laws imposes, or null.</param>
    private static (InitialRate Headline, string Rule, string? Unresolved) Choose(InitialRate? law, InitialRate? anyLaw, LawFit? chosen,
        InitialRate? poly, InitialRate? line, List<InitialRate> estimates, string noLaw, string? imposed)
    {
        var ci = CultureInfo.InvariantCulture;
        string Describe(InitialRate e) => string.Format(ci, "{0} {1:G4} ± {2:G2}", e.Method, e.Value, e.StdError);
        if (law is not null)
        {
            var lawName = law.Method.StartsWith("integrated laws", StringComparison.Ordinal) ? "integrated laws averaged by Akaike weight" : $"integrated law ({chosen!.Law})";
            var at = imposed is null ? "at t0" : $"at t0, {imposed}";
            if (poly is null || !Conflict(law, poly))
                return (law, $"{lawName} {at}: converged, residuals pass the runs test, the polynomial at t0 agrees within 3 standard errors", null);
            return (law, $"{lawName} {at}, unresolved", "the integrated-law and polynomial estimates differ by more than three combined standard errors: " +
                string.Join("; ", estimates.Select(Describe)));
        }
        if (poly is not null)
        {
            var why = anyLaw is null ? noLaw : imposed is null ? "the chosen law shows lack of fit" : "the imposed law shows lack of fit";
            if (line is null || !Conflict(poly, line)) return (poly, $"polynomial at t0: {why}", null);
            return (poly, $"polynomial at t0 ({why}), unresolved", $"{why}, and the local estimates differ by more than three combined standard errors: " +
                string.Join("; ", estimates.Select(Describe)));
        }
        return (estimates[0], $"{estimates[0].Method}: the only estimate available", null);
    }

    /// <summary>"first law, which …; second law, which …" for the laws rates.laws lists that a run cannot be fitted with.</summary>
    private static string Reasons(IReadOnlyList<(string Law, string Why)> laws) =>
        string.Join("; ", laws.Select(l => $"{l.Law}, which does not apply to this run: {l.Why}"));

    [ThreadStatic] private static double[]? _ones;

    /// <summary>Unit weights for n samples, shared by the runs a thread analyses (traces in a batch mostly have one
    /// length): a fresh 80 kB array per 10,000-point run only fed the garbage collector. Read only; the weights of a
    /// trace with excluded samples get their own array.</summary>
    private static double[] Ones(int n)
    {
        var ones = _ones;
        if (ones is null || ones.Length != n)
        {
            ones = new double[n];
            Array.Fill(ones, 1.0);
            _ones = ones;
        }
        return ones;
    }

    /// <summary>Residuals over the last third of the trace regressed on time; |slope| &gt; 4·SE flags a drift the model misses.</summary>
    private static bool UnmodelledDrift(double[] t, double[] w, double[] residuals)
    {
        if (residuals.Length != t.Length) return false;
        var tt = new List<double>(); var rr = new List<double>();
        for (var i = 2 * t.Length / 3; i < t.Length; i++) if (w[i] > 0) { tt.Add(t[i]); rr.Add(residuals[i]); }
        if (tt.Count < 8) return false;
        var f = LinearLeastSquares.Line(tt.ToArray(), rr.ToArray());
        return f.Converged && Math.Abs(f.Parameters[1].Value) > 4 * f.Parameters[1].StdError;
    }

    /// <summary>The early window over the spike-free samples: until |[X] − [X]first| reaches the conversion fraction
    /// of the reference amount. Count and end refer to the valid samples in order (read in place, not copied).</summary>
    private static (double End, int Count) Window(double[] times, double[] v, ValidSamples valid, double? reference, RateSettings s, int minPoints)
    {
        var n = valid.Count;
        if (s.WindowEnd is { } fixedEnd)
        {
            var k = -1;
            for (int i = 0, j = 0; i < times.Length; i++)
            {
                if (!valid.Has(i)) continue;
                if (times[i] > fixedEnd) { k = j; break; }
                j++;
            }
            var cnt = k < 0 ? n : Math.Max(Math.Min(minPoints, n), k);
            return (times[valid.Index(cnt - 1)], cnt);
        }
        // Start level from the mean of the first few points (robust to one noisy first sample).
        var head = Math.Min(5, n);
        var start = 0.0;
        for (int i = 0, j = 0; j < head; i++) if (valid.Has(i)) { start += v[i]; j++; }
        start /= head;
        var total = reference is > 0 ? reference.Value : Math.Abs(v[valid.Index(n - 1)] - start);
        var limit = s.WindowConversion * total;
        var count = n;
        for (int i = 0, j = 0; i < v.Length; i++)
        {
            if (!valid.Has(i)) continue;
            if (Math.Abs(v[i] - start) >= limit) { count = j + 1; break; }
            j++;
        }
        count = Math.Max(Math.Min(minPoints, n), count);
        return (times[valid.Index(count - 1)], count);
    }

    /// <summary>The samples with weight &gt; 0, in order, without copying them: <see cref="Index"/> maps the j-th valid
    /// sample to its index in the trace (the identity when none is excluded).</summary>
    private readonly struct ValidSamples
    {
        private readonly double[] _w;
        private readonly int[]? _excluded; // indices with weight 0, ascending; null when there are none

        private ValidSamples(double[] w, int[]? excluded, int count) { _w = w; _excluded = excluded; Count = count; }

        public int Count { get; }

        public static ValidSamples Of(double[] w)
        {
            List<int>? excluded = null;
            for (var i = 0; i < w.Length; i++) if (!(w[i] > 0)) (excluded ??= []).Add(i);
            return new ValidSamples(w, excluded?.ToArray(), w.Length - (excluded?.Count ?? 0));
        }

        public bool Has(int i) => _w[i] > 0;

        /// <summary>Index in the trace of the j-th valid sample (0-based).</summary>
        public int Index(int j)
        {
            if (_excluded is null) return j;
            // j, moved on past every excluded sample at or before the position reached so far.
            var i = j;
            foreach (var e in _excluded)
            {
                if (e > i) break;
                i++;
            }
            return i;
        }

        /// <summary>The first <paramref name="count"/> valid samples: spans of the trace when none before them is
        /// excluded, else copies of just those.</summary>
        public (double[] T, double[] Y) Prefix(double[] t, double[] y, int count)
        {
            if (_excluded is null || _excluded[0] >= count) return (t, y);
            var tv = new double[count]; var yv = new double[count];
            for (int i = 0, k = 0; k < count; i++) if (_w[i] > 0) { tv[k] = t[i]; yv[k] = y[i]; k++; }
            return (tv, yv);
        }
    }
}
