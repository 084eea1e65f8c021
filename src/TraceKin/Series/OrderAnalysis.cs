using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// The Series stage's front door: from per-run initial rates to orders, rate constant, saturation check and temperature
/// dependence. Orders come from the "method of initial rates" (Espenson, Chemical Kinetics and Reaction Mechanisms,
/// 2nd ed., §1.3, from memory): first the log–log line ln v0 = ln k + Σ n_X·ln[X]0 (a cross-check and the start values),
/// then the weighted nonlinear fit of v0 = k·Π[X]0^n on the untransformed rates with weights 1/se(v0)², which is reported.
/// Runs at different temperatures get one k each and share the orders. Only species whose starting concentration varies
/// independently get an order; the others are folded into k and said so.
/// </summary>
public static class OrderAnalysis
{
    /// <summary>The simple orders a fitted order is rounded to when its interval contains one.</summary>
    public static readonly double[] SimpleOrders = [0, 0.5, 1, 1.5, 2];

    public static SeriesFindings Analyse(IReadOnlyList<RunPoint> runs, ModelSettings settings)
    {
        var warnings = new List<Warning>();
        var usable = new List<RunPoint>();
        foreach (var r in runs)
        {
            if (!(r.Rate > 0) || !double.IsFinite(r.Rate))
                warnings.Add(new Warning("rate-not-positive", r.RunId, $"initial rate {r.Rate:G4} is not positive; run left out of the order fit"));
            else usable.Add(r);
        }
        var used = usable.Select(r => r.RunId).ToArray();

        var allSpecies = usable.SelectMany(r => r.InitialConcentrations.Keys).Distinct().OrderBy(s => s, StringComparer.Ordinal).ToList();
        var candidates = settings.Species ?? allSpecies.ToArray();
        var varied = new List<string>();
        foreach (var sp in candidates)
        {
            var missing = usable.Where(r => !r.InitialConcentrations.TryGetValue(sp, out var v) || !(v > 0)).Select(r => r.RunId).ToList();
            if (missing.Count > 0)
            {
                warnings.Add(new Warning("species-missing", sp, $"no positive [{sp}]0 for run(s) {string.Join(", ", missing)}; no order fitted for {sp}"));
                continue;
            }
            var values = usable.Select(r => r.InitialConcentrations[sp]).ToArray();
            if (values.Length == 0) continue; // no usable run at all: "too-few-runs" below says so
            if (values.Max() / values.Min() - 1 < 1e-9)
            {
                warnings.Add(new Warning("species-constant", sp, $"[{sp}]0 is the same in every run; its order cannot be found and k includes [{sp}]0^n"));
                continue;
            }
            varied.Add(sp);
        }

        var (pairs, pairCount) = PairRatios(usable, varied);
        if (pairCount > pairs.Count)
            warnings.Add(new Warning("pair-table-truncated", "series", FormattableString.Invariant(
                $"{pairCount} pairs of runs differ in one species only; the pair-ratio table lists the first {pairs.Count} in plan order (the orders come from all runs)")));
        var groups = TemperatureGroups.Of(usable);
        var p = varied.Count + groups.Count;
        if (usable.Count < p + 1 || varied.Count == 0)
        {
            warnings.Add(new Warning("too-few-runs", "series", $"{usable.Count} usable runs for {varied.Count} order(s) and {groups.Count} rate constant(s); need at least {p + 1}"));
            return new SeriesFindings([], null, null, null, [], pairs, null, used, warnings) { PairCount = pairCount };
        }

        // Can the design separate the orders at all? If not, say which species move together and fit nothing.
        var design = OrderDesign.Check(usable, varied, groups.Index);
        if (!design.Separable)
        {
            foreach (var set in design.Confounded)
                warnings.Add(new Warning("orders-not-separable", string.Join(", ", set),
                    set.Contains("temperature")
                        ? $"[{set[0]}]0 changes only together with the temperature, so its order cannot be told apart from the temperature dependence of k; vary it at a fixed temperature"
                        : $"the starting concentrations of {string.Join(" and ", set)} never vary independently of each other (in every run they keep the same ratio), so their orders cannot be told apart; add runs that change one of them while holding the other(s) fixed"));
            return new SeriesFindings([], null, null, null, [], pairs, null, used, warnings) { Design = design, PairCount = pairCount };
        }
        if (design.ConditionNumber > OrderDesign.StrongCollinearity)
            warnings.Add(new Warning("design-ill-conditioned", "series",
                $"the species' starting concentrations are strongly correlated across runs (condition number {design.ConditionNumber:G3}); orders are poorly determined and their intervals are wide"));

        var n = usable.Count;
        var lnc = new double[n, varied.Count];
        for (var i = 0; i < n; i++)
            for (var j = 0; j < varied.Count; j++) lnc[i, j] = Math.Log(usable[i].InitialConcentrations[varied[j]]);

        // Log–log line with one intercept per temperature group: the cross-check, and the start of the nonlinear fit.
        var logLog = LogLog(usable, lnc, varied, groups);
        if (!logLog.Converged)
        {
            warnings.Add(new Warning("orders-not-separable", "series", logLog.ExitDetail + "; vary each species independently of the others"));
            return new SeriesFindings([], null, null, null, [], pairs, logLog, used, warnings) { Design = design, PairCount = pairCount };
        }
        var logLogOrders = OrdersFrom(logLog, varied, groups.Count, "log-log least squares (cross-check)");

        // Weighted nonlinear fit on the untransformed rates: the reported orders.
        var rates = usable.Select(r => r.Rate).ToArray();
        var weights = RateWeights(usable);
        var model = new PowerLawModel(lnc, groups.Index, groups.Names, varied);
        var start = Enumerable.Range(0, groups.Count).Select(g => Math.Exp(logLog.Parameters[g].Value))
            .Concat(logLogOrders.Select(o => o.Value)).ToArray();
        var power = NonlinearLeastSquares.Fit(model, rates, start, new FitOptions { Weights = weights });
        IReadOnlyList<Order> orders;
        double[]? lawChoice = null;
        if (power.Converged && power.Parameters.All(q => double.IsFinite(q.StdError)))
        {
            var np = power.Parameters.Count;
            var jac = new double[usable.Count * np];
            var haveJacobian = model.TryJacobian(power.Parameters.Select(q => q.Value).ToArray(), jac);
            var robust = haveJacobian && RobustErrors(power, jac, usable.Count, weights) is { } rob ? rob : power;
            var method = weights is null ? "nonlinear least squares on v0" : "weighted nonlinear least squares on v0 (weights 1/se²)";
            if (!ReferenceEquals(robust, power)) method += ", standard errors heteroscedasticity-consistent (HC3) where larger";
            power = robust;
            orders = OrdersFrom(power, varied, groups.Count, method);
            // The per-run uncertainty of which integrated law holds is systematic: carried into the intervals apart.
            if (haveJacobian)
                lawChoice = LawChoiceUncertainty.Propagate(jac, usable.Count, np, weights, usable.Select(r => r.RateSystematicError).ToArray());
            if (lawChoice is not null)
                orders = orders.Select((o, j) => Widen(o, lawChoice[groups.Count + j], power.T95)).ToArray();
        }
        else
        {
            warnings.Add(new Warning("power-law-fit-failed", "series", $"the nonlinear fit of v0 = k·Π[X]0^n did not converge ({power.Exit}: {power.ExitDetail}); orders are from the log-log line"));
            orders = logLogOrders;
        }

        // Rounded orders: only when every order is shown equivalent to a simple value within the practical margin (two
        // one-sided tests); k is then refitted there and both are shown.
        var verdicts = orders.Select(o => OrderEquivalence.Judge(o, settings.OrderMargin)).ToList();
        var rounded = verdicts.ToDictionary(v => v.Species, v => v.SimpleValue);
        var useRounded = settings.RoundOrders && verdicts.All(v => v.Verdict == OrderVerdictKind.Equivalent);
        if (settings.RoundOrders && !useRounded)
            warnings.Add(new Warning("orders-not-simple", "series", "not every order is shown equivalent to a simple value (0, ½, 1, 3/2, 2) within ±" +
                settings.OrderMargin.ToString("0.###", System.Globalization.CultureInfo.InvariantCulture) + ", so k is given at the fitted orders: " +
                string.Join("; ", verdicts.Where(v => v.Verdict != OrderVerdictKind.Equivalent).Select(v => v.Text))));
        var fitted = orders.ToDictionary(o => o.Species, o => o.Value);
        var atOrders = useRounded ? rounded : fitted;

        RateConstant? headline = null, free = null;
        if (groups.Count == 1)
        {
            free = power.Converged && orders != logLogOrders
                ? FromParameter(power, 0, RateConstantUnit(orders.Sum(o => o.Value)), "weighted nonlinear least squares (fitted orders)")
                : FromLnK(logLog, 0, RateConstantUnit(orders.Sum(o => o.Value)));
            if (lawChoice is not null && power.Converged && orders != logLogOrders) free = Widen(free, lawChoice[0], power.T95);
            headline = useRounded ? FixedOrderRateConstant.Fit(usable, rounded, warnings) ?? free : free;
        }

        var perRun = usable.Select(r =>
        {
            var denom = atOrders.Aggregate(1.0, (acc, o) => acc * Math.Pow(r.InitialConcentrations[o.Key], o.Value));
            return new RunRateConstant(r.RunId, r.Rate / denom, r.RateStdError / denom);
        }).ToArray();

        var curvature = PowerLawCurvature.Check(usable, lnc, varied, groups, weights, warnings, settings.OrderMargin);
        // The laws that compete with the power law by AICc (SeriesLaws), in registry order; of those to be used
        // instead of the power law, the lowest AICc is chosen.
        var competing = new List<(ISeriesLaw Law, CompetingLawFindings Result)>();
        var chosen = SeriesLaws.Power;
        var chosenAicc = double.PositiveInfinity;
        var lawInput = new SeriesLawInput(usable, varied, fitted, power, weights, settings, groups.Count);
        foreach (var law in SeriesLaws.Competitors)
        {
            if (!settings.Fits(law.Name) || law.Fit(lawInput, warnings) is not { } result) continue;
            competing.Add((law, result));
            if (result.UsedInstead && result.Aicc < chosenAicc) (chosen, chosenAicc) = (law.Name, result.Aicc);
        }

        TemperatureFindings? temperature = null;
        if (groups.Count > 1)
            temperature = TemperatureAnalysis.Analyse(usable, groups, atOrders, useRounded, settings, warnings);

        GlobalFitFindings? global = null;
        if (settings.GlobalFit)
            global = GlobalFit.Analyse(usable, varied, groups, fitted, power.Converged ? power : null, warnings);

        var findings = new SeriesFindings(orders, headline, free, useRounded ? rounded : null, perRun, pairs, logLog, used, warnings)
        {
            GlobalFit = global,
            LogLogOrders = logLogOrders,
            PowerLawFit = power,
            Design = design,
            Curvature = curvature,
            OrderVerdicts = verdicts,
            ChosenLaw = chosen,
            Temperature = temperature,
            PairCount = pairCount,
        };
        foreach (var (law, result) in competing) findings = law.Attach(findings, result);
        return findings;
    }

    /// <summary>Weights 1/se(v0)² when every run has a positive standard error, else null (equal weights).</summary>
    public static double[]? RateWeights(IReadOnlyList<RunPoint> runs) =>
        runs.All(r => r.RateStdError > 0 && double.IsFinite(r.RateStdError)) ? runs.Select(r => 1 / (r.RateStdError * r.RateStdError)).ToArray() : null;

    private static FitResult LogLog(IReadOnlyList<RunPoint> runs, double[,] lnc, IReadOnlyList<string> varied, TemperatureGroups groups)
    {
        int n = runs.Count, g = groups.Count, m = varied.Count;
        var design = new double[n, g + m];
        var y = new double[n];
        for (var i = 0; i < n; i++)
        {
            design[i, groups.Index[i]] = 1;
            for (var j = 0; j < m; j++) design[i, g + j] = lnc[i, j];
            y[i] = Math.Log(runs[i].Rate);
        }
        var names = groups.Names.Select(s => s.Length == 0 ? "ln k" : $"ln k({s})").Concat(varied.Select(s => $"n({s})")).ToArray();
        return LinearLeastSquares.Fit("ln v0 = ln k + Σ n·ln[X]0", names, design, y);
    }

    /// <summary>Fewest residual degrees of freedom at which the sandwich standard errors are consulted.</summary>
    internal const int RobustMinDof = 30;

    /// <summary>
    /// The fit with each standard error raised to its heteroscedasticity-consistent (HC3) value where that is larger,
    /// or null when none is (or too few runs). The weights 1/se(v0)² assume every run's standard error states its real
    /// scatter up to one common factor; where that holds unevenly across the design (runs whose baseline drifts, or
    /// whose law choice differs, scatter more than their own errors say, and more at some conditions than at others),
    /// the model-based errors are too small with many runs, and the sandwich shows it (Long &amp; Ervin 2000, from memory).
    /// With fewer than <see cref="RobustMinDof"/> residual degrees of freedom the sandwich is itself too noisy: taking
    /// the larger of two noisy errors would make the interval conservative, so the model-based error with Student's t
    /// stands (in the coverage study, N = 8: 95–97 % model-based, 97.5–99.5 % with the larger of the two).
    /// </summary>
    internal static FitResult? RobustErrors(FitResult fit, double[] jac, int n, double[]? weights)
    {
        if (fit.DegreesOfFreedom < RobustMinDof) return null;
        var np = fit.Parameters.Count;
        if (SandwichCovariance.StdErrors(jac, n, np, weights, fit.Residuals) is not { } hc) return null;
        if (!fit.Parameters.Where((q, j) => hc[j] > q.StdError).Any()) return null;
        return fit with { Parameters = fit.Parameters.Select((q, j) => hc[j] > q.StdError ? q with { StdError = hc[j] } : q).ToArray() };
    }

    private static Order[] OrdersFrom(FitResult fit, IReadOnlyList<string> varied, int offset, string method)
    {
        var t = fit.T95;
        return varied.Select((sp, j) =>
        {
            var prm = fit.Parameters[offset + j];
            return new Order(sp, prm.Value, prm.StdError, fit.DegreesOfFreedom, prm.Value - t * prm.StdError, prm.Value + t * prm.StdError, method);
        }).ToArray();
    }

    /// <summary>The interval widened by a systematic standard uncertainty, combined in quadrature (JCGM 100:2008 §5.1).</summary>
    internal static Order Widen(Order o, double sys, double t)
    {
        if (!(sys > 0)) return o;
        var h = t * LawChoiceUncertainty.Combined(o.StdError, sys);
        return o with { Ci95Low = o.Value - h, Ci95High = o.Value + h, LawChoiceStdError = sys };
    }

    /// <summary>As for an order; a rate constant's interval is symmetric here.</summary>
    internal static RateConstant Widen(RateConstant k, double sys, double t)
    {
        if (!(sys > 0)) return k;
        var h = t * LawChoiceUncertainty.Combined(k.StdError, sys);
        return k with { Ci95Low = k.Value - h, Ci95High = k.Value + h, LawChoiceStdError = sys };
    }

    private static RateConstant FromParameter(FitResult fit, int index, string unit, string method)
    {
        var k = fit.Parameters[index];
        var h = fit.T95 * k.StdError;
        return new RateConstant(k.Value, k.StdError, unit, fit.DegreesOfFreedom, k.Value - h, k.Value + h, method);
    }

    /// <summary>k = exp(ln k): its interval is the exponential of ln k's symmetric one, its standard error by the delta method.</summary>
    private static RateConstant FromLnK(FitResult fit, int index, string unit)
    {
        var lnk = fit.Parameters[index];
        var k = Math.Exp(lnk.Value);
        var t = fit.T95;
        return new RateConstant(k, k * lnk.StdError, unit, fit.DegreesOfFreedom,
            Math.Exp(lnk.Value - t * lnk.StdError), Math.Exp(lnk.Value + t * lnk.StdError), "log-log least squares (fitted orders)");
    }

    /// <summary>Unit of k for a total order n: (mol/L)^(1−n)·s⁻¹, written plainly.</summary>
    public static string RateConstantUnit(double totalOrder)
    {
        var m = Math.Round(totalOrder * 2) / 2;
        var e = 1 - m;
        if (Math.Abs(totalOrder - m) > 0.25) return $"(mol/L)^{e:0.##}/s";
        return e switch
        {
            0 => "1/s",
            1 => "mol/(L·s)",
            -1 => "L/(mol·s)",
            _ when e < 0 => $"L^{-e:0.#}/(mol^{-e:0.#}·s)",
            _ => $"mol^{e:0.#}/(L^{e:0.#}·s)",
        };
    }

    /// <summary>At most this many pairs are listed: with replicate runs the number of pairs grows as the square of the runs.</summary>
    public const int MaxPairRatios = 1000;

    /// <summary>
    /// Pairs of runs that differ only in one varied species: n = ln(v2/v1)/ln(c2/c1), error propagated from both rates.
    /// Returns the first <see cref="MaxPairRatios"/> in plan order and how many pairs there are in all. The pairs are
    /// counted arithmetically (per species, runs grouped by temperature and by every other species' [X]0: a group of m
    /// runs whose values of the species fall in classes of m_v gives C(m, 2) − Σ C(m_v, 2) pairs) and only the listed
    /// ones are built, so a series of 20,000 runs does not visit its 2·10⁸ pairs. Where the classes are not clear-cut
    /// (values within the 10⁻⁹ tolerance of one another but not equal, temperatures that chain across 0.05 K, a run
    /// without a temperature) every pair is visited as before.
    /// </summary>
    internal static (IReadOnlyList<PairRatio> Pairs, long Count) PairRatios(IReadOnlyList<RunPoint> runs, IReadOnlyList<string> varied)
    {
        var k = varied.Count;
        var n = runs.Count;
        var conc = new double[n * k];
        for (var r = 0; r < n; r++)
            for (var j = 0; j < k; j++) conc[r * k + j] = runs[r].InitialConcentrations[varied[j]];
        var groups = ClearTemperatureClasses(runs);
        if (groups is null || !ClearConcentrationClasses(conc, n, k)) return AllPairs(runs, varied, conc);

        // For species j, runs that share the temperature class and every other species' value, in plan order.
        var members = new Dictionary<string, List<int>>[k];
        long count = 0;
        for (var j = 0; j < k; j++)
        {
            members[j] = new Dictionary<string, List<int>>(StringComparer.Ordinal);
            for (var r = 0; r < n; r++)
            {
                var key = GroupKey(groups[r], conc, r, k, j);
                if (!members[j].TryGetValue(key, out var list)) members[j][key] = list = [];
                list.Add(r);
            }
            foreach (var list in members[j].Values)
            {
                long m = list.Count;
                var same = list.GroupBy(r => conc[r * k + j]).Sum(g => (long)g.Count() * (g.Count() - 1) / 2);
                count += m * (m - 1) / 2 - same;
            }
        }

        var pairs = new List<PairRatio>();
        var candidates = new List<(int B, int J)>();
        for (var a = 0; a < n && pairs.Count < MaxPairRatios; a++)
        {
            candidates.Clear();
            for (var j = 0; j < k; j++)
            {
                var list = members[j][GroupKey(groups[a], conc, a, k, j)];
                var from = list.BinarySearch(a) + 1;
                for (var i = from; i < list.Count; i++)
                    if (conc[list[i] * k + j] != conc[a * k + j]) candidates.Add((list[i], j));
            }
            candidates.Sort((x, y) => x.B.CompareTo(y.B));
            foreach (var (bIndex, j) in candidates)
            {
                if (pairs.Count >= MaxPairRatios) break;
                pairs.Add(Pair(runs[a], runs[bIndex], varied[j]));
            }
        }
        return (pairs, count);
    }

    private static string GroupKey(int temperatureClass, double[] conc, int r, int k, int skip)
    {
        var sb = new System.Text.StringBuilder().Append(temperatureClass);
        for (var j = 0; j < k; j++)
            if (j != skip) sb.Append('|').Append(BitConverter.DoubleToInt64Bits(conc[r * k + j]));
        return sb.ToString();
    }

    /// <summary>A temperature class per run when "within 0.05 K" is the same as "in one class" (every run has a
    /// temperature, each class spans at most 0.05 K and classes lie more than 0.05 K apart); else null.</summary>
    private static int[]? ClearTemperatureClasses(IReadOnlyList<RunPoint> runs)
    {
        if (runs.Any(r => r.TemperatureK is null)) return null;
        var order = Enumerable.Range(0, runs.Count).OrderBy(i => runs[i].TemperatureK!.Value).ToArray();
        var cls = new int[runs.Count];
        double start = double.NaN, last = double.NaN;
        var c = -1;
        foreach (var i in order)
        {
            var t = runs[i].TemperatureK!.Value;
            if (c < 0 || t - last > 0.05) { c++; start = t; }
            else if (t - start > 0.05) return null; // a chain: the pairwise rule is not a partition here
            last = t;
            cls[i] = c;
        }
        return cls;
    }

    /// <summary>True when, for every species, distinct values lie further apart than the 10⁻⁹ relative tolerance.</summary>
    private static bool ClearConcentrationClasses(double[] conc, int n, int k)
    {
        for (var j = 0; j < k; j++)
        {
            var values = Enumerable.Range(0, n).Select(r => conc[r * k + j]).Distinct().Order().ToArray();
            for (var i = 1; i < values.Length; i++)
                if (Math.Abs(values[i] - values[i - 1]) <= 1e-9 * Math.Max(values[i], values[i - 1])) return false;
        }
        return true;
    }

    private static PairRatio Pair(RunPoint a, RunPoint b, string differing)
    {
        var cr = b.InitialConcentrations[differing] / a.InitialConcentrations[differing];
        var rr = b.Rate / a.Rate;
        var lnc = Math.Log(cr);
        var rel = Math.Sqrt(Math.Pow(a.RateStdError / a.Rate, 2) + Math.Pow(b.RateStdError / b.Rate, 2));
        return new PairRatio(a.RunId, b.RunId, differing, cr, rr, Math.Log(rr) / lnc, rel / Math.Abs(lnc));
    }

    /// <summary>Every pair visited: the rule as stated, for series whose classes are not clear-cut.</summary>
    internal static (IReadOnlyList<PairRatio> Pairs, long Count) AllPairs(IReadOnlyList<RunPoint> runs, IReadOnlyList<string> varied, double[] conc)
    {
        var list = new List<PairRatio>();
        long count = 0;
        var k = varied.Count;
        for (var a = 0; a < runs.Count; a++)
            for (var b = a + 1; b < runs.Count; b++)
            {
                var differingIndex = -1;
                var ok = true;
                for (var j = 0; j < k; j++)
                {
                    var ca = conc[a * k + j];
                    var cb = conc[b * k + j];
                    if (Math.Abs(ca - cb) <= 1e-9 * Math.Max(ca, cb)) continue;
                    if (differingIndex >= 0) { ok = false; break; }
                    differingIndex = j;
                }
                if (!ok || differingIndex < 0) continue;
                if (runs[a].TemperatureK is { } ta && runs[b].TemperatureK is { } tb && Math.Abs(ta - tb) > 0.05) continue;
                if (++count > MaxPairRatios) continue;
                list.Add(Pair(runs[a], runs[b], varied[differingIndex]));
            }
        return (list, count);
    }
}
