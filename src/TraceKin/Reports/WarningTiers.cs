using TraceKin.Analysis;
using TraceKin.Traces;

namespace TraceKin.Reports;

/// <summary>
/// Sorts what an analysis has to tell into two tiers. A problem makes a result wrong or missing until someone looks:
/// a rejected input, a rate that could not be resolved or has the wrong sign, a unit or range violation, a chosen fit
/// that did not converge. A note records a choice or a limit that leaves the results standing: an alternative that
/// was not chosen, a candidate fit that failed, an imprecise or disagreeing initial-rate estimate, a caution. Every
/// code not named as a note is a problem, so a new warning is loud until it is placed here on purpose.
/// </summary>
public static class WarningTiers
{
    /// <summary>Warning codes that are notes (folded in the report, "note:" in the log).</summary>
    public static readonly IReadOnlySet<string> NoteCodes = new HashSet<string>(StringComparer.Ordinal)
    {
        "rate-imprecise",               // the run's rate is used with its (large) standard error
        "initial-rate-disagreement",    // two estimators differ; the headline one is kept and said which
        "extrapolation-caution",        // a caution about using Ea/ΔH‡ outside the measured range
        "saturation-preferred",         // the model choice, stated in words
        "saturation-beyond-range",      // the saturation alternative not chosen (Km beyond the range)
        "saturation-fit-failed",        // a candidate series model that failed; the power law stands
        "power-law-fit-failed",         // the nonlinear fit failed; the log-log orders stand
        "global-fit-not-done",          // an optional cross-check not done
        "pair-table-truncated",         // a display limit
        "arrhenius-unweighted",         // a weighting choice
        "reference-temperature-outside",// a reparametrisation choice
        "dead-time",                    // the rate is extrapolated to the moment of mixing, as designed
        "baseline-drift",               // a drift term was fitted and is part of the result
        "product-end-unknown",          // a caution: straight-line rates of product curves whose end level is not known
        "imposed-law-skipped",          // a law rates.laws lists does not apply to the run; the other listed laws were fitted
        "imposed-law-never-fitted",     // a law rates.laws lists that these settings fit to no run; the other listed laws were fitted
    };

    public static bool IsNote(Warning w) => NoteCodes.Contains(w.Code);

    /// <summary>Every warning of a result: the series' own, the Series stage's and each run's, in that order. A run's
    /// warning placed at its export file names the run too when that file holds other runs as well (the wells of a
    /// plate export), as "A1 (plate.csv)": otherwise a list of them would say "plate.csv" for every well.</summary>
    public static IReadOnlyList<Warning> All(SeriesResult r)
    {
        var shared = r.Runs.GroupBy(x => x.Plan.File, StringComparer.Ordinal).Where(g => g.Skip(1).Any()).Select(g => g.Key).ToHashSet(StringComparer.Ordinal);
        return r.Warnings.Concat(r.Findings?.Warnings ?? [])
            .Concat(r.Runs.SelectMany(x => shared.Contains(x.Plan.File)
                ? x.Warnings.Select(w => w.Where == x.Plan.File ? w with { Where = $"{x.Id} ({w.Where})" } : w)
                : x.Warnings))
            .ToList();
    }

    /// <summary>A candidate integrated-law fit of one run that did not converge, and whether it was the chosen one.</summary>
    public sealed record UnconvergedFit(string Run, string Law, string Exit, bool Chosen)
    {
        public string Message => Chosen
            ? $"the {Law} fit did not converge ({Exit}); its numbers are not results"
            : $"the candidate {Law} fit did not converge ({Exit}) and was not chosen";
    }

    public static IReadOnlyList<UnconvergedFit> Unconverged(SeriesResult r) =>
        r.Runs.SelectMany(x => x.Rates.Fits.Where(f => !f.Fit.Converged).Select(f => new UnconvergedFit(x.Id, f.Law, f.Fit.Exit.ToString(), f.Chosen))).ToList();

    /// <summary>True when nothing is of the problem tier: no rejected input, no problem warning, no chosen fit that failed.</summary>
    public static bool Clear(SeriesResult r) =>
        r.Rejected.Count == 0 && All(r).All(IsNote) && Unconverged(r).All(f => !f.Chosen) && r.Findings?.OrderFit is not { Converged: false };
}
