using TraceKin.Fitting;

namespace TraceKin.Rates;

/// <summary>What the integrated-law step found: every fit tried, and whether any integer law describes the trace.</summary>
public sealed record LawSelection(IReadOnlyList<LawFit> Fits, LawModel? ChosenModel, bool DriftChosen, bool NoIntegerLawFits);

/// <summary>
/// Fits every candidate integrated law (with and, if asked, without a linear drift term) to a whole trace and picks
/// one by AICc (Burnham &amp; Anderson 2002, "Model Selection and Multimodel Inference", §2.4–2.6; Akaike weights
/// eq. 2.14). A law's drift variant is preferred only when its AICc is lower by more than 7 (ibid. §2.6: Δ = 4–7 means
/// considerably less support for the simpler model); order n only when it beats every integer law by more than 10.
/// Fits that did not converge take no part in the choice.
/// </summary>
public static class IntegratedLawFitter
{
    /// <summary>Candidate laws for a trace: integer orders always; pseudo-first and mixed second order when the partner's [B]0 is known.</summary>
    public static IReadOnlyList<RateLaw> Candidates(double? a0, double? partner)
    {
        var laws = new List<RateLaw> { new ZeroOrderLaw(), new FirstOrderLaw(), new SecondOrderLaw() };
        if (partner is > 0)
        {
            laws.Add(new MixedSecondOrderLaw());
            // Pseudo-first order needs a large excess of the partner: ≥ 10-fold (common practice, no source).
            if (a0 is > 0 && partner.Value >= 10 * a0.Value) laws.Add(new PseudoFirstOrderLaw(partner.Value));
        }
        return laws;
    }

    /// <param name="weights">0 for excluded samples (spikes), else 1.</param>
    /// <param name="drift">"auto", "off" or "on".</param>
    public static LawSelection Fit(double[] t, double[] y, double[] weights, double nu, double? a0, double? partner, string drift)
    {
        var noise = DifferenceNoise(t, y, weights);
        var (tAll, yAll, wAll) = (t, y, weights);
        var binned = Bin(t, y, weights);
        if (binned is { } b) (t, y, weights) = b;
        var families = drift switch { "off" => new[] { false }, "on" => [true], _ => [false, true] };
        var all = new List<(LawModel Model, FitResult Fit)>();
        foreach (var withDrift in families)
        {
            var integer = new List<(LawModel, FitResult)>();
            foreach (var law in Candidates(a0, partner))
            {
                var r = FitOne(law, t, y, weights, nu, a0, partner, withDrift, null);
                integer.Add(r);
                all.Add(r);
            }
            // Order n starts from the best-fitting integer order (ones of one species only). It is not combined with a
            // drift term: n and a drift trade off against each other and together overfit noise.
            if (withDrift) continue;
            var seed = integer.Where(r => r.Item2.Converged && r.Item1.Law is ZeroOrderLaw or FirstOrderLaw or SecondOrderLaw)
                .OrderBy(r => r.Item2.AicC).FirstOrDefault();
            all.Add(FitOne(new NthOrderLaw(), t, y, weights, nu, a0, partner, withDrift, seed.Item2 is null ? null : (seed.Item1, seed.Item2)));
        }

        // Per law, the drift variant only with clear evidence (AICc lower by more than 7: Burnham & Anderson 2002, §2.6,
        // give Δ = 4–7 as "considerably less support", so the drift-free model is dropped only beyond that); then the integer law with the
        // lowest AICc; order n only when it beats that by more than 10 (Burnham &amp; Anderson 2002, §2.6: Δ &gt; 10 leaves
        // essentially no support for the worse model). Akaike weights over every converged fit.
        var converged = all.Where(r => r.Fit.Converged).ToList();
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
            : nth.Fit is not null && nth.Fit.AicC < bestInteger.Fit.AicC - 10 ? nth : bestInteger;

        var fits = new List<LawFit>();
        foreach (var (m, f) in all)
        {
            var fitted = new double[tAll.Length];
            if (f.Parameters.All(p => double.IsFinite(p.Value)))
                new LawModel(m.Law, tAll, nu, a0, m.Drift).Evaluate(f.Parameters.Select(p => p.Value).ToArray(), fitted);
            var chosen = chosenPair.Fit is not null && ReferenceEquals(f, chosenPair.Fit);
            fits.Add(Describe(m, f, fitted, chosen, minAll, sumW, weights, noise));
        }
        var chosenModel = chosenPair.Model;
        if (binned is not null && chosenPair.Fit is { } cf)
        {
            // The chosen law is refitted on every sample, starting from its fit to the bin means.
            var (fm, ff) = FitOne(chosenPair.Model!.Law, tAll, yAll, wAll, nu, a0, partner, chosenPair.Model.Drift, null,
                cf.Parameters.Select(p => p.Value).ToArray(), cf.Parameters.Select(p => !p.Varied).ToArray());
            if (ff.Converged)
            {
                var i = fits.FindIndex(x => x.Chosen);
                var fitted = new double[tAll.Length];
                fm.Evaluate(ff.Parameters.Select(p => p.Value).ToArray(), fitted);
                fits[i] = Describe(fm, ff, fitted, true, minAll, sumW, wAll, noise) with
                {
                    DeltaAicc = fits[i].DeltaAicc,
                    AkaikeWeight = fits[i].AkaikeWeight,
                };
                chosenModel = fm;
            }
        }
        var integerPicks = fits.Where(x => picks.Any(p => ReferenceEquals(p.Fit, x.Fit) && p.Model.Law is not NthOrderLaw)).ToList();
        var noInteger = integerPicks.Count == 0 || integerPicks.All(x => x.LackOfFit);
        return new LawSelection(fits, chosenModel, chosenModel?.Drift ?? false, noInteger);
    }

    /// <summary>Samples above which the laws are compared on bin means (the chosen one is then refitted on every sample).</summary>
    public const int MaxFitPoints = 1000;

    /// <summary>
    /// Means of consecutive valid samples in bins of ⌈n/1000⌉, weighted by their counts, when a trace has more than
    /// 2000 valid samples: the least-squares fit to bin means with weights n_b equals the full fit to first order for a
    /// curve that is smooth over a bin (common practice, no source), and makes comparing a dozen laws cheap.
    /// </summary>
    internal static (double[] T, double[] Y, double[] W)? Bin(double[] t, double[] y, double[] w)
    {
        var (tv, yv) = Valid(t, y, w);
        if (tv.Length <= 2 * MaxFitPoints) return null;
        var size = (tv.Length + MaxFitPoints - 1) / MaxFitPoints;
        var nb = (tv.Length + size - 1) / size;
        var tb = new double[nb]; var yb = new double[nb]; var wb = new double[nb];
        for (var i = 0; i < tv.Length; i++) { var k = i / size; tb[k] += tv[i]; yb[k] += yv[i]; wb[k]++; }
        for (var k = 0; k < nb; k++) { tb[k] /= wb[k]; yb[k] /= wb[k]; }
        return (tb, yb, wb);
    }

    internal static (LawModel, FitResult) FitOne(RateLaw law, double[] t, double[] y, double[] w, double nu, double? a0Ref, double? partner, bool drift,
        (LawModel Model, FitResult Fit)? seed, double[]? startOverride = null, bool[]? fixedOverride = null)
    {
        var model = new LawModel(law, t, nu, a0Ref, drift);
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
        lower[LawModel.Y0] = lower[LawModel.YEnd] = ymin - 2 * range;
        upper[LawModel.Y0] = upper[LawModel.YEnd] = ymax + 2 * range;
        for (var s = 0; s < law.ShapeNames.Count; s++)
        {
            lower[LawModel.FirstShape + s] = law.ShapeBounds[s].Low;
            upper[LawModel.FirstShape + s] = law.ShapeBounds[s].High;
        }
        var (y0, yEnd, slope) = Ends(t, y, w);
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
        var options = new FitOptions { Weights = w, Lower = lower, Upper = upper, Fixed = fixedP, MaxIterations = 100, Tolerance = 1e-10 };
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
        if (fit.Exit == FitExit.Singular && fit.ExitDetail.Contains("'yEnd'", StringComparison.Ordinal))
        {
            var f2 = (bool[])fixedP.Clone();
            f2[LawModel.YEnd] = true;
            var s2 = (double[])start.Clone();
            if (a0Ref is { } r) s2[LawModel.YEnd] = y0 - Math.Sign(y0 - yEnd) * r;
            var refit = NonlinearLeastSquares.Fit(model, y, s2, options with { Fixed = f2 });
            if (refit.Converged) fit = refit with { ExitDetail = refit.ExitDetail + "; end value held fixed (not determined by the trace)" };
        }
        return (model, fit);
    }

    private static LawFit Describe(LawModel m, FitResult f, double[] fitted, bool chosen, double minAicc, double sumW, double[] w, double noise)
    {
        var p = f.Parameters.Select(x => x.Value).ToArray();
        var k = f.Parameters[LawModel.K];
        var shape = p.AsSpan(LawModel.FirstShape, m.Law.ShapeNames.Count);
        var runs = f.Residuals.Length == w.Length ? RunsTest.Of(f.Residuals, w) : null;
        var lack = runs is { PValue: < 1e-3 } || (noise > 0 && f.Converged && f.ReducedChiSquare > 4 * noise * noise);
        var converged = f.Converged;
        var hl = converged ? m.HalfLife(p) : double.NaN;
        var (lo, hi) = converged && double.IsFinite(k.StdError) ? f.Ci95("k") : (double.NaN, double.NaN);
        return new LawFit(m.Name, f, fitted, chosen)
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

    internal static (double[] T, double[] Y) Valid(double[] t, double[] y, double[] w)
    {
        var tv = new List<double>(t.Length); var yv = new List<double>(t.Length);
        for (var i = 0; i < t.Length; i++) if (w[i] > 0) { tv.Add(t[i]); yv.Add(y[i]); }
        return (tv.ToArray(), yv.ToArray());
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
        var (_, yv) = Valid(t, y, w);
        if (yv.Length < 5) return double.NaN;
        double s = 0;
        for (var i = 1; i < yv.Length - 1; i++) { var d = yv[i - 1] - 2 * yv[i] + yv[i + 1]; s += d * d; }
        return Math.Sqrt(s / (6.0 * (yv.Length - 2)));
    }
}
