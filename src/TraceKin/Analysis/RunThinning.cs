using TraceKin.Rates;
using TraceKin.Traces;

namespace TraceKin.Analysis;

/// <summary>
/// Shrinks a run's per-point arrays to a display copy: the samples kept are the min/max envelope of the concentration
/// trace (<see cref="Decimation.EnvelopeIndices"/>), and every array aligned with those samples — export channels,
/// the concentration, fitted values and residuals — is thinned at the same indices, so they stay aligned and a plot
/// drawn from the copy looks like one drawn from every point. Integrated-law candidates that were not chosen lose
/// their curves (their numbers stay). Scalars (rates, parameters, point counts, χ²) are untouched. Arrays shared
/// between traces (the time axis) stay shared.
/// </summary>
internal static class RunThinning
{
    public static RunResult Thin(RunResult run, int columns)
    {
        if (run.TracesThinned) return run;
        var c = run.Converted.Concentration;
        var keep = Decimation.EnvelopeIndices(c.Times, c.Values, columns);
        if (keep is null) return run with { TracesThinned = true };
        var n = c.Count;
        var done = new Dictionary<double[], double[]>(ReferenceEqualityComparer.Instance);

        // Arrays no longer than the concentration trace start at its first sample (fits over an early window);
        // a longer one is on another time axis and is thinned by its own envelope.
        double[] Aligned(double[] a)
        {
            if (done.TryGetValue(a, out var t)) return t;
            return done[a] = a.Length <= n ? Decimation.Pick(a, keep) : a;
        }
        Trace ThinTrace(Trace tr)
        {
            if (tr.Count <= n) return tr with { Times = Aligned(tr.Times), Values = Aligned(tr.Values) };
            var own = Decimation.EnvelopeIndices(tr.Times, tr.Values, columns);
            return own is null ? tr : tr with { Times = Decimation.Pick(tr.Times, own), Values = Decimation.Pick(tr.Values, own) };
        }

        var export = run.Export with
        {
            Channels = run.Export.Channels.Select(ThinTrace).ToArray(),
            Auxiliary = run.Export.Auxiliary.Select(ThinTrace).ToArray(),
        };
        var converted = run.Converted with { Concentration = ThinTrace(c) };
        var estimates = new Dictionary<InitialRate, InitialRate>(ReferenceEqualityComparer.Instance);
        InitialRate ThinRate(InitialRate r)
        {
            if (estimates.TryGetValue(r, out var t)) return t;
            return estimates[r] = r with { Fitted = Aligned(r.Fitted) };
        }
        var rates = run.Rates with
        {
            Estimates = run.Rates.Estimates.Select(ThinRate).ToArray(),
            Headline = ThinRate(run.Rates.Headline),
            // The chosen law's curve is kept for drawing; the other candidates keep their numbers but not their curves.
            // Residuals of a fit to bin means (a dense trace) are short already and stay as they are.
            Fits = run.Rates.Fits.Select(f => f.Chosen
                ? f with { Fitted = Aligned(f.Fitted), Fit = f.Fit with { Residuals = f.Fit.Residuals.Length == n ? Aligned(f.Fit.Residuals) : f.Fit.Residuals } }
                : f with { Fitted = [], Fit = f.Fit with { Residuals = [] } }).ToArray(),
        };
        return run with { Export = export, Converted = converted, Rates = rates, TracesThinned = true };
    }

    /// <summary>The run without per-point arrays (see <see cref="TraceRetention.None"/>).</summary>
    /// <param name="keepEveryFit">False: only the chosen fit and the fits that did not converge are kept (their notes
    /// are reported), without their parameters, and of the initial-rate estimates only the headline; the others, and
    /// the parameters, were written by the run sink.</param>
    public static RunResult Strip(RunResult run, bool keepEveryFit = true) => Strip(run, keepEveryFit, null);

    /// <param name="shared">One copy of each value that repeats between runs (texts, pairs, emptied traces), kept for
    /// the whole analysis; null: the run keeps its own.</param>
    internal static RunResult Strip(RunResult run, bool keepEveryFit, SharedValues? shared)
    {
        string Text(string t) => shared?.Text(t) ?? t;
        string? MaybeText(string? t) => t is null ? null : Text(t);
        static Trace Empty(Trace t) => t with { Times = [], Values = [] };
        IReadOnlyList<Trace> EmptyAll(IReadOnlyList<Trace> ts) => shared?.EmptyTraces(ts) ?? ts.Select(Empty).ToArray();
        IReadOnlyList<Warning> Warnings(IReadOnlyList<Warning> w) => shared is null ? w : SharedValues.Warnings(w);
        // A name equal to the run's file is the plan row's own string.
        string File(string f) => f == run.Plan.File ? run.Plan.File : f;

        var export = run.Export with
        {
            File = File(run.Export.File),
            Channels = EmptyAll(run.Export.Channels),
            Auxiliary = EmptyAll(run.Export.Auxiliary),
            Metadata = shared?.Metadata(run.Export.Metadata) ?? run.Export.Metadata,
            Detected = shared?.Pairs(run.Export.Detected) ?? run.Export.Detected,
            Warnings = Warnings(run.Export.Warnings),
        };
        var converted = run.Converted with
        {
            Concentration = shared?.EmptyTrace(run.Converted.Concentration) ?? Empty(run.Converted.Concentration),
            StdErrors = null,
            Species = Text(run.Converted.Species),
            ConstantsUsed = shared?.Pairs(run.Converted.ConstantsUsed) ?? run.Converted.ConstantsUsed,
            UncertaintyBudget = shared?.Budget(run.Converted.UncertaintyBudget) ?? run.Converted.UncertaintyBudget,
            Warnings = Warnings(run.Converted.Warnings),
        };
        // Runs converted alike (the same constants, no warning of their own) keep one conversion record between them.
        if (shared is not null) converted = shared.Conversion(converted);
        var estimates = new Dictionary<InitialRate, InitialRate>(ReferenceEqualityComparer.Instance);
        InitialRate StripRate(InitialRate r) =>
            estimates.TryGetValue(r, out var t) ? t : estimates[r] = r with { Fitted = [], Unit = Text(r.Unit), Method = Text(r.Method) };
        var headline = StripRate(run.Rates.Headline);
        var rates = run.Rates with
        {
            // Beyond the threshold the per-run tables hold every estimate; the result keeps the headline (the same object).
            Estimates = run.Rates.Estimates.Where(e => keepEveryFit || ReferenceEquals(e, run.Rates.Headline)).Select(StripRate).ToArray(),
            Headline = headline,
            // The covariances served the initial-rate errors, already computed; the reasons a fit took no part repeat
            // from run to run, so one copy of each text is kept (at 20,000 runs this is most of what a run retains).
            Fits = run.Rates.Fits.Where(f => keepEveryFit || f.Chosen || !f.Fit.Converged).Select(f => f with
            {
                Law = Text(f.Law),
                RateConstantUnit = Text(f.RateConstantUnit),
                Fitted = [],
                Fit = f.Fit with
                {
                    Model = Text(f.Fit.Model),
                    ExitDetail = Text(f.Fit.ExitDetail),
                    // Beyond the threshold no output reads a kept fit's parameters again (law-parameters.csv has them;
                    // the report lists fit by fit only up to the threshold): a quarter of what such a run holds.
                    Parameters = !keepEveryFit ? [] : shared is null ? f.Fit.Parameters : f.Fit.Parameters.Select(p => p with { Name = Text(p.Name) }).ToArray(),
                    Residuals = [],
                    Covariance = null,
                },
                ExcludedBecause = f.ExcludedBecause is { } why ? (shared?.Text(why) ?? string.Intern(why)) : null,
                // the runs test is in the per-run tables; no report or summary shows it for a kept fit
                Runs = keepEveryFit ? f.Runs : null,
            }).ToArray(),
            HeadlineRule = Text(run.Rates.HeadlineRule),
            Unresolved = MaybeText(run.Rates.Unresolved),
            Spikes = run.Rates.Spikes.Count == 0 && shared is not null ? [] : run.Rates.Spikes,
            Warnings = Warnings(run.Rates.Warnings),
        };
        return run with { Export = export, Converted = converted, Rates = rates, Warnings = Warnings(run.Warnings), TracesThinned = true };
    }
}
