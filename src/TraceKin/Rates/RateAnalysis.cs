using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Rates;

/// <summary>The Rates stage's front door: initial rate (and, later, integrated-law fits) for one concentration trace.</summary>
public static class RateAnalysis
{
    /// <param name="concentration">[X](t) in mol/L, times in s from the moment of mixing.</param>
    /// <param name="coefficient">Stoichiometric coefficient ν of X (negative for a reactant).</param>
    /// <param name="referenceConcentration">The amount conversion is measured against (e.g. [X]0 from the plan); null = from the trace.</param>
    public static RunRates Analyse(Trace concentration, double coefficient, double? referenceConcentration, RateSettings settings, string where)
    {
        var warnings = new List<Warning>();
        var (end, count) = Window(concentration, referenceConcentration, settings, minPoints: 8);
        var t = concentration.Times.AsSpan(0, count);
        var c = concentration.Values.AsSpan(0, count);
        var estimates = new List<InitialRate>();

        var quad = LocalPolynomial(t, c, coefficient, end);
        if (quad is not null) estimates.Add(quad);
        var line = StraightLine(t, c, coefficient, end);
        if (line is not null) estimates.Add(line);
        if (estimates.Count == 0)
            throw Fail.At(where, 0, 0, $"{count} points in the early window", "at least 4 points to estimate an initial rate", "sample faster or widen rates.window_conversion");

        var headline = settings.Method switch
        {
            "line" => line ?? estimates[0],
            _ => quad ?? estimates[0],
        };
        if (concentration.Times[0] > 0)
            warnings.Add(new Warning("dead-time", where, $"first sample {concentration.Times[0]:G4} s after mixing; the rate is extrapolated to t = 0"));
        return new RunRates(headline, estimates, [], warnings);
    }

    /// <summary>
    /// Polynomial [X](t) ≈ Σ c_j·t^j fitted over the early window; d[X]/dt at t = 0 is c1 with the fit's standard error.
    /// Differentiating a local polynomial at the window's edge is the Savitzky–Golay idea (Savitzky &amp; Golay 1964,
    /// Anal. Chem. 36, 1627). Projecting the neglected t^(d+1) term onto the fitted degree d over [0, T] (shifted Legendre
    /// polynomials) gives a slope bias of −(3/5)·a3·T² for d = 2 and +(2/7)·a4·T³ for d = 3: over 20 % conversion of a
    /// second-order trace that is −3.8 % and −0.5 %, so a cubic is used whenever the window holds enough points.
    /// </summary>
    private static InitialRate? LocalPolynomial(ReadOnlySpan<double> t, ReadOnlySpan<double> c, double nu, double end)
    {
        if (t.Length < 6) return null;
        var degree = t.Length >= 12 ? 3 : 2;
        var fit = LinearLeastSquares.Polynomial(t, c, degree);
        if (!fit.Converged) return null;
        var slope = fit.Parameters[1];
        return new InitialRate(slope.Value / nu, slope.StdError / Math.Abs(nu), fit.DegreesOfFreedom, Units.RateUnit,
            degree == 3 ? "local cubic at t0" : "local quadratic at t0", t[0], end, t.Length, slope.Value, fit.Parameters[0].Value, Fitted(c, fit.Residuals));
    }

    /// <summary>Straight line over the first half of the early window (a chord: biased low on a curving trace).</summary>
    private static InitialRate? StraightLine(ReadOnlySpan<double> t, ReadOnlySpan<double> c, double nu, double end)
    {
        var n = Math.Max(4, t.Length / 2);
        if (t.Length < 4) return null;
        var fit = LinearLeastSquares.Line(t[..n], c[..n]);
        if (!fit.Converged) return null;
        var slope = fit.Parameters[1];
        return new InitialRate(slope.Value / nu, slope.StdError / Math.Abs(nu), fit.DegreesOfFreedom, Units.RateUnit,
            "straight line", t[0], t[n - 1], n, slope.Value, fit.Parameters[0].Value, Fitted(c[..n], fit.Residuals));
    }

    private static double[] Fitted(ReadOnlySpan<double> c, double[] residuals)
    {
        var f = new double[residuals.Length];
        for (var i = 0; i < f.Length; i++) f[i] = c[i] - residuals[i];
        return f;
    }

    /// <summary>The early window: until |[X] − [X]first| reaches the conversion fraction of the reference amount.</summary>
    private static (double End, int Count) Window(Trace trace, double? reference, RateSettings s, int minPoints)
    {
        var v = trace.Values;
        var n = v.Length;
        if (s.WindowEnd is { } fixedEnd)
        {
            var k = Array.FindIndex(trace.Times, x => x > fixedEnd);
            var cnt = k < 0 ? n : Math.Max(Math.Min(minPoints, n), k);
            return (trace.Times[cnt - 1], cnt);
        }
        // Start level from the mean of the first few points (robust to one noisy first sample).
        var head = Math.Min(5, n);
        var start = 0.0;
        for (var i = 0; i < head; i++) start += v[i];
        start /= head;
        var total = reference is > 0 ? reference.Value : Math.Abs(v[^1] - start);
        var limit = s.WindowConversion * total;
        var count = n;
        for (var i = 0; i < n; i++)
            if (Math.Abs(v[i] - start) >= limit) { count = i + 1; break; }
        count = Math.Max(Math.Min(minPoints, n), count);
        return (trace.Times[count - 1], count);
    }
}
