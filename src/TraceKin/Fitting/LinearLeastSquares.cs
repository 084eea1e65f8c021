using System.Buffers;

namespace TraceKin.Fitting;

/// <summary>
/// Ordinary and weighted linear least squares y ≈ X·β by Householder QR of √W·X (never the normal equations),
/// so that ill-conditioned designs such as NIST StRD Pontius keep their digits.
/// Standard errors: sqrt(s²·diag((XᵀWX)⁻¹)) with s² = Σw·r²/(n−p) (Draper &amp; Smith, Applied Regression
/// Analysis, 3rd ed., §5.2). R² is centred when the design has an intercept column, uncentred otherwise
/// (as NIST StRD certifies for NoInt1/NoInt2).
/// </summary>
public static class LinearLeastSquares
{
    /// <summary>Fit y = X·β. <paramref name="design"/> is n×p, row-major.</summary>
    public static FitResult Fit(string model, IReadOnlyList<string> names, double[,] design, ReadOnlySpan<double> y, ReadOnlySpan<double> weights = default)
    {
        int n = design.GetLength(0), p = design.GetLength(1);
        if (names.Count != p) throw new ArgumentException("one name per design column is needed", nameof(names));
        if (y.Length != n) throw new ArgumentException("y must have one value per design row", nameof(y));
        var x = ArrayPool<double>.Shared.Rent(n * p);
        try
        {
            for (var i = 0; i < n; i++)
                for (var j = 0; j < p; j++) x[j * n + i] = design[i, j];
            return FitColumns(model, names, x, n, p, y, weights);
        }
        finally { ArrayPool<double>.Shared.Return(x); }
    }

    /// <summary>Fit y = X·β with X given column-major in <paramref name="x"/> (column j at [j·n, j·n + n)); the
    /// working arrays come from the shared pool, so a fit allocates little beyond its result.</summary>
    private static FitResult FitColumns(string model, IReadOnlyList<string> names, double[] x, int n, int p, ReadOnlySpan<double> y, ReadOnlySpan<double> weights)
    {
        if (n < p || (n == p && p > 0))
            return Failed(model, names, n, p, FitExit.TooFewPoints, $"{n} points for {p} parameters leave no degrees of freedom");
        var pool = ArrayPool<double>.Shared;
        double[] a = pool.Rent(n * p), b = pool.Rent(n), qtb = pool.Rent(n);
        try { return FitColumns(model, names, x, n, p, y, weights.IsEmpty ? null : weights.ToArray(), a, b, qtb); }
        finally
        {
            pool.Return(a); pool.Return(b); pool.Return(qtb);
        }
    }

    private static FitResult FitColumns(string model, IReadOnlyList<string> names, double[] x, int n, int p, ReadOnlySpan<double> y, double[]? w,
        double[] a, double[] b, double[] qtb)
    {
        // √W·X column-major for the Householder QR, which runs on this thread and allocates nothing more (a library
        // QR may start worker threads for every small fit).
        for (var i = 0; i < n; i++)
        {
            var sw = w is null ? 1.0 : Math.Sqrt(w[i]);
            if (!double.IsFinite(sw) || !double.IsFinite(y[i]))
                return Failed(model, names, n, p, FitExit.InvalidValues, $"point {i + 1} has a non-finite value or weight");
            for (var j = 0; j < p; j++) a[j * n + i] = sw * x[j * n + i];
            b[i] = sw * y[i];
        }

        // Columns are scaled to unit length before the factorisation, so the rank test compares like with like
        // and badly scaled designs (x up to 1e6, x² up to 1e12) lose no digits to the scale alone.
        var colNorm = new double[p];
        for (var j = 0; j < p; j++)
        {
            var col = a.AsSpan(j * n, n);
            double scale = 0;
            foreach (var v in col) scale = Math.Max(scale, Math.Abs(v));
            if (scale == 0)
                return Failed(model, names, n, p, FitExit.Singular, $"the design is singular: '{names[j]}' has an all-zero column", j);
            double ss = 0;
            foreach (var v in col) { var u = v / scale; ss += u * u; }
            colNorm[j] = scale * Math.Sqrt(ss);
            for (var i = 0; i < n; i++) col[i] /= colNorm[j];
        }
        var tau = new double[p];
        var rDiag = new double[p];
        Householder.Factor(a, n, p, tau, rDiag);
        for (var j = 0; j < p; j++)
            if (Math.Abs(rDiag[j]) <= 1e-11)
                return Failed(model, names, n, p, FitExit.Singular, $"the design is singular: '{names[j]}' is not separable from the others", j);

        // γ = R⁻¹·(Qᵀb)[0..p); the residual vector of the scaled problem is Qᵀb with its first p entries set to zero,
        // and β_j = γ_j / ‖column j‖.
        b.AsSpan(0, n).CopyTo(qtb);
        Householder.ApplyQt(a, n, p, tau, qtb);
        var gamma = new double[p];
        Householder.SolveR(a, n, p, rDiag, qtb, gamma);
        var beta = new double[p];
        for (var j = 0; j < p; j++) beta[j] = gamma[j] / colNorm[j];
        var resid = new double[n];
        double chi2 = 0;
        for (var i = 0; i < n; i++)
        {
            var sw = w is null ? 1.0 : Math.Sqrt(w[i]);
            double f = 0;
            for (var j = 0; j < p; j++) f += x[j * n + i] * beta[j];
            var rw = b[i] - sw * f;
            resid[i] = sw > 0 ? rw / sw : y[i] - f;
            chi2 += rw * rw;
        }
        var dof = n - p;
        var s2 = chi2 / dof;
        // (XᵀWX)⁻¹ in scaled columns = R⁻¹·R⁻ᵀ; R⁻¹ by back substitution, column by column.
        var rInv = new double[p, p];
        for (var c = 0; c < p; c++)
            for (var i = c; i >= 0; i--)
            {
                var v = i == c ? 1.0 : 0.0;
                for (var k = i + 1; k <= c; k++) v -= a[k * n + i] * rInv[k, c];
                rInv[i, c] = v / rDiag[i];
            }
        var cov = new double[p, p];
        for (var j = 0; j < p; j++)
            for (var k = 0; k < p; k++)
            {
                double c = 0;
                for (var m = Math.Max(j, k); m < p; m++) c += rInv[j, m] * rInv[k, m];
                cov[j, k] = s2 * c / (colNorm[j] * colNorm[k]);
            }

        var hasIntercept = false;
        for (var j = 0; j < p && !hasIntercept; j++)
        {
            var all = true;
            for (var i = 0; i < n && all; i++) all = x[j * n + i] == 1.0;
            hasIntercept = all;
        }
        double ybar = 0, wsum = 0;
        for (var i = 0; i < n; i++) { var wi = w?[i] ?? 1; ybar += wi * y[i]; wsum += wi; }
        ybar /= wsum;
        double tss = 0;
        for (var i = 0; i < n; i++)
        {
            var wi = w?[i] ?? 1;
            var d = hasIntercept ? y[i] - ybar : y[i];
            tss += wi * d * d;
        }

        var pars = new FitParameter[p];
        for (var j = 0; j < p; j++) pars[j] = new FitParameter(names[j], beta[j], Math.Sqrt(cov[j, j]), double.NaN);
        return new FitResult
        {
            Model = model, Parameters = pars, Covariance = cov, Residuals = resid, PointCount = n, VariedCount = p,
            ChiSquare = chi2, RSquared = 1 - chi2 / tss, Iterations = 1, Exit = FitExit.Converged,
        };
    }

    /// <summary>Straight line y = intercept + slope·x.</summary>
    public static FitResult Line(ReadOnlySpan<double> x, ReadOnlySpan<double> y, ReadOnlySpan<double> weights = default)
    {
        var n = x.Length;
        if (y.Length != n) throw new ArgumentException("y must have one value per design row", nameof(y));
        var d = ArrayPool<double>.Shared.Rent(2 * n);
        try
        {
            d.AsSpan(0, n).Fill(1);
            x.CopyTo(d.AsSpan(n, n));
            return FitColumns("straight line", LineNames, d, n, 2, y, weights);
        }
        finally { ArrayPool<double>.Shared.Return(d); }
    }

    private static readonly string[] LineNames = ["intercept", "slope"];
    private static readonly string[][] PolynomialNames = [.. Enumerable.Range(0, 8).Select(d => Enumerable.Range(0, d + 1).Select(k => $"c{k}").ToArray())];

    /// <summary>Polynomial y = Σ c_k·(x − x0)^k, k = 0..degree; parameter names c0, c1, …</summary>
    public static FitResult Polynomial(ReadOnlySpan<double> x, ReadOnlySpan<double> y, int degree, double x0 = 0, ReadOnlySpan<double> weights = default)
    {
        var n = x.Length;
        var p = degree + 1;
        if (y.Length != n) throw new ArgumentException("y must have one value per design row", nameof(y));
        var d = ArrayPool<double>.Shared.Rent(n * p);
        try
        {
            for (var i = 0; i < n; i++)
            {
                var v = 1.0;
                for (var k = 0; k <= degree; k++) { d[k * n + i] = v; v *= x[i] - x0; }
            }
            var names = degree < PolynomialNames.Length ? PolynomialNames[degree] : Enumerable.Range(0, p).Select(k => $"c{k}").ToArray();
            return FitColumns($"polynomial of degree {degree}", names, d, n, p, y, weights);
        }
        finally { ArrayPool<double>.Shared.Return(d); }
    }

    private static FitResult Failed(string model, IReadOnlyList<string> names, int n, int p, FitExit exit, string detail, int? singular = null) => new()
    {
        Model = model,
        Parameters = names.Select(nm => new FitParameter(nm, double.NaN, double.NaN, double.NaN)).ToArray(),
        Residuals = [], PointCount = n, VariedCount = p, ChiSquare = double.NaN, RSquared = double.NaN, Exit = exit, ExitDetail = detail,
        SingularParameter = singular,
    };
}
