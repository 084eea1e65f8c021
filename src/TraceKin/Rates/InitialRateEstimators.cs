using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Rates;

/// <summary>
/// The three initial-rate estimators. Each returns v0 = (1/ν)·d[X]/dt at t0 = 0 with its standard error:
/// (a) a straight line over an early window shortened until a quadratic term is no longer significant,
/// (b) a polynomial (degree 2 or 3, by AICc) over the longer early window, differentiated at t0,
/// (c) the derivative at t0 of the integrated-law fit chosen by AICc (delta-method error).
/// </summary>
public static class InitialRateEstimators
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
            var q = LinearLeastSquares.Polynomial(t[..count], c[..count], 2);
            if (!q.Converged || !(Math.Abs(q.Parameters[2].Value) > 2 * q.Parameters[2].StdError)) break;
            count /= 2;
            halvings++;
        }
        var fit = LinearLeastSquares.Line(t[..count], c[..count]);
        if (!fit.Converged || !double.IsFinite(fit.Parameters[1].StdError)) return null;
        var slope = fit.Parameters[1];
        var method = halvings == 0 ? "straight line" : $"straight line (window halved {halvings}× by the curvature test)";
        return new InitialRate(slope.Value / nu, slope.StdError / Math.Abs(nu), fit.DegreesOfFreedom, Units.RateUnit,
            method, t[0], t[count - 1], count, slope.Value, fit.Parameters[0].Value, Fitted(c[..count], fit.Residuals));
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
        var best = LinearLeastSquares.Polynomial(t[..count], c[..count], count >= 12 ? 3 : 2);
        if (!best.Converged || !double.IsFinite(best.Parameters[1].StdError)) best = null;
        if (best is null) return null;
        var slope = best.Parameters[1];
        var degreeUsed = best.Parameters.Count - 1;
        return new InitialRate(slope.Value / nu, slope.StdError / Math.Abs(nu), best.DegreesOfFreedom, Units.RateUnit,
            $"polynomial (degree {degreeUsed}) at t0", t[0], t[count - 1], count, slope.Value, best.Parameters[0].Value,
            Fitted(c[..count], best.Residuals));
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
        var g = new double[np];
        for (var j = 0; j < np; j++)
        {
            if (!f.Parameters[j].Varied) continue;
            var se = f.Parameters[j].StdError;
            var h = double.IsFinite(se) && se > 0 ? 1e-4 * se : 1e-7 * Math.Max(Math.Abs(p[j]), 1e-300);
            var pp = (double[])p.Clone(); pp[j] += h;
            var pm = (double[])p.Clone(); pm[j] -= h;
            g[j] = (model.InitialSlope(pp) - model.InitialSlope(pm)) / (2 * h);
        }
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

    private static double[] Fitted(ReadOnlySpan<double> c, double[] residuals)
    {
        var f = new double[residuals.Length];
        for (var i = 0; i < f.Length; i++) f[i] = c[i] - residuals[i];
        return f;
    }
}
