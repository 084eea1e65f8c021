using MathNet.Numerics.LinearAlgebra;

namespace TraceKin.Planning;

/// <summary>
/// Fisher information of the weighted least-squares fit of a rate law on initial rates: M = Σ_i g_i·g_iᵀ / se_i², with
/// g_i = ∂v/∂θ at run i and se_i its expected standard error (Atkinson, Donev &amp; Tobias, Optimum Experimental Designs,
/// with SAS, 2007, ch. 17, from memory). With those weights the fit's covariance is M⁻¹ to first order, so the standard
/// errors a design will give are √diag(M⁻¹).
/// </summary>
internal static class FisherInformation
{
    public static Matrix<double> Of(DesignLaw law, ReadOnlySpan<double> theta, IEnumerable<RunConditions> runs, RateNoise noise)
    {
        var p = law.ParameterNames.Count;
        var m = Matrix<double>.Build.Dense(p, p);
        Span<double> g = stackalloc double[p];
        foreach (var x in runs) Add(m, law, theta, x, noise, g, 1);
        return m;
    }

    /// <summary>Adds (sign = 1) or removes (sign = −1) one run's information.</summary>
    internal static void Add(Matrix<double> m, DesignLaw law, ReadOnlySpan<double> theta, RunConditions x, RateNoise noise, Span<double> g, double sign)
    {
        law.Gradient(x, theta, g);
        var se = noise.StdError(law.Rate(x, theta));
        var w = sign / (se * se);
        for (var a = 0; a < g.Length; a++)
            for (var b = 0; b < g.Length; b++) m[a, b] += w * g[a] * g[b];
    }

    /// <summary>
    /// ln det of M scaled to unit diagonal (the scaling adds a constant to ln det, so the D-optimum is unchanged, but keeps
    /// parameters of very different sizes — k of 10⁻⁶ beside Ea of 10⁵ — from losing digits); −∞ when singular.
    /// </summary>
    public static double LogDet(Matrix<double> m)
    {
        var c = Scaled(m, out var d);
        if (c is null) return double.NegativeInfinity;
        var chol = c.Cholesky();
        double s = 0;
        for (var i = 0; i < m.RowCount; i++) s += 2 * Math.Log(chol.Factor[i, i]) + 2 * Math.Log(d[i]);
        return s;
    }

    /// <summary>M⁻¹ (the expected covariance), or null when M is singular.</summary>
    public static Matrix<double>? Covariance(Matrix<double> m)
    {
        var c = Scaled(m, out var d);
        if (c is null) return null;
        var inv = c.Cholesky().Solve(Matrix<double>.Build.DenseIdentity(m.RowCount));
        for (var i = 0; i < m.RowCount; i++)
            for (var j = 0; j < m.RowCount; j++) inv[i, j] /= d[i] * d[j];
        return inv;
    }

    private static Matrix<double>? Scaled(Matrix<double> m, out double[] d)
    {
        var p = m.RowCount;
        d = new double[p];
        for (var i = 0; i < p; i++)
        {
            if (!(m[i, i] > 0) || !double.IsFinite(m[i, i])) return null;
            d[i] = Math.Sqrt(m[i, i]);
        }
        var c = Matrix<double>.Build.Dense(p, p);
        for (var i = 0; i < p; i++)
            for (var j = 0; j < p; j++) c[i, j] = m[i, j] / (d[i] * d[j]);
        // Positive definite to rounding: the smallest eigenvalue of the unit-diagonal matrix must be clear of zero.
        var eig = c.Evd(Symmetricity.Symmetric).EigenValues;
        var min = eig.Min(e => e.Real);
        if (!(min > 1e-12)) return null;
        return c;
    }
}
