using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Rates;

/// <summary>
/// The three initial-rate estimators. Each returns v0 = (1/ν)·d[X]/dt at t0 = 0 with its standard error:
/// (a) a straight line over an early window shortened until a quadratic term is no longer significant,
/// (b) a polynomial (degree 2 or 3, by AICc) over the longer early window, differentiated at t0,
/// (c) the derivative at t0 of the integrated-law fit chosen by AICc (delta-method error).
/// </summary>
internal static class InitialRateEstimators
{
    /// <summary>
    /// (a) Straight line. Curvature test: fit c0 + c1·t + c2·t² over the window; while |c2| &gt; 2·SE(c2) (curvature
    /// significant at about 95 %) and at least 8 points remain, halve the window. A chord over a curving trace is biased
    /// by about half the conversion it spans (first order: slope ≈ −k[A]0·(1 − kT/2); Taylor expansion, common practice,
    /// no source), so the test keeps that bias below the noise.
    /// </summary>
    public static InitialRate? StraightLine(ReadOnlySpan<double> t, ReadOnlySpan<double> c, double nu, int count)
    {
        if (count < 4) return null;
        var halvings = 0;
        while (count >= 8)
        {
            var q = WindowFit(t[..count], c[..count], 2);
            if (!q.Converged || !(Math.Abs(q.Parameters[2].Value) > 2 * q.Parameters[2].StdError)) break;
            count /= 2;
            halvings++;
        }
        var fit = count > MaxSampleFitPoints ? WindowFit(t[..count], c[..count], 1) : LinearLeastSquares.Line(t[..count], c[..count]);
        if (!fit.Converged || !double.IsFinite(fit.Parameters[1].StdError)) return null;
        var slope = fit.Parameters[1];
        var method = halvings == 0 ? "straight line" : $"straight line (window halved {halvings}× by the curvature test)";
        return WithFitted(new InitialRate(slope.Value / nu, slope.StdError / Math.Abs(nu), fit.DegreesOfFreedom, Units.RateUnit,
            method, t[0], t[count - 1], count, slope.Value, fit.Parameters[0].Value, []), t[..count], c[..count], fit);
    }

    /// <summary>
    /// (b) Polynomial Σ c_j·t^j (t measured from t0 = 0) over the early window; d[X]/dt at t0 = c1.
    /// Differentiating a local least-squares polynomial is the Savitzky–Golay idea (Savitzky &amp; Golay 1964,
    /// Anal. Chem. 36, 1627). Projecting the neglected t^(d+1) term onto degree d over [0, T] (shifted Legendre
    /// polynomials) gives a slope bias of −(3/5)·a3·T² for d = 2 and +(2/7)·a4·T³ for d = 3: over 20 % conversion of a
    /// second-order trace that is −3.8 % and −0.5 %, so a cubic is used whenever the window holds 12 points or more.
    /// </summary>
    public static InitialRate? Polynomial(ReadOnlySpan<double> t, ReadOnlySpan<double> c, double nu, int count)
    {
        if (count < 6) return null;
        var best = WindowFit(t[..count], c[..count], count >= 12 ? 3 : 2);
        if (!best.Converged || !double.IsFinite(best.Parameters[1].StdError)) return null;
        var slope = best.Parameters[1];
        var degreeUsed = best.Parameters.Count - 1;
        return WithFitted(new InitialRate(slope.Value / nu, slope.StdError / Math.Abs(nu), best.DegreesOfFreedom, Units.RateUnit,
            $"polynomial (degree {degreeUsed}) at t0", t[0], t[count - 1], count, slope.Value, best.Parameters[0].Value, []),
            t[..count], c[..count], best);
    }

    /// <summary>
    /// (c) d y/dt at t0 of the chosen law (drift excluded), with a standard error by the delta method
    /// SE² = ∇hᵀ·C·∇h, ∇h by central differences (Bevington &amp; Robinson, "Data Reduction and Error Analysis",
    /// 3rd ed., eq. 3.13, from memory).
    /// </summary>
    public static InitialRate? FromLaw(LawModel model, LawFit law, ReadOnlySpan<double> t, double nu)
    {
        var f = law.Fit;
        if (!f.Converged || f.Covariance is null) return null;
        var p = f.Parameters.Select(x => x.Value).ToArray();
        var slope = model.InitialSlope(p);
        var np = p.Length;
        var g = SlopeGradient(model, f);
        double v = 0;
        for (var a = 0; a < np; a++)
            for (var b = 0; b < np; b++) v += g[a] * f.Covariance[a, b] * g[b];
        if (!(v >= 0) || !double.IsFinite(slope)) return null;
        return new InitialRate(slope / nu, Math.Sqrt(v) / Math.Abs(nu), f.DegreesOfFreedom, Units.RateUnit,
            $"integrated law ({law.Law}) at t0", t[0], t[^1], t.Length, slope, p[LawModel.Y0], [])
        {
            FittedBy = () => law.Fitted,
        };
    }

    /// <summary>∂(d y/dt at t0)/∂p_j of a fit by central differences, steps of 10⁻⁴ of each parameter's standard error
    /// (0 for fixed parameters and for a drift, which the slope excludes); the gradient of the delta method.</summary>
    internal static double[] SlopeGradient(LawModel model, FitResult f)
    {
        var p = f.Parameters.Select(x => x.Value).ToArray();
        var g = new double[p.Length];
        for (var j = 0; j < p.Length; j++)
        {
            if (!f.Parameters[j].Varied) continue;
            var se = f.Parameters[j].StdError;
            var h = double.IsFinite(se) && se > 0 ? 1e-4 * se : 1e-7 * Math.Max(Math.Abs(p[j]), 1e-300);
            var pp = (double[])p.Clone(); pp[j] += h;
            var pm = (double[])p.Clone(); pm[j] -= h;
            g[j] = (model.InitialSlope(pp) - model.InitialSlope(pm)) / (2 * h);
        }
        return g;
    }

    /// <summary>
    /// (c′) The law estimate averaged over every law that took part in the choice, by Akaike weight:
    /// v̄ = Σ w_i·v_i with the unconditional standard error Σ w_i·√(se_i² + (v_i − v̄)²) (Burnham &amp; Anderson 2002,
    /// "Model Selection and Multimodel Inference", eqs. 4.1 and 4.9), so that the uncertainty of which law holds is
    /// carried into the rate. Laws with weight below 1 % are left out (their share cannot move the result), and so
    /// are laws whose slope at t0 has a standard error beyond its value (the law does not determine it); when only
    /// the chosen law remains its own estimate is returned unchanged.
    /// </summary>
    public static InitialRate? Averaged(IReadOnlyList<(LawModel Model, LawFit Fit)> participants, InitialRate? chosen, ReadOnlySpan<double> t, double nu)
    {
        if (chosen is null) return null;
        var parts = new List<(LawFit Fit, InitialRate Rate, double Weight)>();
        foreach (var (m, f) in participants)
        {
            if (!(f.AkaikeWeight >= MinimumAveragingWeight)) continue;
            var r = f.Chosen ? chosen : FromLaw(m, f, t, nu);
            // A law that leaves the slope at t0 undetermined (its standard error beyond the value) cannot inform it.
            if (r is null || !double.IsFinite(r.StdError) || (!f.Chosen && !(r.StdError < Math.Abs(r.Value)))) continue;
            parts.Add((f, r, f.AkaikeWeight));
        }
        if (parts.Count <= 1 || !parts.Any(p => p.Fit.Chosen)) return chosen;
        var sum = parts.Sum(p => p.Weight);
        var mean = parts.Sum(p => p.Weight * p.Rate.Value) / sum;
        var se = parts.Sum(p => p.Weight * Math.Sqrt(p.Rate.StdError * p.Rate.StdError + (p.Rate.Value - mean) * (p.Rate.Value - mean))) / sum;
        var ci = System.Globalization.CultureInfo.InvariantCulture;
        var names = string.Join(", ", parts.OrderByDescending(p => p.Weight).Select(p => string.Format(ci, "{0} {1:F2}", p.Fit.Law, p.Weight / sum)));
        return chosen with
        {
            Value = mean,
            StdError = se,
            Dof = parts.Min(p => p.Rate.Dof),
            Slope = mean * nu,
            Method = $"integrated laws at t0, averaged by Akaike weight ({names})",
            ModelStdError = Math.Sqrt(parts.Sum(p => p.Weight * (p.Rate.Value - mean) * (p.Rate.Value - mean)) / sum),
        };
    }

    /// <summary>Akaike weight below which a law takes no part in the averaged estimate.</summary>
    public const double MinimumAveragingWeight = 0.01;

    /// <summary>Windows above this many samples are fitted on bin means (see <see cref="WindowFit"/>).</summary>
    public const int MaxSampleFitPoints = IntegratedLawFitter.MaxSampleFitPoints;

    /// <summary>
    /// Polynomial Σ c_j·t^j over a window. Up to <see cref="MaxSampleFitPoints"/> samples: every sample, as always. A
    /// longer window (a slow run sampled millions of times) would need about 2(d + 3) numbers per sample for the
    /// factorisation; it is fitted instead to the means of consecutive samples in at most that many bins, weighted by
    /// their counts, with each bin's design row the bin mean of t^j. Averaging a linear model is exact
    /// (mean y = Σ c_j·mean t^j), so the estimates stay unbiased and the residual variance Σn_b·r_b²/(B − p) estimates
    /// the per-sample noise; only the spread of t within a bin, tiny beside the window, is given up (common practice,
    /// no source; docs/methods.md, "Memory per run").
    /// </summary>
    private static FitResult WindowFit(ReadOnlySpan<double> t, ReadOnlySpan<double> c, int degree)
    {
        var n = t.Length;
        if (n <= MaxSampleFitPoints) return LinearLeastSquares.Polynomial(t, c, degree);
        var p = degree + 1;
        var size = (n + MaxSampleFitPoints - 1) / MaxSampleFitPoints;
        var nb = (n + size - 1) / size;
        var design = new double[nb, p];
        var y = new double[nb];
        var w = new double[nb];
        for (var b = 0; b < nb; b++)
        {
            var end = Math.Min(n, (b + 1) * size);
            for (var i = b * size; i < end; i++)
            {
                var v = 1.0;
                for (var k = 0; k < p; k++) { design[b, k] += v; v *= t[i]; }
                y[b] += c[i];
            }
            var m = end - b * size;
            for (var k = 0; k < p; k++) design[b, k] /= m;
            y[b] /= m;
            w[b] = m;
        }
        return LinearLeastSquares.Fit($"polynomial of degree {degree} on bin means", [.. Enumerable.Range(0, p).Select(k => $"c{k}")], design, y, w);
    }

    /// <summary>The estimator's curve at the window's samples: from the residuals of a fit at every sample (as always),
    /// or, for a fit on bin means, the polynomial evaluated at each sample (Horner's rule).</summary>
    private static InitialRate WithFitted(InitialRate rate, ReadOnlySpan<double> t, ReadOnlySpan<double> c, FitResult fit)
    {
        var f = new double[t.Length];
        if (fit.Residuals.Length == t.Length)
            for (var i = 0; i < f.Length; i++) f[i] = c[i] - fit.Residuals[i];
        else
        {
            var p = fit.Parameters;
            for (var i = 0; i < f.Length; i++)
            {
                double v = 0;
                for (var k = p.Count - 1; k >= 0; k--) v = v * t[i] + p[k].Value;
                f[i] = v;
            }
        }
        return rate with { Fitted = f };
    }
}
