using TraceKin.Fitting;

namespace TraceKin.Rates;

/// <summary>What the integrated-law step found: every fit tried, and whether any integer law describes the trace.
/// <see cref="FitTimes"/> and <see cref="FitWeights"/> are the points the laws were fitted to (bin means and their
/// counts for a dense trace; else the samples and their weights), aligned with each fit's residuals.</summary>
public sealed record LawSelection(IReadOnlyList<LawFit> Fits, LawModel? ChosenModel, bool DriftChosen, bool NoIntegerLawFits,
    double[] FitTimes, double[] FitWeights)
{
    /// <summary>Every converged fit that took part in the choice, with its model (the chosen one as reported).</summary>
    public IReadOnlyList<(LawModel Model, LawFit Fit)> Participants { get; init; } = [];
    /// <summary>Why a drift term took no part in the choice ("auto" mode), or null when it could.</summary>
    public string? DriftExcluded { get; init; }
    /// <summary>Score statistic for a drift on the best drift-free fit (≈ χ²(1) without drift) when one was excluded.</summary>
    public double DriftEvidence { get; init; } = double.NaN;
}

/// <summary>
/// Fits every candidate integrated law (with and, if asked, without a linear drift term) to a whole trace and picks
/// one by AICc (Burnham &amp; Anderson 2002, "Model Selection and Multimodel Inference", §2.4–2.6; Akaike weights
/// eq. 2.14). A law's drift variant is preferred only when its AICc is lower by more than 7 (ibid. §2.6: Δ = 4–7 means
/// considerably less support for the simpler model); order n only when it beats every integer law by more than 10
/// (with the end level known: whenever it converged, see docs/methods.md).
/// Fits that did not converge take no part in the choice.
/// </summary>
internal static class IntegratedLawFitter
{
    /// <summary>Candidate laws for a trace: integer orders always; pseudo-first and mixed second order when the partner's [B]0 is known.
    /// With <paramref name="listed"/> (rates.laws) only the laws it names, each under the same rule (order n is not among
    /// these: it is fitted after them).</summary>
    public static IReadOnlyList<RateLaw> Candidates(double? a0, double? partner, IReadOnlyList<string>? listed = null)
    {
        var laws = new List<RateLaw> { new ZeroOrderLaw(), new FirstOrderLaw(), new SecondOrderLaw() };
        if (partner is > 0)
        {
            laws.Add(new MixedSecondOrderLaw());
            // Pseudo-first order needs a large excess of the partner: ≥ 10-fold (common practice, no source).
            if (PseudoFirstApplies(a0, partner)) laws.Add(new PseudoFirstOrderLaw(partner.Value));
        }
        if (listed is not null) laws.RemoveAll(l => !Lists(listed, l.Name));
        return laws;
    }

    private static bool PseudoFirstApplies(double? a0, double? partner) => a0 is > 0 && partner is > 0 && partner.Value >= 10 * a0.Value;

    private static bool Lists(IReadOnlyList<string>? listed, string law) => listed is null || listed.Contains(law, StringComparer.Ordinal);

    /// <summary>
    /// The laws rates.laws lists that these settings never fit, whatever the run, each with the reason (empty without a
    /// list): the partner laws are not fitted when rates.limiting_reactant fixes the end level, and order n is fitted
    /// only without a drift term, so never with rates.drift = "on".
    /// </summary>
    public static IReadOnlyList<(string Law, string Why)> NeverFitted(IReadOnlyList<string>? listed, string drift, bool endKnown)
    {
        if (listed is null) return [];
        const string fixedEnd = "the end level is fixed by rates.limiting_reactant (a product curve), and the partner laws are then not fitted";
        var result = new List<(string, string)>();
        foreach (var law in listed)
        {
            string? why = law switch
            {
                "mixed second order" or "pseudo-first order" when endKnown => fixedEnd,
                "order n" when drift == "on" => "order n is fitted only without a drift term, and rates.drift = \"on\" fits drift variants only",
                _ => null,
            };
            if (why is not null) result.Add((law, why));
        }
        return result;
    }

    /// <summary>
    /// The laws rates.laws lists that this run cannot be fitted with, each with the reason (empty without a list): those
    /// the settings never fit (<see cref="NeverFitted"/>), then by the run's plan: the partner laws need the plan's
    /// [B]0, pseudo-first order a ≥ 10-fold excess of B.
    /// </summary>
    public static IReadOnlyList<(string Law, string Why)> Inapplicable(IReadOnlyList<string>? listed, double? a0, double? partner, string drift, bool endKnown)
    {
        if (listed is null) return [];
        var ci = System.Globalization.CultureInfo.InvariantCulture;
        const string noPartner = "it needs the partner's [B]0 from the plan (the followed reactant's own [X]0 and exactly one other species with a positive [X]0)";
        var never = NeverFitted(listed, drift, endKnown);
        var result = new List<(string, string)>();
        foreach (var law in listed)
        {
            string? why = never.FirstOrDefault(x => x.Law == law).Why ?? law switch
            {
                "mixed second order" when !(partner > 0) => noPartner,
                "pseudo-first order" when !(partner > 0) => noPartner,
                "pseudo-first order" when !(a0 > 0) => "it needs the followed reactant's own [A]0 from the plan, to judge the partner's excess",
                "pseudo-first order" when !PseudoFirstApplies(a0, partner) => string.Format(ci,
                    "it needs the partner in at least 10-fold excess, [B]0 ≥ 10·[A]0, and here [B]0/[A]0 = {0:G3}", partner!.Value / a0!.Value),
                _ => null,
            };
            if (why is not null) result.Add((law, why));
        }
        return result;
    }

    /// <param name="weights">0 for excluded samples (spikes), else 1.</param>
    /// <param name="drift">"auto", "off" or "on".</param>
    /// <param name="endKnown">The whole change is known (|y0 − y_end| = <paramref name="a0"/>, e.g. a product's end level
    /// from its limiting reactant's [X]0): every law is fitted with the end level following the start level.</param>
    /// <param name="fitEveryDrift">Fit the other laws' drift variants even where they can only be excluded (for tests that
    /// check the saving changes no number).</param>
    /// <param name="laws">rates.laws: only these laws are fitted and compared (null: every candidate). Pseudo-first order
    /// listed without first order is still the first-order fit re-expressed: that fit is made as a helper and then
    /// dropped, so the pseudo-first-order row has the numbers it has in an unrestricted run.</param>
    public static LawSelection Fit(double[] t, double[] y, double[] weights, double nu, double? a0, double? partner, string drift, bool endKnown = false,
        bool fitEveryDrift = false, IReadOnlyList<string>? laws = null)
    {
        if (endKnown && !(a0 > 0)) throw new ArgumentException("a known end needs a positive [A]0", nameof(a0));
        if (endKnown) partner = null;
        var candidates = Candidates(a0, partner, laws);
        // A first-order fit that is not listed but carries a listed pseudo-first order: fitted, screened and dropped.
        var helperFirst = laws is not null && candidates.Any(l => l is PseudoFirstOrderLaw) && !Lists(laws, "first order");
        if (helperFirst) candidates = [new FirstOrderLaw(), .. candidates];
        var noise = DifferenceNoise(t, y, weights);
        var tAll = t;
        // The laws are compared on coarse bins; the chosen one is then refitted on the finer bins its numbers are
        // reported from (each level only where the bins keep the curve: see Bin).
        var fine = Bin(t, y, weights, noise, MaxFitPoints) ?? LongTraceBins(t, y, weights, noise);
        var coarse = fine is null
            ? Bin(t, y, weights, noise, ShortComparePoints, checkCurvature: false, minValid: 2 * ShortComparePoints)
            : Bin(t, y, weights, noise, ComparePoints, checkCurvature: false);
        var (tFine, yFine, wFine, sFine) = fine is { } fb ? (fb.T, fb.Y, fb.W, (double[]?)fb.S) : (t, y, weights, null);
        double[]? spread = null;
        if ((coarse ?? fine) is { } b) (t, y, weights, spread) = b;
        // Fits on the comparison bins stop at a looser tolerance (χ² settled to 1e-10 relative, steps to 1e-5 of the
        // parameters: far inside their standard errors); the fit that is reported is converged to 1e-10.
        var tol = coarse is null ? 1e-10 : CompareTolerance;
        // The trace's ends and early slope, which every law's start uses: taken once for the points the laws are compared on.
        var ends = Ends(t, y, weights);
        var families = drift switch { "off" => new[] { false }, "on" => [true], _ => [false, true] };
        var all = new List<(LawModel Model, FitResult Fit)>();
        var plainFits = new Dictionary<string, (LawModel Model, FitResult Fit)>(StringComparer.Ordinal);
        // Each pseudo-first-order fit re-expressed from a helper first-order fit (rates.laws without first order), by that fit.
        var pseudoSources = new Dictionary<FitResult, (LawModel Model, FitResult Fit)>(ReferenceEqualityComparer.Instance);
        string? driftExcluded = null;
        var skippedPatch = false;
        foreach (var withDrift in families)
        {
            if (withDrift && drift == "auto" && DriftSeparability(plainFits.Values, tAll) is { } why)
            {
                driftExcluded = why;
                continue;
            }
            var integer = new List<(LawModel, FitResult)>();
            (LawModel Model, FitResult Fit)? firstOrder = null;
            var screen = withDrift && drift == "auto";
            // In "auto" mode the other laws' drift variants take part only when the best drift-free law is itself
            // improved by its drift term by more than 7 AICc (see below, where the choice is made). That law's drift
            // variant is therefore fitted first; when it is not supported the others would only be fitted to be
            // excluded as patches, and are not fitted at all.
            string? leadLaw = null;
            (LawModel Model, FitResult Fit)? leadFit = null;
            var othersCompete = true;
            var partnerRules = false;
            if (screen && !fitEveryDrift)
            {
                partnerRules = NeglectsPartner(all, partner, weights, noise);
                var lead = BestPlain(all, r => partnerRules && AssumesBConstant(r.Model.Law));
                if (lead.Fit is not null)
                {
                    leadLaw = lead.Model.Law.Name;
                    leadFit = DriftVariant(lead.Model.Law, screen: true);
                    othersCompete = leadFit is { } lf && lf.Fit.Converged && !(DriftCorrelation(lf.Model, lf.Fit) > MaxDriftCorrelation)
                        && lf.Fit.AicC < lead.Fit.AicC - 7;
                }
            }
            (LawModel Model, FitResult Fit)? DriftVariant(RateLaw law, bool screen)
            {
                if (!(plainFits.TryGetValue(law.Name, out var plain) && plain.Fit.Converged))
                    return FitOne(law, t, y, weights, nu, a0, partner, true, null, spread: spread, tolerance: tol, endKnown: endKnown, ends: ends);
                if (screen && DriftScore(plain.Model, plain.Fit, t, weights) < DriftScreenScore) return null;
                // The drift variant starts where the drift-free fit ended, with no drift; from scratch if that fails.
                var warm = plain.Fit.Parameters.Select(p => p.Value).Append(0.0).ToArray();
                var fixedP = plain.Fit.Parameters.Select(p => !p.Varied).Append(false).ToArray();
                (LawModel Model, FitResult Fit) r = FitOne(law, t, y, weights, nu, a0, partner, true, null, warm, fixedP, spread, tol, endKnown, ends);
                if (!r.Fit.Converged) r = FitOne(law, t, y, weights, nu, a0, partner, true, null, spread: spread, tolerance: tol, endKnown: endKnown, ends: ends);
                return r;
            }
            foreach (var law in candidates)
            {
                (LawModel Model, FitResult Fit) r;
                if (law is PseudoFirstOrderLaw pf && firstOrder is { } fo)
                {
                    r = AsPseudoFirstOrder(pf, fo, t, nu, a0, withDrift);
                    if (helperFirst) pseudoSources[r.Fit] = fo;
                }
                else if (law is PseudoFirstOrderLaw && screen && plainFits.ContainsKey(new FirstOrderLaw().Name))
                    continue; // its first-order twin was screened out (or not fitted)
                else if (screen && law.Name == leadLaw)
                {
                    if (leadFit is not { } lf) continue;
                    r = lf;
                }
                else if (screen && !othersCompete)
                {
                    // Not fitted: it could only patch another law's shape. The reason is still reported whenever a
                    // patch would have been excluded (a variant past the screen that the partner rule leaves in).
                    if (!(partnerRules && AssumesBConstant(law)) && law is not PseudoFirstOrderLaw
                        && (!(plainFits.TryGetValue(law.Name, out var plain) && plain.Fit.Converged) || DriftScore(plain.Model, plain.Fit, t, weights) >= DriftScreenScore))
                        skippedPatch = true;
                    continue;
                }
                else if (withDrift && plainFits.ContainsKey(law.Name))
                {
                    if (DriftVariant(law, screen) is not { } dv) continue;
                    r = dv;
                }
                else r = FitOne(law, t, y, weights, nu, a0, partner, withDrift, null, spread: spread, tolerance: tol, endKnown: endKnown, ends: ends);
                if (law is FirstOrderLaw) firstOrder = r;
                if (!withDrift) plainFits[law.Name] = r;
                if (!(helperFirst && law is FirstOrderLaw)) integer.Add(r);
                all.Add(r);
            }
            // Order n starts from the best-fitting integer order (ones of one species only), among the listed ones when
            // rates.laws names them (else from its own start). It is not combined with a drift term: n and a drift trade
            // off against each other and together overfit noise.
            if (withDrift || !Lists(laws, "order n")) continue;
            var seed = integer.Where(r => r.Item2.Converged && r.Item1.Law is ZeroOrderLaw or FirstOrderLaw or SecondOrderLaw)
                .OrderBy(r => r.Item2.AicC).FirstOrDefault();
            // With the end known, the integer laws differ only in the curvature they assume: when their AICc lie within 2
            // of each other the trace cannot tell its order, order n would only crawl along its flat valley, and the
            // Akaike-weighted integer laws already carry that spread. (With rates.laws listing fewer than two of them there
            // is nothing to compare, and order n, listed, is fitted.)
            if (endKnown && (laws is null || integer.Count(r => r.Item1.Law is ZeroOrderLaw or FirstOrderLaw or SecondOrderLaw) >= 2)
                && CannotTellOrder(integer)) continue;
            all.Add(FitOne(new NthOrderLaw(), t, y, weights, nu, a0, partner, withDrift, seed.Item2 is null ? null : (seed.Item1, seed.Item2), spread: spread, tolerance: tol, endKnown: endKnown, ends: ends));
        }

        // The helper first-order fits leave; their pseudo-first-order twins (the same curves) stay.
        if (helperFirst) all.RemoveAll(r => r.Model.Law is FirstOrderLaw);

        // Per law, the drift variant only with clear evidence (AICc lower by more than 7: Burnham & Anderson 2002, §2.6,
        // give Δ = 4–7 as "considerably less support", so the drift-free model is dropped only beyond that); then the integer law with the
        // lowest AICc; order n only when it beats that by more than 10 (Burnham &amp; Anderson 2002, §2.6: Δ &gt; 10 leaves
        // essentially no support for the worse model). Akaike weights over every converged fit.
        // A drift term that trades off against the rate parameters cannot be told apart from the reaction: such a fit
        // takes no part in the choice (with "auto"; "on" keeps it and the correlation is reported).
        var entangled = drift == "auto"
            ? all.Where(r => r.Model.Drift && r.Fit.Converged && DriftCorrelation(r.Model, r.Fit) > MaxDriftCorrelation).Select(r => r.Fit).ToHashSet()
            : new HashSet<FitResult>();
        if (entangled.Count > 0 && driftExcluded is null)
            driftExcluded = string.Format(System.Globalization.CultureInfo.InvariantCulture,
                "a drift term correlates with the initial slope (|r| up to {0:F3}, more than {1}), so it cannot be told apart from the reaction",
                entangled.Max(f => DriftCorrelation(all.First(r => ReferenceEquals(r.Fit, f)).Model, f)), MaxDriftCorrelation);
        // With the partner's [B]0 in the plan, the mixed second-order law follows B's depletion; first order (and
        // pseudo-first order) assume [B] constant and second order [B] = [A], so their slope at t0 is biased by about
        // the depletion over the trace whenever they cannot be told apart from it (simulated series: −1 % for first
        // order at a 6–100-fold excess). They are kept as fits, but the choice and the average go to the law that uses
        // what the experimenter gave, as long as it converged without lack of fit.
        string? neglectsPartner = null;
        if (NeglectsPartner(all, partner, weights, noise))
        {
            neglectsPartner = "the plan gives [B]0, and the mixed second-order law, which follows B's depletion and holds first order ([B]0 ≫ [A]0) and second order ([B]0 = [A]0) as its limits, describes the trace";
            foreach (var r in all.Where(r => AssumesBConstant(r.Model.Law) && r.Fit.Converged)) entangled.Add(r.Fit);
        }
        // A drift is a property of the instrument's baseline, not a patch for a law of the wrong shape (second order +
        // drift can mimic an exponential): other laws' drift variants compete only when the best drift-free law itself
        // is improved by its drift term by more than 7 AICc.
        if (drift == "auto")
        {
            var bestPlain = BestPlain(all, r => entangled.Contains(r.Fit));
            var itsDrift = bestPlain.Fit is null ? default
                : all.FirstOrDefault(r => r.Model.Drift && r.Model.Law.Name == bestPlain.Model.Law.Name && r.Fit.Converged && !entangled.Contains(r.Fit));
            var supported = itsDrift.Fit is not null && itsDrift.Fit.AicC < bestPlain.Fit!.AicC - 7;
            if (!supported)
            {
                // The best law's own drift variant stays in (its Akaike weight then shares the estimate: a weak drift
                // is half-believed rather than ignored); the other laws' drift variants are out.
                var patches = all.Where(r => r.Model.Drift && r.Fit.Converged && !entangled.Contains(r.Fit) && !ReferenceEquals(r.Fit, itsDrift.Fit)).ToList();
                foreach (var r in patches) entangled.Add(r.Fit);
                if ((patches.Count > 0 || skippedPatch) && driftExcluded is null && bestPlain.Fit is not null)
                    driftExcluded = $"a drift term does not improve the best drift-free law ({bestPlain.Model.Law.Name}) by more than 7 AICc, so it would only patch another law's shape";
            }
        }
        var converged = all.Where(r => r.Fit.Converged && !entangled.Contains(r.Fit)).ToList();
        var minAll = converged.Select(r => r.Fit.AicC).DefaultIfEmpty(double.PositiveInfinity).Min();
        var sumW = converged.Sum(r => Math.Exp(-(r.Fit.AicC - minAll) / 2));
        var picks = converged.GroupBy(r => r.Model.Law.Name).Select(g =>
        {
            var plain = g.FirstOrDefault(r => !r.Model.Drift);
            var withDrift = g.FirstOrDefault(r => r.Model.Drift);
            if (plain.Fit is null) return withDrift;
            if (withDrift.Fit is null) return plain;
            return withDrift.Fit.AicC < plain.Fit.AicC - 7 ? withDrift : plain;
        }).ToList();
        var bestInteger = picks.Where(r => r.Model.Law is not NthOrderLaw).OrderBy(r => r.Fit.AicC).FirstOrDefault();
        var nth = picks.FirstOrDefault(r => r.Model.Law is NthOrderLaw);
        var chosenPair = bestInteger.Fit is null ? nth
            : nth.Fit is not null && (endKnown || nth.Fit.AicC < bestInteger.Fit.AicC - 10) ? nth : bestInteger;

        // Only the chosen law's curve is evaluated at every sample (for the plot and the spike check); the others keep
        // their numbers.
        var fits = new List<LawFit>();
        var participants = new List<(LawModel, LawFit)>();
        var chosenModel = chosenPair.Model;
        foreach (var (m, f) in all)
        {
            var chosen = chosenPair.Fit is not null && ReferenceEquals(f, chosenPair.Fit);
            if (!chosen)
            {
                var other = Describe(m, f, false, minAll, sumW, weights, noise);
                if (entangled.Contains(f))
                    other = other with { DeltaAicc = double.NaN, AkaikeWeight = double.NaN,
                        ExcludedBecause = AssumesBConstant(m.Law) && neglectsPartner is not null ? neglectsPartner : driftExcluded };
                // Pseudo-first order is the first-order curve re-expressed: one curve, counted once in the average.
                // Order n joins the average only when it is the chosen law: its extra exponent extrapolates the slope
                // at t0 its own way, and where it is not clearly better (by 10 AICc) it only adds a bias. With the end
                // known it is the chosen law whenever it converged (its exponent is then the curvature, measured), and
                // the integer laws, which each assume a curvature, leave the average to it.
                // (Without its first-order twin, rates.laws leaving it out, pseudo-first order is that curve's one count.)
                else if (f.Converged && (m.Law is not PseudoFirstOrderLaw || helperFirst) && m.Law is not NthOrderLaw && !(endKnown && nth.Fit is not null)) participants.Add((m, other));
                fits.Add(other);
                continue;
            }
            var (cm, cf, cw) = (m, f, weights);
            if (coarse is not null)
            {
                // Refitted on the fine bins from where the comparison left it; its evidence (ΔAICc, Akaike weight)
                // stays that of the comparison.
                // A pseudo-first order re-expressed from a helper first-order fit is refitted as that first-order fit and
                // re-expressed again, so its numbers are those of the first-order law's reported fit, k divided by [B]0.
                var twin = m.Law is PseudoFirstOrderLaw && pseudoSources.TryGetValue(f, out var source) ? source : ((LawModel Model, FitResult Fit)?)null;
                var (fromModel, fromFit) = twin ?? (m, f);
                var refit = FitOne(fromModel.Law, tFine, yFine, wFine, nu, a0, partner, m.Drift, null,
                    fromFit.Parameters.Select(p => p.Value).ToArray(), fromFit.Parameters.Select(p => !p.Varied).ToArray(), sFine, endKnown: endKnown);
                if (twin is not null && refit.Item2.Converged) refit = AsPseudoFirstOrder((PseudoFirstOrderLaw)m.Law, refit, tFine, nu, a0, m.Drift);
                if (refit.Item2.Converged) (cm, cf, cw) = (refit.Item1, refit.Item2, wFine);
            }
            var described = Describe(cm, cf, true, minAll, sumW, cw, noise);
            if (cf.Parameters.All(p => double.IsFinite(p.Value)))
            {
                // Evaluated at every sample only when something asks for it (a plot, the spike check).
                var (law, times, withDrift) = (cm.Law, tAll, cm.Drift);
                var values = cf.Parameters.Select(p => p.Value).ToArray();
                described = described with
                {
                    FittedBy = () =>
                    {
                        var fitted = new double[times.Length];
                        new LawModel(law, times, nu, a0, withDrift, knownEnd: endKnown).Evaluate(values, fitted);
                        return fitted;
                    },
                };
            }
            if (!ReferenceEquals(cf, f))
            {
                var compared = Describe(m, f, true, minAll, sumW, weights, noise);
                described = described with { DeltaAicc = compared.DeltaAicc, AkaikeWeight = compared.AkaikeWeight };
            }
            fits.Add(described);
            participants.Add((cm, described));
            chosenModel = cm;
        }
        var integerPicks = fits.Where(x => x.Chosen || picks.Any(p => ReferenceEquals(p.Fit, x.Fit) && p.Model.Law is not NthOrderLaw))
            .Where(x => !x.Law.StartsWith("order n", StringComparison.Ordinal)).ToList();
        // With rates.laws listing no law of fixed order (order n alone), no integer law was tried: nothing is said about them.
        var noInteger = (laws is null || all.Any(r => r.Model.Law is not NthOrderLaw)) && (integerPicks.Count == 0 || integerPicks.All(x => x.LackOfFit));
        var chosenFit = fits.FirstOrDefault(x => x.Chosen);
        var residualsOnFine = chosenFit is not null && chosenFit.Fit.Residuals.Length == tFine.Length;
        return new LawSelection(fits, chosenModel, chosenModel?.Drift ?? false, noInteger,
            residualsOnFine ? tFine : t, residualsOnFine ? wFine : weights)
        {
            DriftExcluded = driftExcluded,
            Participants = participants,
            DriftEvidence = driftExcluded is null ? double.NaN : BestPlainDriftScore(plainFits.Values, t, weights),
        };
    }

    /// <summary>With the partner's [B]0 in the plan: does the mixed second-order law (drift-free) describe the trace, so that
    /// the laws that neglect B's depletion leave the choice to it?</summary>
    private static bool NeglectsPartner(List<(LawModel Model, FitResult Fit)> all, double? partner, double[] weights, double noise) =>
        partner is > 0 && all.Any(r => r.Model.Law is MixedSecondOrderLaw && !r.Model.Drift && r.Fit.Converged && !LacksFit(r.Fit, weights, noise));

    /// <summary>The laws that leave the choice to mixed second order when it describes the trace (<see cref="NeglectsPartner"/>):
    /// first and pseudo-first order take [B] constant, second order [B] = [A].</summary>
    private static bool AssumesBConstant(RateLaw law) => law is FirstOrderLaw or PseudoFirstOrderLaw or SecondOrderLaw;

    /// <summary>The converged drift-free integer law with the lowest AICc among those not <paramref name="excluded"/>.</summary>
    private static (LawModel Model, FitResult Fit) BestPlain(List<(LawModel Model, FitResult Fit)> all, Func<(LawModel Model, FitResult Fit), bool> excluded) =>
        all.Where(r => !r.Model.Drift && r.Fit.Converged && !excluded(r) && r.Model.Law is not NthOrderLaw).OrderBy(r => r.Fit.AicC).FirstOrDefault();

    /// <summary>Conversion (1 − u at the last sample, by the best drift-free integer law) a trace must show before a
    /// drift term may compete in "auto" mode: past 90 % the reaction's curve has flattened and a linear baseline is
    /// seen apart from it (common practice, no source).</summary>
    public const double DriftTailConversion = 0.9;

    /// <summary>Largest |correlation| of the drift with the initial slope for a drift fit to take part ("auto").</summary>
    public const double MaxDriftCorrelation = 0.95;

    /// <summary>Why a drift term may not compete on this trace (null when it may): the trace must run into its tail.</summary>
    private static string? DriftSeparability(IEnumerable<(LawModel Model, FitResult Fit)> plain, double[] t)
    {
        var best = plain.Where(r => r.Fit.Converged && r.Model.Law is not NthOrderLaw).OrderBy(r => r.Fit.AicC).FirstOrDefault();
        if (best.Fit is null) return "no drift-free law converged, so the trace's conversion is unknown";
        var p = best.Fit.Parameters.Select(x => x.Value).ToArray();
        var grad = new double[2 + best.Model.Law.ShapeNames.Count];
        var u = best.Model.Law.Fraction(t[^1], best.Model.Nu * p[LawModel.K], best.Model.A0(p), p.AsSpan(LawModel.FirstShape, best.Model.Law.ShapeNames.Count), grad);
        var conversion = 1 - u;
        var ci = System.Globalization.CultureInfo.InvariantCulture;
        if (conversion < DriftTailConversion)
            return string.Format(ci, "the trace reaches about {0:P0} conversion ({1}); a drift term is told apart from the reaction only once the trace runs past {2:P0}",
                conversion, best.Model.Law.Name, DriftTailConversion);
        // The law's word alone is not enough (a zero-order kink "completes" any curve): the trace itself must flatten,
        // its last quarter sloping by at most a quarter of its first quarter's slope.
        var (early, late) = QuarterSlopes(t, best.Model, best.Fit);
        return Math.Abs(late) <= 0.25 * Math.Abs(early) ? null : string.Format(ci,
            "the trace does not flatten (its last quarter slopes by {0:P0} of its first quarter's slope), so a drift cannot be told apart from the reaction",
            Math.Abs(late / early));
    }

    /// <summary>Mean slopes of the fitted curve (drift excluded) over the first and the last quarter of the trace's time.</summary>
    private static (double Early, double Late) QuarterSlopes(double[] t, LawModel model, FitResult fit)
    {
        var p = fit.Parameters.Select(x => x.Value).ToArray();
        double At(double time) => model.Value(p, time) - (model.Drift ? p[model.DriftIndex] * time : 0);
        var (t0, t1) = (t[0], t[^1]);
        var q = 0.25 * (t1 - t0);
        return ((At(t0 + q) - At(t0)) / q, (At(t1) - At(t1 - q)) / q);
    }

    /// <summary>
    /// |correlation| of the drift with the initial slope d y/dt at t0 (drift excluded), by the delta method:
    /// cov(d, h) = Σ_j ∂h/∂p_j·C[d, j], var(h) = ∇hᵀ·C·∇h, ∇h by central differences (Bevington &amp; Robinson, 3rd ed.,
    /// eq. 3.13, from memory). The end level and the drift always trade off over a flat tail; what matters is whether
    /// the drift can take over the rate itself. NaN without a covariance.
    /// </summary>
    internal static double DriftCorrelation(LawModel model, FitResult fit)
    {
        var c = fit.Covariance;
        var d = model.DriftIndex;
        if (c is null || d < 0 || !(c[d, d] > 0)) return double.NaN;
        var np = fit.Parameters.Count;
        var g = InitialRateEstimators.SlopeGradient(model, fit);
        double cov = 0, v = 0;
        for (var a = 0; a < np; a++)
        {
            cov += g[a] * c[d, a];
            for (var b = 0; b < np; b++) v += g[a] * c[a, b] * g[b];
        }
        return v > 0 ? Math.Abs(cov) / Math.Sqrt(v * c[d, d]) : double.NaN;
    }

    private static double BestPlainDriftScore(IEnumerable<(LawModel Model, FitResult Fit)> plain, double[] t, double[] w)
    {
        var best = plain.Where(r => r.Fit.Converged).OrderBy(r => r.Fit.AicC).FirstOrDefault();
        if (best.Fit is null || best.Fit.Residuals.Length != t.Length) return double.NaN;
        // A law whose own terms already span a linear drift (zero order is a straight line) leaves no residual to test:
        // the screen then fits the drift variant, but nothing here is evidence of a drift.
        var score = DriftScore(best.Model, best.Fit, t, w);
        return double.IsFinite(score) ? score : double.NaN;
    }

    /// <summary>Score statistic below which a law's drift variant is not fitted in "auto" mode (see <see cref="DriftScore"/>).</summary>
    public const double DriftScreenScore = 4;

    /// <summary>
    /// Score (Lagrange-multiplier) statistic for adding a linear drift term to a converged drift-free fit:
    /// S = (xᵀr)² / (s²·xᵀ(I − P)x), with x = √w·t, r the weighted residuals, P the projection onto the columns of the
    /// weighted Jacobian at the solution and s² = χ²/dof (Rao 1948, Proc. Camb. Phil. Soc. 44, 50; Engle 1984,
    /// Handbook of Econometrics II, ch. 13, from memory). S approximates the drop in χ²/s² that the drift term would
    /// bring, so the drift variant can beat the drift-free law by the 7 AICc units the choice asks for only when S is
    /// near 9 or more; variants with S below <see cref="DriftScreenScore"/> (a wide margin for the curvature of the
    /// model) are not fitted, which saves most drift fits on traces that do not drift.
    /// </summary>
    internal static double DriftScore(LawModel model, FitResult fit, double[] t, double[] w)
    {
        var n = t.Length;
        var np = fit.Parameters.Count;
        if (fit.Residuals.Length != n || !(fit.DegreesOfFreedom > 0)) return double.PositiveInfinity;
        var p = new double[np];
        for (var j = 0; j < np; j++) p[j] = fit.Parameters[j].Value;
        var jac = new double[n * np];
        if (!model.TryJacobian(p, jac)) return double.PositiveInfinity;
        var cols = new List<int>(np);
        for (var j = 0; j < np; j++) if (fit.Parameters[j].Varied) cols.Add(j);
        var m = cols.Count;
        var a = new double[n * m];
        var x = new double[n];
        double xr = 0, xx = 0;
        for (var i = 0; i < n; i++)
        {
            var sw = w[i] > 0 ? Math.Sqrt(w[i]) : 0;
            for (var k = 0; k < m; k++) a[k * n + i] = sw * jac[i * np + cols[k]];
            x[i] = sw * t[i];
            xr += x[i] * sw * fit.Residuals[i];
            xx += x[i] * x[i];
        }
        var tau = new double[m];
        var rDiag = new double[m];
        Householder.Factor(a, n, m, tau, rDiag);
        Householder.ApplyQt(a, n, m, tau, x);
        var inSpan = 0.0;
        for (var k = 0; k < m; k++) inSpan += x[k] * x[k];
        var outside = xx - inSpan;
        var s2 = fit.ChiSquare / fit.DegreesOfFreedom;
        if (!(outside > 1e-12 * xx) || !(s2 > 0)) return double.PositiveInfinity;
        return xr * xr / (s2 * outside);
    }

    /// <summary>
    /// Pseudo-first order is first order in time with kk·[B]0 in place of kk (see <see cref="PseudoFirstOrderLaw"/>), so
    /// its least-squares fit is the first-order fit re-expressed: k = k₁/[B]0, its standard error and covariance
    /// scaled alike; every other number is the same (common practice, no source).
    /// </summary>
    private static (LawModel, FitResult) AsPseudoFirstOrder(PseudoFirstOrderLaw law, (LawModel Model, FitResult Fit) first, double[] t, double nu,
        double? a0, bool drift)
    {
        var model = new LawModel(law, t, nu, a0, drift);
        var f = first.Fit;
        var scale = 1 / law.Partner;
        var pars = f.Parameters.Select((p, j) => j == LawModel.K
            ? p with { Value = p.Value * scale, StdError = p.StdError * scale, Initial = p.Initial * scale }
            : p).ToArray();
        double[,]? cov = null;
        if (f.Covariance is { } c)
        {
            cov = (double[,])c.Clone();
            for (var j = 0; j < pars.Length; j++) { cov[LawModel.K, j] *= scale; cov[j, LawModel.K] *= scale; }
        }
        var detail = f.ExitDetail + "; the first-order fit re-expressed with k = k(first order)/[B]0";
        return (model, f with { Model = model.Name, Parameters = pars, Covariance = cov, ExitDetail = detail });
    }

    /// <summary>How many trace ranges the fitted end level may lie beyond the data (a trace followed to 2 % conversion).</summary>
    public const double EndLevelRanges = 50;

    /// <summary>Valid samples above which the laws are fitted to bin means (at most this many bins).</summary>
    public const int MaxFitPoints = 250;

    /// <summary>LM tolerance for the comparison fits of a binned trace (see <see cref="FitOptions.Tolerance"/>).</summary>
    public const double CompareTolerance = 1e-6;

    /// <summary>Bins the candidate laws are compared on, for a trace binned at <see cref="MaxFitPoints"/>.</summary>
    public const int ComparePoints = 32;

    /// <summary>Bins a trace too short for fine bins has its laws compared on, once it has twice as many valid samples
    /// (the chosen law is then refitted on every sample).</summary>
    public const int ShortComparePoints = 64;

    /// <summary>
    /// Means of consecutive valid samples in bins of ⌈n/B⌉ (B = 250 for the reported fit, 32 for comparing laws),
    /// weighted by their counts, with the SD of the sample times in each bin, when a trace has more than 500 valid
    /// samples. The model is fitted as the bin average of the curve (see <see cref="LawModel"/>), so the weighted
    /// least-squares fit to bin means gives the estimates of the fit to every sample to first order, and its residual
    /// variance Σn_b·r_b²/(B − p) is an unbiased estimate of the per-sample noise variance: standard errors and
    /// intervals carry over (common practice, no source). It makes comparing a dozen laws cheap.
    /// Guard against nearly noise-free traces, where even a small misfit of the bin average would dominate the
    /// residuals: the trace is binned only when the curvature bias of a plain bin mean, about ½·y″·Var_b(t) (Taylor
    /// expansion, common practice, no source), with y″ from second divided differences of the 250 bin means, stays
    /// below 0.6 of a bin mean's noise σ/√n_b in every bin (σ from <see cref="DifferenceNoise"/>). Noise alone
    /// makes that estimate scatter by about 0.1·σ/√n_b, so a noisy trace always passes; the two-point bin average
    /// then removes that bias to fourth order, which is why the coarser comparison bins need no such check.
    /// </summary>
    internal static (double[] T, double[] Y, double[] W, double[] S)? Bin(double[] t, double[] y, double[] w, double noise, int maxBins = MaxFitPoints, bool checkCurvature = true,
        int minValid = 2 * MaxFitPoints + 1)
    {
        var valid = 0;
        for (var i = 0; i < w.Length; i++) if (w[i] > 0) valid++;
        if (valid < minValid || !(noise > 0)) return null;
        var size = (valid + maxBins - 1) / maxBins;
        var nb = (valid + size - 1) / size;
        var tb = new double[nb]; var yb = new double[nb]; var wb = new double[nb];
        var t0 = new double[nb]; var tt = new double[nb];
        int bin = 0, inBin = 0;
        double first = 0, st = 0, stt = 0, sy = 0;
        for (var i = 0; i < t.Length; i++)
        {
            if (!(w[i] > 0)) continue;
            if (inBin == 0) first = t[i];
            var dt = t[i] - first;
            st += dt; stt += dt * dt; sy += y[i]; inBin++;
            if (inBin == size)
            {
                t0[bin] = first; tb[bin] = st; tt[bin] = stt; yb[bin] = sy; wb[bin] = inBin; bin++;
                inBin = 0; st = stt = sy = 0;
            }
        }
        if (inBin > 0) { t0[bin] = first; tb[bin] = st; tt[bin] = stt; yb[bin] = sy; wb[bin] = inBin; }
        var varT = new double[nb];
        var sd = new double[nb];
        for (var k = 0; k < nb; k++)
        {
            var mean = tb[k] / wb[k];
            varT[k] = Math.Max(0, tt[k] / wb[k] - mean * mean);
            sd[k] = Math.Sqrt(varT[k]);
            tb[k] = t0[k] + mean;
            yb[k] /= wb[k];
        }
        for (var k = 1; checkCurvature && k < nb - 1; k++)
        {
            var curvature = 2 * ((yb[k + 1] - yb[k]) / (tb[k + 1] - tb[k]) - (yb[k] - yb[k - 1]) / (tb[k] - tb[k - 1])) / (tb[k + 1] - tb[k - 1]);
            var bias = 0.5 * Math.Abs(curvature) * varT[k];
            if (!(bias <= 0.6 * noise / Math.Sqrt(wb[k]))) return null;
        }
        return (tb, yb, wb, sd);
    }

    /// <summary>Valid samples above which the laws are never fitted to every sample (see <see cref="LongTraceBins"/>).</summary>
    public const int MaxSampleFitPoints = 20_000;

    /// <summary>
    /// The points the laws are fitted to when a trace with more than <see cref="MaxSampleFitPoints"/> valid samples
    /// keeps its curve too sharply for 250 bins (null for shorter traces, which are fitted at every sample as before).
    /// A fit at every sample holds about sixteen numbers per sample (Jacobian, its factor, residuals, trial values);
    /// over the dozen fits a 2,000,000-sample trace allocated 2 GB and held 1.2–1.6 GB at its peak. Bins this fine give the
    /// same estimates to first order and keep memory bounded (docs/methods.md, "Memory per run"): first 2,500 bins
    /// with the curvature check of <see cref="Bin"/>, then <see cref="MaxSampleFitPoints"/> bins without it (the
    /// two-point bin average of the model removes the curvature bias to fourth order). A trace without measurable noise
    /// (every second difference 0) cannot be binned by that rule; it is fitted at every k-th valid sample, at most
    /// <see cref="MaxSampleFitPoints"/> of them: without noise the other samples add no information.
    /// </summary>
    internal static (double[] T, double[] Y, double[] W, double[] S)? LongTraceBins(double[] t, double[] y, double[] w, double noise)
    {
        var valid = 0;
        for (var i = 0; i < w.Length; i++) if (w[i] > 0) valid++;
        if (valid <= MaxSampleFitPoints) return null;
        if (noise > 0)
            return Bin(t, y, w, noise, 10 * MaxFitPoints) ?? Bin(t, y, w, noise, MaxSampleFitPoints, checkCurvature: false);
        var stride = (valid + MaxSampleFitPoints - 1) / MaxSampleFitPoints;
        var m = (valid + stride - 1) / stride;
        var ts = new double[m]; var ys = new double[m]; var ws = new double[m];
        for (int i = 0, seen = 0, k = 0; i < t.Length && k < m; i++)
        {
            if (!(w[i] > 0)) continue;
            if (seen++ % stride != 0) continue;
            ts[k] = t[i]; ys[k] = y[i]; ws[k] = w[i]; k++;
        }
        return (ts, ys, ws, new double[m]);
    }

    internal static (LawModel, FitResult) FitOne(RateLaw law, double[] t, double[] y, double[] w, double nu, double? a0Ref, double? partner, bool drift,
        (LawModel Model, FitResult Fit)? seed, double[]? startOverride = null, bool[]? fixedOverride = null, double[]? spread = null, double tolerance = 1e-10,
        bool endKnown = false, (double Y0, double YEnd, double Slope)? ends = null)
    {
        var model = new LawModel(law, t, nu, a0Ref, drift, spread, endKnown);
        var np = model.ParameterNames.Count;
        var start = new double[np];
        var fixedP = new bool[np];
        var lower = Enumerable.Repeat(double.NegativeInfinity, np).ToArray();
        var upper = Enumerable.Repeat(double.PositiveInfinity, np).ToArray();
        lower[LawModel.K] = 0;
        // Start and end levels stay within two trace ranges of the data: beyond that a law is running off to a
        // degenerate limit (e.g. first order + drift imitating a straight line), which is then reported AtBound.
        double ymin = double.PositiveInfinity, ymax = double.NegativeInfinity;
        for (var i = 0; i < y.Length; i++) if (w[i] > 0) { ymin = Math.Min(ymin, y[i]); ymax = Math.Max(ymax, y[i]); }
        var range = Math.Max(ymax - ymin, 1e-300);
        lower[LawModel.Y0] = ymin - 2 * range;
        upper[LawModel.Y0] = ymax + 2 * range;
        // The end level of a trace that stops early lies far beyond the data: at 10 % conversion it is nine trace
        // ranges away, at 2 % fifty. Beyond that the law is indistinguishable from a straight line.
        lower[LawModel.YEnd] = ymin - EndLevelRanges * range;
        upper[LawModel.YEnd] = ymax + EndLevelRanges * range;
        for (var s = 0; s < law.ShapeNames.Count; s++)
        {
            lower[LawModel.FirstShape + s] = law.ShapeBounds[s].Low;
            upper[LawModel.FirstShape + s] = law.ShapeBounds[s].High;
        }
        var (y0, yEnd, slope) = ends ?? Ends(t, y, w);
        var a0 = a0Ref ?? Math.Abs(y0 - yEnd);
        var shape = law.GuessShape(a0, partner);
        if (law is MixedSecondOrderLaw && partner is > 0) fixedP[LawModel.FirstShape] = true;
        if (seed is { } sd)
        {
            // Order n from an integer-order fit: same y0, yEnd and k (a0^(n−1) equals that law's g at integer n).
            var sp = sd.Fit.Parameters;
            start[LawModel.Y0] = sp[LawModel.Y0].Value;
            start[LawModel.YEnd] = sp[LawModel.YEnd].Value;
            start[LawModel.K] = sp[LawModel.K].Value;
            shape = [sd.Model.Law switch { ZeroOrderLaw => 0.05, FirstOrderLaw => 1.0, _ => 2.0 }];
            fixedP[LawModel.YEnd] = sd.Fit.Parameters[LawModel.YEnd].Varied == false;
        }
        else
        {
            start[LawModel.Y0] = y0;
            start[LawModel.YEnd] = yEnd;
            var valid = Valid(t, y, w);
            start[LawModel.K] = law.GuessKk(valid.T, valid.Y, y0, yEnd, a0, shape, slope) / Math.Abs(nu);
        }
        for (var s = 0; s < shape.Length; s++) start[LawModel.FirstShape + s] = shape[s];
        if (startOverride is not null) start = startOverride;
        if (fixedOverride is not null) fixedP = fixedOverride;
        if (model.KnownSpan is { } known)
        {
            // The end level follows the start level (y_end = y0 − known span): no parameter, however far beyond the data.
            fixedP[LawModel.YEnd] = true;
            lower[LawModel.YEnd] = double.NegativeInfinity;
            upper[LawModel.YEnd] = double.PositiveInfinity;
            start[LawModel.YEnd] = start[LawModel.Y0] - known;
        }
        var options = new FitOptions { Weights = w, Lower = lower, Upper = upper, Fixed = fixedP, MaxIterations = 100, Tolerance = tolerance };
        var fit = NonlinearLeastSquares.Fit(model, y, start, options);
        if (fit.Exit is FitExit.Stalled or FitExit.InvalidValues)
        {
            // Second attempts: other k scales, then the end value held at its guess (an unfinished zero-order run
            // cannot tell its end value from its rate).
            foreach (var scale in new[] { 0.2, 5.0 })
            {
                var s2 = (double[])start.Clone();
                s2[LawModel.K] *= scale;
                var f2 = NonlinearLeastSquares.Fit(model, y, s2, options);
                if (f2.Converged) { fit = f2; break; }
            }
        }
        if (law is ZeroOrderLaw && a0Ref is null && seed is null && startOverride is null)
        {
            // Without a plan [A]0 a zero-order run may also be the straight line the trace shows, its end beyond the
            // data; from the kinked start the fit can settle on a poor line. Both starts are tried; the lower χ² wins.
            var (tv, yv) = Valid(t, y, w);
            var line = LinearLeastSquares.Line(tv, yv);
            if (line.Converged && line.Parameters[1].Value != 0)
            {
                var ls = (double[])start.Clone();
                var b = line.Parameters[1].Value;
                ls[LawModel.Y0] = line.Parameters[0].Value;
                ls[LawModel.YEnd] = ls[LawModel.Y0] + Math.Sign(b) * 10 * range;
                ls[LawModel.K] = Math.Abs(b) / Math.Abs(nu);
                // The end level does not change a line beyond the data, so it is held where it starts.
                var held = (bool[])fixedP.Clone();
                held[LawModel.YEnd] = true;
                var f2 = NonlinearLeastSquares.Fit(model, y, ls, options with { Fixed = held });
                if (f2.Converged && (!fit.Converged || f2.ChiSquare < fit.ChiSquare))
                    fit = f2 with { ExitDetail = f2.ExitDetail + "; a straight line: the end lies beyond the trace (end value held fixed)" };
            }
        }
        if (!fit.Converged && seed is null && startOverride is null && law is not ZeroOrderLaw && model.KnownSpan is null
            && CurvatureStart(law, model, t, y, w, nu, a0Ref, shape, lower, upper) is { } cs)
        {
            // A partly converted trace whose end is far beyond the data: the guess from the end value is poor, and
            // the fit crawls along the valley where y_end and k trade off. Start instead from the trace's own slope
            // and curvature, and give it more steps.
            var f2 = NonlinearLeastSquares.Fit(model, y, cs, options with { MaxIterations = 400 });
            if (f2.Converged || (fit.Exit == FitExit.MaxIterations && f2.Exit != FitExit.MaxIterations)) fit = f2;
        }
        if (!fit.Converged && law is NthOrderLaw && model.KnownSpan is { } whole && startOverride is null
            && OrderFromCurvature(model, t, y, w, whole, lower, upper) is { } oc
            && !(fit.Exit == FitExit.AtBound && Math.Abs(oc[LawModel.FirstShape] - fit.Parameters[LawModel.FirstShape].Value) < 0.25))
        {
            // With the end known, the order is the trace's curvature: y″/y′ at t0 = −n·kk·[A]0^(n−1) = n·y′/(y0 − y_end)
            // (Taylor expansion, common practice, no source). k and n trade off strongly ([A]0^(n−1) moves by e^(Δn·ln[A]0)),
            // so the fit from the integer law's end can crawl; it starts instead from the order the curvature gives. A fit
            // that stopped on the bound of n the curvature also points to is where the data put it, and is not retried.
            var f2 = NonlinearLeastSquares.Fit(model, y, oc, options with { MaxIterations = 400 });
            if (f2.Converged || (fit.Exit == FitExit.MaxIterations && f2.Exit != FitExit.MaxIterations)) fit = f2;
        }
        if (fit.Exit == FitExit.Singular && fit.SingularParameter == LawModel.YEnd)
        {
            var f2 = (bool[])fixedP.Clone();
            f2[LawModel.YEnd] = true;
            var s2 = (double[])start.Clone();
            if (a0Ref is { } r) s2[LawModel.YEnd] = y0 - Math.Sign(y0 - yEnd) * r;
            // Without a plan [A]0 an undetermined end lies beyond the data: held ten trace ranges away, where a zero-order
            // run is the straight line the trace shows (its slope does not depend on where the end is).
            else if (law is ZeroOrderLaw) s2[LawModel.YEnd] = y0 - Math.Sign(y0 - yEnd) * 10 * range;
            var refit = NonlinearLeastSquares.Fit(model, y, s2, options with { Fixed = f2 });
            if (refit.Converged) fit = refit with { ExitDetail = refit.ExitDetail + "; end value held fixed (not determined by the trace)" };
        }
        if (model.KnownSpan is { } span && fit.Parameters.Count > LawModel.YEnd)
        {
            // Report the end level where the fitted start level puts it.
            var ps = fit.Parameters.ToArray();
            ps[LawModel.YEnd] = ps[LawModel.YEnd] with { Value = ps[LawModel.Y0].Value - span, StdError = ps[LawModel.Y0].StdError };
            fit = fit with { Parameters = ps };
        }
        return (model, fit);
    }

    /// <summary>
    /// A start from the trace's slope and curvature at t0: a quadratic c0 + c1·t + c2·t² over the valid samples gives
    /// y(0) = c0, y′(0) = c1 and y″(0) = 2·c2. Every law here is a function of kk·t at fixed [A]0 and shape, so the
    /// ratio u″(0)/u′(0) scales with kk: kk follows from matching it to 2·c2/c1, then the span y0 − y_end from
    /// y′(0) = (y0 − y_end)·u′(0) (Taylor expansion, common practice, no source). u′ and u″ are taken by finite
    /// differences of the law itself. With [A]0 from the span (no plan value) the match is repeated three times. Null
    /// when the trace does not decelerate (c2/c1 ≥ 0) or the start falls outside the bounds.
    /// </summary>
    private static double[]? CurvatureStart(RateLaw law, LawModel model, double[] t, double[] y, double[] w, double nu, double? a0Ref,
        double[] shape, double[] lower, double[] upper)
    {
        if (StartQuadratic(t, y, w) is not var (c0, c1, c2, duration)) return null;
        var target = 2 * c2 / c1;
        if (!(target < 0) || !double.IsFinite(target)) return null;
        var grad = new double[2 + shape.Length];
        var span = c1 * duration; // first guess of y0 − y_end: the change a straight line would make over the trace
        double kk = 1 / duration;
        for (var round = 0; round < 3; round++)
        {
            var a0 = a0Ref ?? Math.Abs(span);
            if (!(a0 > 0)) return null;
            const double kk0 = 1.0;
            var h = 1e-3;
            double u1 = law.Fraction(h, kk0, a0, shape, grad), u2 = law.Fraction(2 * h, kk0, a0, shape, grad);
            var du = (-3 + 4 * u1 - u2) / (2 * h);
            var d2u = (1 - 2 * u1 + u2) / (h * h);
            if (!(du < 0) || !double.IsFinite(d2u)) return null;
            var rho0 = d2u / du; // at kk = 1; scales linearly with kk
            if (!(rho0 < 0)) return null;
            kk = target / rho0;
            span = c1 / (du * kk);
        }
        var start = new double[model.ParameterNames.Count];
        start[LawModel.Y0] = c0;
        start[LawModel.YEnd] = c0 - span;
        start[LawModel.K] = kk / Math.Abs(nu);
        for (var i = 0; i < shape.Length; i++) start[LawModel.FirstShape + i] = shape[i];
        for (var i = 0; i < start.Length; i++)
            if (!(start[i] >= lower[i] && start[i] <= upper[i])) return null;
        return start;
    }

    /// <summary>c0 + c1·t + c2·t² over the valid samples (so y(0), y′(0) and y″(0)/2) and the time they span; null with
    /// fewer than six samples or when the fit fails.</summary>
    private static (double C0, double C1, double C2, double Duration)? StartQuadratic(double[] t, double[] y, double[] w)
    {
        var (tv, yv) = Valid(t, y, w);
        if (tv.Length < 6) return null;
        var q = LinearLeastSquares.Polynomial(tv, yv, 2);
        if (!q.Converged) return null;
        return (q.Parameters[0].Value, q.Parameters[1].Value, q.Parameters[2].Value, Math.Max(tv[^1] - tv[0], 1e-12));
    }

    /// <summary>True when fewer than two of zero, first and second order converged or their AICc span less than 2.</summary>
    private static bool CannotTellOrder(List<(LawModel, FitResult)> integer)
    {
        var aicc = integer.Where(r => r.Item2.Converged && r.Item1.Law is ZeroOrderLaw or FirstOrderLaw or SecondOrderLaw).Select(r => r.Item2.AicC).ToList();
        return aicc.Count < 2 || aicc.Max() - aicc.Min() < 2;
    }

    /// <summary>A start for order n on a trace whose whole change is known: y0, y′(0) and y″(0) from a quadratic over the
    /// valid samples, n = y″·(y0 − y_end)/(y′)² clamped into the law's bounds (the lower one when the quadratic shows no deceleration),
    /// kk from y′(0) = −(y0 − y_end)·kk·[A]0^(n−1). Null when the quadratic fails or y′(0) runs the wrong way.</summary>
    private static double[]? OrderFromCurvature(LawModel model, double[] t, double[] y, double[] w, double span, double[] lower, double[] upper)
    {
        if (model.InitialConcentration is not { } a0 || StartQuadratic(t, y, w) is not var (c0, c1, c2, _)) return null;
        var n = 2 * c2 * span / (c1 * c1);
        // A trace whose noise hides its curvature (or shows it the wrong way) points to the bound n = 0.
        if (!double.IsFinite(n)) return null;
        if (!(n > 0)) n = 0;
        var nIndex = LawModel.FirstShape;
        n = Math.Clamp(n, lower[nIndex] + 0.02, upper[nIndex] - 0.02);
        var kk = -c1 / (span * Math.Pow(a0, n - 1));
        if (!(kk > 0) || !double.IsFinite(kk)) return null;
        var start = new double[model.ParameterNames.Count];
        start[LawModel.Y0] = c0;
        start[LawModel.YEnd] = c0 - span;
        start[LawModel.K] = kk / model.Nu;
        start[nIndex] = n;
        return start;
    }

    private static bool LacksFit(FitResult f, double[] w, double noise) =>
        LacksFit(f, f.Residuals.Length == w.Length ? RunsTest.Of(f.Residuals, w) : null, noise);

    /// <summary>Lack of fit: a residual pattern (runs test P &lt; 0.001) or, converged, scatter above 4× the trace's own
    /// noise variance. Residuals at the level of rounding (a noise-free trace) carry no pattern worth testing.</summary>
    private static bool LacksFit(FitResult f, RunsTest? runs, double noise)
    {
        var rounding = f.Converged && f.ResidualStdDev <= 1e-10 * Math.Abs(f.Parameters[LawModel.Y0].Value - f.Parameters[LawModel.YEnd].Value);
        return !rounding && (runs is { PValue: < 1e-3 } || (noise > 0 && f.Converged && f.ReducedChiSquare > 4 * noise * noise));
    }

    private static LawFit Describe(LawModel m, FitResult f, bool chosen, double minAicc, double sumW, double[] w, double noise)
    {
        var p = f.Parameters.Select(x => x.Value).ToArray();
        var k = f.Parameters[LawModel.K];
        var shape = p.AsSpan(LawModel.FirstShape, m.Law.ShapeNames.Count);
        var runs = f.Residuals.Length == w.Length ? RunsTest.Of(f.Residuals, w) : null;
        var lack = LacksFit(f, runs, noise);
        var converged = f.Converged;
        var hl = converged ? m.HalfLife(p) : double.NaN;
        var (lo, hi) = converged && double.IsFinite(k.StdError) ? f.Ci95("k") : (double.NaN, double.NaN);
        return new LawFit(m.Name, f, chosen)
        {
            Drift = m.Drift,
            DeltaAicc = converged ? f.AicC - minAicc : double.NaN,
            AkaikeWeight = converged ? Math.Exp(-(f.AicC - minAicc) / 2) / sumW : double.NaN,
            RateConstant = converged ? k.Value : double.NaN,
            RateConstantStdError = converged ? k.StdError : double.NaN,
            RateConstantUnit = m.Law.RateConstantUnit(shape),
            Ci95Low = lo,
            Ci95High = hi,
            HalfLife = hl,
            HalfLifeStdError = converged ? hl * k.StdError / k.Value : double.NaN,
            Runs = runs,
            LackOfFit = lack,
        };
    }

    /// <summary>y at the start and end (medians of 3 valid points) and the early slope (line over the first tenth).</summary>
    internal static (double Y0, double YEnd, double Slope) Ends(double[] t, double[] y, double[] w)
    {
        var (tv, yv) = Valid(t, y, w);
        var n = tv.Length;
        var m = Math.Min(3, n);
        var y0 = MedianOf(yv[..m]);
        var yEnd = MedianOf(yv[^m..]);
        var early = Math.Clamp(n / 10, Math.Min(5, n), n);
        var line = LinearLeastSquares.Line(tv.AsSpan(0, early), yv.AsSpan(0, early));
        var slope = line.Converged ? line.Parameters[1].Value : (yEnd - y0) / (tv[^1] - tv[0]);
        return (y0, yEnd, slope);
    }

    /// <summary>The samples with weight &gt; 0; the arrays themselves when none is excluded.</summary>
    internal static (double[] T, double[] Y) Valid(double[] t, double[] y, double[] w)
    {
        var count = 0;
        for (var i = 0; i < w.Length; i++) if (w[i] > 0) count++;
        if (count == t.Length) return (t, y);
        var tv = new double[count]; var yv = new double[count];
        for (int i = 0, k = 0; i < t.Length; i++) if (w[i] > 0) { tv[k] = t[i]; yv[k] = y[i]; k++; }
        return (tv, yv);
    }

    private static double MedianOf(double[] a)
    {
        var s = (double[])a.Clone();
        Array.Sort(s);
        return s.Length % 2 == 1 ? s[s.Length / 2] : 0.5 * (s[s.Length / 2 - 1] + s[s.Length / 2]);
    }

    /// <summary>
    /// The trace's own noise SD from second differences, σ² = Σ(y_{i−1} − 2y_i + y_{i+1})²/(6(m)) for a smooth
    /// signal sampled densely (Gasser, Sroka &amp; Jennen-Steinmetz 1986, Biometrika 73, 625, from memory).
    /// </summary>
    internal static double DifferenceNoise(double[] t, double[] y, double[] w)
    {
        // Over the valid samples in order (excluded ones skipped), without copying them.
        double s = 0, a = 0, b = 0;
        var m = 0; var seen = 0;
        for (var i = 0; i < y.Length; i++)
        {
            if (!(w[i] > 0)) continue;
            var c = y[i];
            if (seen >= 2) { var d = a - 2 * b + c; s += d * d; m++; }
            a = b; b = c; seen++;
        }
        return seen < 5 ? double.NaN : Math.Sqrt(s / (6.0 * m));
    }
}
