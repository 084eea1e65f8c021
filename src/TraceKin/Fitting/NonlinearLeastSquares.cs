using MathNet.Numerics.LinearAlgebra;

namespace TraceKin.Fitting;

/// <summary>
/// Nonlinear weighted least squares by the Levenberg–Marquardt method with Marquardt's diagonal scaling.
/// Each step solves min ‖[J; √λ·D]·δ − [r; 0]‖ by QR (never the normal equations): J is factored once per
/// iteration, then the small stacked system [R; √λ·D] once per trial λ (Moré 1978, "The Levenberg–Marquardt
/// algorithm: implementation and theory", in Numerical Analysis, ed. G. A. Watson, Springer LNM 630, §2–3). D² = running maximum of diag(JᵀWJ)
/// (Marquardt 1963, SIAM J. Appl. Math. 11, 431; Moré 1978 eq. 6). λ is updated from the gain ratio ρ =
/// actual / predicted reduction (Nielsen 1999, IMM-REP-1999-05, eq. 2.6 as given in Madsen, Nielsen &amp; Tingleff,
/// "Methods for non-linear least squares problems", 2004, §3.2). Bounds are handled by projection with an active
/// set (parameters on a bound whose gradient pushes outwards are held for that step). Covariance s²(JᵀWJ)⁻¹ with
/// s² = Σw·r²/(n − p), from the singular value decomposition of the column-scaled Jacobian at the solution.
/// </summary>
public static class NonlinearLeastSquares
{
    /// <summary>Condition number of the column-scaled Jacobian above which the covariance is reported singular.</summary>
    public const double SingularCondition = 1e13;

    public static FitResult Fit(IFitModel model, ReadOnlySpan<double> y, double[] start, FitOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(start);
        options ??= new FitOptions();
        var names = model.ParameterNames;
        int n = model.PointCount, np = names.Count;
        if (y.Length != n) throw new ArgumentException($"{n} values are needed for model '{model.Name}', got {y.Length}", nameof(y));
        if (start.Length != np) throw new ArgumentException($"{np} start values are needed for model '{model.Name}', got {start.Length}", nameof(start));
        CheckLength(options.Weights, n, "Weights");
        CheckLength(options.Lower, np, "Lower");
        CheckLength(options.Upper, np, "Upper");
        CheckLength(options.Fixed, np, "Fixed");
        var engine = new Engine(model, y, start, options);
        try { return engine.Run(); }
        finally { engine.Release(); }
    }

    /// <summary>
    /// The per-point work arrays of a fit, kept per thread and handed out by exact length (zeroed, so a fit sees what a
    /// fresh array would give). A run fits a dozen laws to the same points: without this each fit allocated about eight
    /// arrays of n and two of n·P, and on short traces the collections cost a fifth of the stage.
    /// </summary>
    private static class Scratch
    {
        [ThreadStatic] private static Dictionary<int, Stack<double[]>>? _free;
        private const int MaxLengths = 64, MaxPerLength = 16;

        public static double[] Rent(int length)
        {
            if (_free is not null && _free.TryGetValue(length, out var stack) && stack.Count > 0)
            {
                var a = stack.Pop();
                Array.Clear(a);
                return a;
            }
            return new double[length];
        }

        public static void Return(double[] a)
        {
            _free ??= new Dictionary<int, Stack<double[]>>();
            if (!_free.TryGetValue(a.Length, out var stack))
            {
                if (_free.Count >= MaxLengths) _free.Clear();
                _free[a.Length] = stack = new Stack<double[]>();
            }
            if (stack.Count < MaxPerLength) stack.Push(a);
        }
    }

    private static void CheckLength<T>(T[]? a, int n, string what)
    {
        if (a is not null && a.Length != n) throw new ArgumentException($"FitOptions.{what} needs {n} entries, got {a.Length}");
    }

    private sealed class Engine
    {
        private readonly IFitModel _model;
        private readonly double[] _y, _sw, _start, _lo, _hi;
        private readonly bool[] _varied;
        private readonly FitOptions _o;
        private readonly int _n, _np, _nUsed, _nVaried;
        private readonly double[] _p, _pTry, _f, _r, _rTry, _jac, _fPlus, _fMinus;
        private readonly double[] _d2, _a, _tau, _rDiag, _qtr, _small, _smallTau, _smallDiag, _rhs, _delta, _step, _g;
        private readonly int[] _free;
        private int _nFree;
        private bool _analyticOk = true;

        public Engine(IFitModel model, ReadOnlySpan<double> y, double[] start, FitOptions o)
        {
            _model = model; _o = o;
            _n = model.PointCount; _np = model.ParameterNames.Count;
            _y = Scratch.Rent(_n); y.CopyTo(_y); _start = (double[])start.Clone();
            _sw = Scratch.Rent(_n);
            for (var i = 0; i < _n; i++)
            {
                var w = o.Weights?[i] ?? 1.0;
                _sw[i] = w > 0 && double.IsFinite(w) ? Math.Sqrt(w) : (w == 0 ? 0 : double.NaN);
                if (_sw[i] > 0) _nUsed++;
            }
            _lo = o.Lower ?? Enumerable.Repeat(double.NegativeInfinity, _np).ToArray();
            _hi = o.Upper ?? Enumerable.Repeat(double.PositiveInfinity, _np).ToArray();
            _varied = new bool[_np];
            for (var j = 0; j < _np; j++) { _varied[j] = !(o.Fixed?[j] ?? false); if (_varied[j]) _nVaried++; }
            _p = new double[_np]; _pTry = new double[_np];
            _f = Scratch.Rent(_n); _r = Scratch.Rent(_n); _rTry = Scratch.Rent(_n);
            _jac = Scratch.Rent(_n * _np); _fPlus = Scratch.Rent(_n); _fMinus = Scratch.Rent(_n);
            _d2 = new double[_np]; _free = new int[_np];
            _a = Scratch.Rent(_n * _np); _tau = new double[_np]; _rDiag = new double[_np]; _qtr = Scratch.Rent(_n);
            _small = new double[2 * _np * _np]; _smallTau = new double[_np]; _smallDiag = new double[_np];
            _rhs = new double[2 * _np]; _delta = new double[_np]; _step = new double[_np]; _g = new double[_np];
        }

        /// <summary>Gives the per-point arrays back to this thread's scratch (after the result has been built).</summary>
        public void Release()
        {
            foreach (var a in new[] { _y, _sw, _f, _r, _rTry, _jac, _fPlus, _fMinus, _a, _qtr }) Scratch.Return(a);
        }

        public FitResult Run()
        {
            for (var i = 0; i < _n; i++)
                if (double.IsNaN(_sw[i]) || (_sw[i] > 0 && !double.IsFinite(_y[i])))
                    return Fail(FitExit.InvalidValues, $"point {i + 1} has a non-finite value or a negative/non-finite weight", 0);
            for (var j = 0; j < _np; j++)
            {
                if (!double.IsFinite(_start[j]))
                    return Fail(FitExit.InvalidValues, $"the start value of '{Name(j)}' is not finite", 0);
                if (_lo[j] > _hi[j])
                    return Fail(FitExit.InvalidValues, $"the lower bound of '{Name(j)}' exceeds its upper bound", 0);
                _p[j] = Math.Clamp(_start[j], _lo[j], _hi[j]);
            }
            if (_nUsed <= _nVaried)
                return Fail(FitExit.TooFewPoints, $"{_nUsed} points for {_nVaried} varied parameters leave no degrees of freedom", 0);

            if (!Residuals(_p, _f, _r, out var chi2, out var bad))
                return Fail(FitExit.InvalidValues, $"the model gives a non-finite value at point {bad + 1} at the start values", 0);

            double lambda = 1e-3, nu = 2;
            var iterations = 0;
            var exit = FitExit.MaxIterations;
            var detail = $"no convergence within {_o.MaxIterations} iterations";
            // Chi-square changes near the optimum are second order in the parameter error, so the reduction test is
            // taken at tol·1e-4 and the step test at tol·10 (relative, in Marquardt-scaled parameters).
            var tol = _o.Tolerance;
            var ftol = tol * 1e-4;
            var xtol = tol * 10;
            while (iterations < _o.MaxIterations)
            {
                iterations++;
                if (!Jacobian(_p, out var badJ))
                    return Fail(FitExit.InvalidValues, $"the model's derivative is not finite at point {badJ + 1}", iterations);

                // Gradient g = JᵀWr and Marquardt scaling.
                var rNorm = Math.Sqrt(chi2);
                double maxCos = 0;
                for (var j = 0; j < _np; j++)
                {
                    if (!_varied[j]) continue;
                    double g = 0, c = 0;
                    for (var i = 0; i < _n; i++) { var jij = _jac[i * _np + j]; g += jij * _r[i]; c += jij * jij; }
                    _g[j] = g;
                    if (c == 0 && _d2[j] == 0)
                        return Fail(FitExit.Singular, $"'{Name(j)}' has no effect on the model at the current values", iterations, j);
                    _d2[j] = Math.Max(_d2[j], c);
                    if (c > 0 && rNorm > 0) maxCos = Math.Max(maxCos, Math.Abs(g) / (Math.Sqrt(c) * rNorm));
                }
                // Active set: a parameter on a bound whose descent direction (+g, since r = y − f) points outwards.
                _nFree = 0;
                for (var j = 0; j < _np; j++)
                {
                    if (!_varied[j]) continue;
                    var atLo = _p[j] <= _lo[j] && _g[j] < 0;
                    var atHi = _p[j] >= _hi[j] && _g[j] > 0;
                    if (!atLo && !atHi) _free[_nFree++] = j;
                }
                if (chi2 == 0 || maxCos <= tol || _nFree == 0)
                {
                    exit = FitExit.Converged; detail = chi2 == 0 ? "exact fit" : "gradient orthogonal to the residuals";
                    break;
                }

                // QR of the free columns of √W·J (column-major), and Qᵀr.
                int m = _nFree;
                for (var k = 0; k < m; k++)
                {
                    var j = _free[k];
                    for (var i = 0; i < _n; i++) _a[k * _n + i] = _jac[i * _np + j];
                }
                Householder.Factor(_a.AsSpan(0, _n * m), _n, m, _tau, _rDiag);
                Array.Copy(_r, _qtr, _n);
                Householder.ApplyQt(_a.AsSpan(0, _n * m), _n, m, _tau, _qtr);
                double qtr2 = 0;
                for (var k = 0; k < m; k++) qtr2 += _qtr[k] * _qtr[k];

                var accepted = false;
                var converged = false;
                while (true)
                {
                    // Stacked system [R; √λ·D] δ = [Qᵀr; 0], 2m × m, column-major.
                    int rows = 2 * m;
                    Array.Clear(_small, 0, rows * m);
                    for (var k = 0; k < m; k++)
                    {
                        for (var i = 0; i < k; i++) _small[k * rows + i] = _a[k * _n + i];
                        _small[k * rows + k] = _rDiag[k];
                        _small[k * rows + m + k] = Math.Sqrt(lambda * _d2[_free[k]]);
                    }
                    for (var k = 0; k < m; k++) { _rhs[k] = _qtr[k]; _rhs[m + k] = 0; }
                    Householder.Factor(_small.AsSpan(0, rows * m), rows, m, _smallTau, _smallDiag);
                    Householder.ApplyQt(_small.AsSpan(0, rows * m), rows, m, _smallTau, _rhs);
                    if (!Householder.SolveR(_small.AsSpan(0, rows * m), rows, m, _smallDiag, _rhs, _delta))
                    {
                        lambda *= nu; nu *= 2;
                        if (lambda > 1e20) break;
                        continue;
                    }
                    // Projected trial point; the realised step may be shorter than δ where a bound clips it.
                    Array.Copy(_p, _pTry, _np);
                    double stepScaled = 0, pScaled = 0;
                    for (var k = 0; k < m; k++)
                    {
                        var j = _free[k];
                        _pTry[j] = Math.Clamp(_p[j] + _delta[k], _lo[j], _hi[j]);
                        _step[k] = _pTry[j] - _p[j];
                        var dj = Math.Sqrt(_d2[j]);
                        stepScaled += (dj * _step[k]) * (dj * _step[k]);
                        pScaled += (dj * _p[j]) * (dj * _p[j]);
                    }
                    stepScaled = Math.Sqrt(stepScaled); pScaled = Math.Sqrt(pScaled);
                    // Predicted reduction of the linear model: ‖Qᵀr‖² − ‖Qᵀr − R·step‖² over the range of J.
                    double resid2 = 0;
                    for (var i = 0; i < m; i++)
                    {
                        var s = _rDiag[i] * _step[i];
                        for (var k = i + 1; k < m; k++) s += _a[k * _n + i] * _step[k];
                        var d = _qtr[i] - s;
                        resid2 += d * d;
                    }
                    var predicted = qtr2 - resid2;
                    var ok = Residuals(_pTry, _fPlus, _rTry, out var chi2Try, out _);
                    var actual = ok ? chi2 - chi2Try : double.NegativeInfinity;
                    var rho = predicted > 0 ? actual / predicted : -1;

                    if (ok && actual > 0 && rho > 1e-4)
                    {
                        Array.Copy(_pTry, _p, _np);
                        Array.Copy(_fPlus, _f, _n);
                        Array.Copy(_rTry, _r, _n);
                        var chiOld = chi2;
                        chi2 = chi2Try;
                        lambda *= Math.Max(1.0 / 3, 1 - Math.Pow(2 * rho - 1, 3));
                        lambda = Math.Max(lambda, 1e-30);
                        nu = 2;
                        accepted = true;
                        // Moré's (1978) relative-reduction test and a small-step test taken only on a near-Gauss–Newton step.
                        if ((actual <= ftol * chiOld && predicted <= ftol * chiOld && rho > 0.5)
                            || (stepScaled <= xtol * pScaled && lambda < 1e-2))
                            converged = true;
                        break;
                    }
                    if (ok && Math.Abs(actual) <= 4 * double.Epsilon * chi2 + 1e-15 * chi2 && predicted <= 1e-15 * chi2)
                    {
                        // Neither the model nor the data can tell the points apart any more: at the floor of rounding.
                        converged = true;
                        break;
                    }
                    lambda *= nu; nu *= 2;
                    if (lambda > 1e20 || double.IsInfinity(nu)) break;
                }
                if (converged)
                {
                    exit = FitExit.Converged; detail = "relative reduction in chi-square below tolerance";
                    break;
                }
                if (!accepted)
                {
                    // No step lowers chi-square. That is a minimum only if the gradient is (nearly) orthogonal to r.
                    if (maxCos <= 1e-6) { exit = FitExit.Converged; detail = "no further reduction possible at the minimum"; }
                    else { exit = FitExit.Stalled; detail = $"no step reduces chi-square, yet the gradient is not zero (cosine {maxCos:G3})"; }
                    break;
                }
            }
            return Finish(exit, detail, chi2, iterations);
        }

        private string Name(int j) => _model.ParameterNames[j];

        private bool Residuals(double[] p, double[] f, double[] r, out double chi2, out int bad)
        {
            _model.Evaluate(p, f);
            chi2 = _o.ConstantChiSquare; bad = -1;
            for (var i = 0; i < _n; i++)
            {
                if (_sw[i] == 0) { r[i] = 0; continue; }
                if (!double.IsFinite(f[i])) { bad = i; return false; }
                var ri = _sw[i] * (_y[i] - f[i]);
                r[i] = ri; chi2 += ri * ri;
            }
            if (!double.IsFinite(chi2)) { bad = 0; return false; }
            return true;
        }

        /// <summary>√W-weighted ∂f/∂p (row-major n × P), analytic when the model offers it, else differences.</summary>
        private bool Jacobian(double[] p, out int bad)
        {
            bad = -1;
            if (!(_analyticOk && _model.TryJacobian(p, _jac)))
            {
                _analyticOk = false;
                // Central differences, h = ε^(1/3)·max(|p|, tiny) (Nocedal &amp; Wright, "Numerical Optimization",
                // 2nd ed., §8.1, eq. 8.10); one-sided next to a bound.
                var h0 = Math.Cbrt(2.220446049250313e-16);
                for (var j = 0; j < _np; j++)
                {
                    if (!_varied[j]) { for (var i = 0; i < _n; i++) _jac[i * _np + j] = 0; continue; }
                    var pj = p[j];
                    var h = h0 * (pj != 0 ? Math.Abs(pj) : 1.0);
                    double up = Math.Min(pj + h, _hi[j]), dn = Math.Max(pj - h, _lo[j]);
                    if (up == pj && dn == pj) return false;
                    Array.Copy(p, _pTry, _np);
                    _pTry[j] = up; _model.Evaluate(_pTry, _fPlus);
                    _pTry[j] = dn; _model.Evaluate(_pTry, _fMinus);
                    var width = up - dn;
                    for (var i = 0; i < _n; i++) _jac[i * _np + j] = (_fPlus[i] - _fMinus[i]) / width;
                }
            }
            for (var i = 0; i < _n; i++)
                for (var j = 0; j < _np; j++)
                {
                    var v = _jac[i * _np + j] * _sw[i];
                    if (!_varied[j]) v = 0;
                    if (_sw[i] > 0 && !double.IsFinite(v)) { bad = i; return false; }
                    _jac[i * _np + j] = _sw[i] > 0 ? v : 0;
                }
            return true;
        }

        private FitResult Finish(FitExit exit, string detail, double chi2, int iterations)
        {
            var se = Enumerable.Repeat(double.NaN, _np).ToArray();
            double[,]? cov = null;
            int? singular = null;
            var atBound = Enumerable.Range(0, _np).Where(j => _varied[j] && (_p[j] <= _lo[j] || _p[j] >= _hi[j])).ToList();
            if (exit == FitExit.Converged && atBound.Count > 0)
            {
                exit = FitExit.AtBound;
                detail = "stopped on a bound: " + string.Join(", ", atBound.Select(j => $"'{Name(j)}' = {_p[j]:G6}"));
            }
            var dof = _nUsed - _nVaried;
            if (exit is FitExit.Converged or FitExit.AtBound)
            {
                if (!Jacobian(_p, out _))
                    return Fail(FitExit.InvalidValues, "the model's derivative is not finite at the solution", iterations);
                var cols = Enumerable.Range(0, _np).Where(j => _varied[j] && !atBound.Contains(j)).ToArray();
                var m = cols.Length;
                // Column-scaled J = Q·R (thin Householder QR), then the SVD of the small R: same singular values and
                // right vectors as J, without ever forming an n×n factor.
                var norm = new double[m];
                for (var k = 0; k < m; k++)
                {
                    double s = 0;
                    for (var i = 0; i < _n; i++) { var v = _jac[i * _np + cols[k]]; s += v * v; }
                    norm[k] = Math.Sqrt(s);
                    for (var i = 0; i < _n; i++) _a[k * _n + i] = norm[k] > 0 ? _jac[i * _np + cols[k]] / norm[k] : 0;
                }
                Householder.Factor(_a.AsSpan(0, _n * m), _n, m, _tau, _rDiag);
                var jm = Matrix<double>.Build.Dense(m, m);
                for (var k = 0; k < m; k++)
                {
                    jm[k, k] = _rDiag[k];
                    for (var i = 0; i < k; i++) jm[i, k] = _a[k * _n + i];
                }
                if (m > 0)
                {
                    var svd = jm.Svd(true);
                    var sv = svd.S;
                    var smax = sv[0];
                    var smin = sv[m - 1];
                    if (!(smin > 0) || smax / smin > SingularCondition)
                    {
                        var v = svd.VT.Row(m - 1);
                        var blame = Enumerable.Range(0, m).MaxBy(k => Math.Abs(v[k]));
                        exit = FitExit.Singular;
                        singular = cols[blame];
                        detail = $"the covariance is singular (condition {smax / smin:G3}): '{Name(cols[blame])}' is not determined by the data";
                    }
                    else
                    {
                        var s2 = chi2 / dof;
                        cov = new double[_np, _np];
                        for (var a = 0; a < m; a++)
                            for (var b = 0; b < m; b++)
                            {
                                double c = 0;
                                for (var k = 0; k < m; k++) c += svd.VT[k, a] * svd.VT[k, b] / (sv[k] * sv[k]);
                                cov[cols[a], cols[b]] = s2 * c / (norm[a] * norm[b]);
                            }
                        foreach (var j in cols) se[j] = Math.Sqrt(cov[j, j]);
                    }
                }
            }
            // R² against the weighted mean (centred).
            double wsum = 0, ybar = 0;
            for (var i = 0; i < _n; i++) { var w = _sw[i] * _sw[i]; wsum += w; ybar += w * _y[i]; }
            ybar /= wsum;
            double tss = 0;
            for (var i = 0; i < _n; i++) { var w = _sw[i] * _sw[i]; tss += w * (_y[i] - ybar) * (_y[i] - ybar); }
            var resid = new double[_n];
            for (var i = 0; i < _n; i++) resid[i] = _sw[i] > 0 ? _y[i] - _f[i] : 0;
            var pars = new FitParameter[_np];
            for (var j = 0; j < _np; j++) pars[j] = new FitParameter(Name(j), _p[j], _varied[j] ? se[j] : 0, _start[j], _varied[j]);
            return new FitResult
            {
                Model = _model.Name, Parameters = pars, Covariance = cov, Residuals = resid, PointCount = _nUsed,
                VariedCount = _nVaried, ChiSquare = chi2, RSquared = 1 - chi2 / tss, Iterations = iterations,
                Exit = exit, ExitDetail = detail, SingularParameter = singular,
            };
        }

        private FitResult Fail(FitExit exit, string detail, int iterations, int? singular = null) => new()
        {
            Model = _model.Name,
            Parameters = Enumerable.Range(0, _np).Select(j => new FitParameter(Name(j), iterations == 0 ? _start[j] : _p[j], double.NaN, _start[j], _varied[j])).ToArray(),
            Residuals = [], PointCount = _nUsed, VariedCount = _nVaried, ChiSquare = double.NaN, RSquared = double.NaN,
            Iterations = iterations, Exit = exit, ExitDetail = detail, SingularParameter = singular,
        };
    }
}
