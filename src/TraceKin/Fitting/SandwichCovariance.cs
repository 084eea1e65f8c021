namespace TraceKin.Fitting;

/// <summary>
/// The heteroscedasticity-consistent ("sandwich") covariance of a weighted least-squares fit, in its HC3 form:
/// Cov = B·M·B with B = (JᵀWJ)⁻¹ and M = Σ_i (w_i·r_i)²/(1 − h_ii)²·J_iᵀJ_i, h_ii = w_i·J_i·B·J_iᵀ (White 1980,
/// Econometrica 48, 817; MacKinnon &amp; White 1985, J. Econometrics 29, 305; Long &amp; Ervin 2000, Am. Stat. 54, 217,
/// who recommend HC3 for small samples; all from memory). Unlike the model-based covariance s²·B it does not assume
/// the weights are right up to one common factor: where the runs' own standard errors misstate how far their rates
/// actually scatter, and differently across the design, it says so.
/// </summary>
internal static class SandwichCovariance
{
    /// <summary>(JᵀWJ)⁻¹ for a Jacobian <paramref name="jac"/> (n × p, row-major) and weights <paramref name="w"/>
    /// (null: equal), or null when the design is singular (non-finite entries; a determinant threshold would scale with
    /// the weights).</summary>
    public static double[,]? NormalInverse(double[] jac, int n, int p, double[]? w)
    {
        var a = new double[p, p];
        for (var i = 0; i < n; i++)
        {
            var wi = w?[i] ?? 1;
            for (var j = 0; j < p; j++)
                for (var k = 0; k < p; k++) a[j, k] += wi * jac[i * p + j] * jac[i * p + k];
        }
        var inv = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.DenseOfArray(a).Inverse();
        var b = new double[p, p];
        for (var j = 0; j < p; j++)
            for (var k = 0; k < p; k++) b[j, k] = inv[j, k];
        return b.Cast<double>().All(double.IsFinite) ? b : null;
    }

    /// <summary>Standard errors (HC3) for every parameter of a fit with Jacobian <paramref name="jac"/> (n × p,
    /// row-major), weights <paramref name="w"/> (null: equal) and residuals <paramref name="r"/> (y − f). Null when the
    /// design is singular or a point has leverage 1.</summary>
    public static double[]? StdErrors(double[] jac, int n, int p, double[]? w, double[] r)
    {
        if (NormalInverse(jac, n, p, w) is not { } b) return null;
        var m = new double[p, p];
        for (var i = 0; i < n; i++)
        {
            var wi = w?[i] ?? 1;
            double h = 0;
            for (var j = 0; j < p; j++)
            {
                double s = 0;
                for (var k = 0; k < p; k++) s += b[j, k] * jac[i * p + k];
                h += jac[i * p + j] * s;
            }
            h *= wi;
            if (!(h < 1)) return null;
            var e = wi * r[i] / (1 - h);
            var e2 = e * e;
            for (var j = 0; j < p; j++)
                for (var k = 0; k < p; k++) m[j, k] += e2 * jac[i * p + j] * jac[i * p + k];
        }
        var se = new double[p];
        for (var j = 0; j < p; j++)
        {
            double v = 0;
            for (var k = 0; k < p; k++)
                for (var l = 0; l < p; l++) v += b[j, k] * m[k, l] * b[l, j];
            se[j] = Math.Sqrt(v);
        }
        return se.All(double.IsFinite) ? se : null;
    }
}
