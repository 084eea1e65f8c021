namespace TraceKin.Fitting;

/// <summary>
/// A model whose value at each point depends only on the parameters and on that point's covariates (its row of
/// inputs to the model): points with equal rows have equal values and equal derivatives.
/// </summary>
internal interface IRowModel : IFitModel
{
    /// <summary>How many covariates a point has.</summary>
    int CovariateCount { get; }

    /// <summary>Writes the covariates of <paramref name="point"/> into <paramref name="row"/> (length <see cref="CovariateCount"/>).</summary>
    void Covariates(int point, Span<double> row);

    /// <summary>The same model on the given points only, in that order.</summary>
    IFitModel OnPoints(IReadOnlyList<int> points);
}

/// <summary>
/// <see cref="NonlinearLeastSquares"/> on a design with replicate points, fitted once per distinct covariate row and
/// reported as the fit to every point. The weighted sum of squares splits into a between-group part and a within-group
/// part that no parameter can change,
/// Σ_i w_i (y_i − f_g)² = Σ_g W_g (ȳ_g − f_g)² + Σ_g Σ_{i∈g} w_i (y_i − ȳ_g)², W_g = Σ_{i∈g} w_i, ȳ_g the weighted mean
/// (the pure-error part of the lack-of-fit decomposition: Draper &amp; Smith, Applied Regression Analysis, 3rd ed.,
/// §2.1, from memory). So the groups' means with weights W_g, with the constant within-group sum added to chi-square
/// (<see cref="FitOptions.ConstantChiSquare"/>), have the same gradient, the same JᵀWJ, the same chi-square and so the
/// same Levenberg–Marquardt path as the ungrouped fit, up to rounding. The result is then given as the ungrouped fit
/// gives it: chi-square with the within-group sum, the original point count and degrees of freedom (s² = χ²/(n − p) for
/// the covariance), R² against the original points, a residual per original point. Where grouping does not pay (fewer
/// than two points per group on average) or the ungrouped fit would stop on its inputs (a non-finite value or weight,
/// too few groups for the parameters, a model value that is not finite), the ungrouped fit is run instead.
/// </summary>
internal static class GroupedLeastSquares
{
    /// <summary>Grouping is used only when the points are at least this many times the groups.</summary>
    public const int MinPointsPerGroup = 2;

    public static FitResult Fit(IRowModel model, ReadOnlySpan<double> y, double[] start, FitOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(model);
        options ??= new FitOptions();
        var n = model.PointCount;
        var w = options.Weights;
        if (y.Length != n || (w is not null && w.Length != n) || start.Length != model.ParameterNames.Count)
            return NonlinearLeastSquares.Fit(model, y, start, options); // says what is wrong
        for (var i = 0; i < n; i++)
        {
            var wi = w?[i] ?? 1.0;
            if (!(wi >= 0) || !double.IsFinite(wi) || (wi > 0 && !double.IsFinite(y[i])))
                return NonlinearLeastSquares.Fit(model, y, start, options);
        }

        var groups = Group(model, w);
        var varied = start.Length - (options.Fixed?.Count(f => f) ?? 0);
        if (groups.Count <= varied || (long)groups.Count * MinPointsPerGroup > groups.Used)
            return NonlinearLeastSquares.Fit(model, y, start, options);

        // Group weights, weighted means and the within-group sum, summed in point order.
        var g = groups.Count;
        var wg = new double[g];
        var mean = new double[g];
        for (var i = 0; i < n; i++)
            if (groups.Of[i] is var k and >= 0) { var wi = w?[i] ?? 1.0; wg[k] += wi; mean[k] += wi * y[i]; }
        for (var k = 0; k < g; k++) mean[k] /= wg[k];
        double within = 0;
        for (var i = 0; i < n; i++)
            if (groups.Of[i] is var k and >= 0) { var d = y[i] - mean[k]; within += (w?[i] ?? 1.0) * d * d; }

        var reduced = model.OnPoints(groups.First);
        var fit = NonlinearLeastSquares.Fit(reduced, mean, start,
            options with { Weights = wg, ConstantChiSquare = options.ConstantChiSquare + within });
        if (fit.Exit is FitExit.InvalidValues or FitExit.TooFewPoints)
            return NonlinearLeastSquares.Fit(model, y, start, options); // its message names the original point
        return AsUngrouped(fit, reduced, groups, y, w, varied);
    }

    /// <summary>The grouped fit as the ungrouped one reports it.</summary>
    private static FitResult AsUngrouped(FitResult fit, IFitModel reduced, Groups groups, ReadOnlySpan<double> y, double[]? w, int varied)
    {
        int n = groups.Of.Length, used = groups.Used;
        if (fit.Residuals.Length == 0) return fit with { PointCount = used }; // stopped before a solution: no chi-square, no residuals

        // s² = χ²/(n − p) instead of χ²/(G − p): the covariance scales by (G − p)/(n − p).
        double[,]? cov = null;
        var pars = fit.Parameters.ToArray();
        if (fit.Covariance is { } c)
        {
            var scale = (double)(groups.Count - varied) / (used - varied);
            var np = pars.Length;
            cov = new double[np, np];
            for (var a = 0; a < np; a++)
                for (var b = 0; b < np; b++) cov[a, b] = c[a, b] * scale;
            for (var j = 0; j < np; j++)
                if (pars[j].Varied && double.IsFinite(pars[j].StdError)) pars[j] = pars[j] with { StdError = Math.Sqrt(cov[j, j]) };
        }

        // Residual per original point (y − f at the solution), and R² against the weighted mean of the original points.
        var f = new double[groups.Count];
        reduced.Evaluate(fit.Parameters.Select(q => q.Value).ToArray(), f);
        var resid = new double[n];
        double wsum = 0, ybar = 0;
        for (var i = 0; i < n; i++)
        {
            if (groups.Of[i] < 0) continue;
            var wi = w?[i] ?? 1.0;
            resid[i] = y[i] - f[groups.Of[i]];
            wsum += wi; ybar += wi * y[i];
        }
        ybar /= wsum;
        double tss = 0;
        for (var i = 0; i < n; i++)
            if (groups.Of[i] >= 0) tss += (w?[i] ?? 1.0) * (y[i] - ybar) * (y[i] - ybar);
        return fit with
        {
            Parameters = pars, Covariance = cov, Residuals = resid, PointCount = used, RSquared = 1 - fit.ChiSquare / tss,
        };
    }

    /// <summary>The points with a positive weight grouped by equal covariate rows (groups in the order of their first point).</summary>
    /// <param name="Of">The group of each point, −1 for a point of zero weight.</param>
    /// <param name="First">The first point of each group.</param>
    /// <param name="Used">How many points have a positive weight.</param>
    internal sealed record Groups(int[] Of, int[] First, int Used)
    {
        public int Count => First.Length;
    }

    internal static Groups Group(IRowModel model, double[]? weights)
    {
        int n = model.PointCount, m = model.CovariateCount;
        var rows = new double[n * m];
        for (var i = 0; i < n; i++)
        {
            var row = rows.AsSpan(i * m, m);
            model.Covariates(i, row);
            for (var j = 0; j < m; j++) if (row[j] == 0) row[j] = 0; // −0 and +0 are one value
        }
        var index = new Dictionary<int, int>(new RowComparer(rows, m));
        var of = new int[n];
        var first = new List<int>();
        var used = 0;
        for (var i = 0; i < n; i++)
        {
            if (!((weights?[i] ?? 1.0) > 0)) { of[i] = -1; continue; }
            used++;
            if (!index.TryGetValue(i, out var k)) { index[i] = k = first.Count; first.Add(i); }
            of[i] = k;
        }
        return new Groups(of, first.ToArray(), used);
    }

    /// <summary>Points compared by their covariate rows, exactly (a NaN never equals anything, so it stays alone).</summary>
    private sealed class RowComparer(double[] rows, int m) : IEqualityComparer<int>
    {
        public bool Equals(int a, int b) => rows.AsSpan(a * m, m).SequenceEqual(rows.AsSpan(b * m, m)) && !HasNaN(a);

        public int GetHashCode(int a)
        {
            var h = new HashCode();
            foreach (var v in rows.AsSpan(a * m, m)) h.Add(v);
            return h.ToHashCode();
        }

        private bool HasNaN(int a)
        {
            foreach (var v in rows.AsSpan(a * m, m)) if (double.IsNaN(v)) return true;
            return false;
        }
    }
}
