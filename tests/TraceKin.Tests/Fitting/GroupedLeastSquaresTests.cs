using TraceKin.Fitting;
using TraceKin.Series;

namespace TraceKin.Tests.Fitting;

/// <summary>
/// A fit over replicate points done once per distinct covariate row is the fit to every point: the weighted sum of
/// squares splits into between-group and within-group (pure-error) parts (Draper &amp; Smith, Applied Regression
/// Analysis, 3rd ed., §2.1, from memory), so the reference for every number here is the ungrouped
/// <see cref="NonlinearLeastSquares"/> fit, and for the Puromycin data the published fit.
/// </summary>
public sealed class GroupedLeastSquaresTests
{
    /// <summary>Agreement when both fits stop at the same iteration: rounding only.</summary>
    private const double Tight = 1e-9;

    /// <summary>
    /// Agreement in the parameters and their errors when one fit takes one step more than the other: the fitter stops on a
    /// relative reduction in chi-square of 1e-16 (tolerance 1e-12 × 1e-4), at the rounding floor of chi-square, so the
    /// last step can fall either side of the test; a step that small moves the parameters by well under 1e-7 relative
    /// (NonlinearLeastSquares's own accuracy at convergence). Chi-square, AICc and R² agree to 1e-12 either way.
    /// </summary>
    private const double LastStep = 1e-7;

    [Fact]
    public void Puromycin_treated_duplicates_fitted_as_six_groups_give_the_published_fit()
    {
        // R Core Team, "An Introduction to R", §11.7.1 (nls on Puromycin, treated); Bates & Watts (1988), App. A1.3:
        // twelve rates at six concentrations, each measured twice.
        var (x, v) = TraceKin.Tests.Series.SaturationTests.PuromycinTreated();
        var model = SaturationModel.Hyperbola(x);
        Assert.Equal(6, GroupedLeastSquares.Group(model, null).Count);
        var fit = GroupedLeastSquares.Fit(model, v, [200, 0.1]);
        TraceKin.Tests.Series.SaturationTests.AssertPublishedTreatedFit(fit);
        Assert.Equal(12, fit.PointCount);
        Assert.Equal(10, fit.DegreesOfFreedom);
        Same(NonlinearLeastSquares.Fit(model, v, [200, 0.1]), fit, v);
    }

    [Theory]
    [InlineData(11, false)] // the two fits stop one iteration apart
    [InlineData(11, true)]  // likewise
    [InlineData(29, false)] // the same iteration
    [InlineData(29, true)]  // likewise
    public void Replicate_design_fitted_by_groups_equals_the_fit_to_every_run(int seed, bool weighted)
    {
        // Invented: 6 [S]0 levels × 2 co-reactant levels × 5 replicates, saturating in [S]0 (Km 2 mM), order 0.7 in [Y]0.
        var (model, v, w) = Design(seed, weighted, saturating: true);
        var start = model.Guess(v, [0.5]);
        var lower = new[] { 0.0, 0.0, double.NegativeInfinity };
        var options = new FitOptions { Weights = w, Lower = lower };
        Assert.Equal(12, GroupedLeastSquares.Group(model, w).Count);
        var reference = NonlinearLeastSquares.Fit(model, v, start, options);
        Assert.True(reference.Converged, reference.ExitDetail);
        Same(reference, GroupedLeastSquares.Fit(model, v, start, options), v);
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void A_series_without_saturation_runs_away_the_same_way_grouped_or_not(bool weighted)
    {
        // Rates proportional to [S]0: Km climbs without end, and both fits stop on the iteration budget at the same place.
        var (model, v, w) = Design(weighted ? 5 : 2, weighted, saturating: false);
        var start = model.Guess(v, [0.5]);
        var options = new FitOptions { Weights = w, Lower = [0, 0, double.NegativeInfinity], MaxIterations = 60 };
        var reference = NonlinearLeastSquares.Fit(model, v, start, options);
        Assert.Equal(FitExit.MaxIterations, reference.Exit);
        Assert.True(reference.Value("Km") > 10 * 0.02, "Km has run beyond the data");
        var grouped = GroupedLeastSquares.Fit(model, v, start, options);
        Assert.Equal(reference.Exit, grouped.Exit);
        Assert.Equal(reference.ExitDetail, grouped.ExitDetail);
        Assert.Equal(reference.Iterations, grouped.Iterations);
        Assert.Equal(reference.PointCount, grouped.PointCount);
        // Far along a flat valley the path amplifies rounding; after 60 iterations it stops at the same place to 1e-9.
        for (var j = 0; j < reference.Parameters.Count; j++)
            Assert.Equal(reference.Parameters[j].Value, grouped.Parameters[j].Value, Tight * Math.Abs(reference.Parameters[j].Value));
        Assert.Equal(reference.ChiSquare, grouped.ChiSquare, 1e-12 * reference.ChiSquare);
    }

    [Fact]
    public void A_design_without_replicates_is_fitted_point_by_point()
    {
        var x = new[] { 0.1, 0.2, 0.4, 0.8, 1.6, 3.2 };
        var v = x.Select(s => 2 * s / (0.5 + s) * (1 + 0.01 * Math.Sin(7 * s))).ToArray();
        var model = SaturationModel.Hyperbola(x);
        var reference = NonlinearLeastSquares.Fit(model, v, [2, 0.4]);
        var grouped = GroupedLeastSquares.Fit(model, v, [2, 0.4]);
        Assert.Equal(reference.Parameters, grouped.Parameters);
        Assert.Equal(reference.ChiSquare, grouped.ChiSquare);
    }

    [Fact]
    public void A_non_finite_rate_is_reported_at_its_own_point_as_the_ungrouped_fit_reports_it()
    {
        var (model, v, _) = Design(3, false, saturating: true);
        v[17] = double.NaN;
        var start = model.Guess(v.Select(r => double.IsNaN(r) ? 0 : r).ToArray(), [0.5]);
        var reference = NonlinearLeastSquares.Fit(model, v, start);
        var grouped = GroupedLeastSquares.Fit(model, v, start);
        Assert.Equal(FitExit.InvalidValues, grouped.Exit);
        Assert.Equal(reference.ExitDetail, grouped.ExitDetail);
    }

    [Fact]
    public void Points_of_zero_weight_stay_out_of_the_groups_and_keep_a_zero_residual()
    {
        var (model, v, w) = Design(7, true, saturating: true);
        w![3] = 0;
        w[40] = 0;
        var start = model.Guess(v, [0.5]);
        var options = new FitOptions { Weights = w, Lower = [0, 0, double.NegativeInfinity] };
        var reference = NonlinearLeastSquares.Fit(model, v, start, options);
        var grouped = GroupedLeastSquares.Fit(model, v, start, options);
        Assert.Equal(58, grouped.PointCount);
        Assert.Equal(0, grouped.Residuals[3]);
        Same(reference, grouped, v);
    }

    private static (SaturationModel Model, double[] V, double[]? W) Design(int seed, bool weighted, bool saturating)
    {
        var rng = new Random(seed);
        double[] sLevels = [0.5e-3, 1e-3, 2e-3, 4e-3, 8e-3, 16e-3], yLevels = [1e-3, 3e-3];
        var s = new List<double>();
        var lny = new List<double>();
        var v = new List<double>();
        var w = new List<double>();
        foreach (var sl in sLevels)
            foreach (var yl in yLevels)
                for (var r = 0; r < 5; r++)
                {
                    var truth = (saturating ? 4e-6 * sl / (2e-3 + sl) : 1e-3 * sl) * Math.Pow(yl / 1e-3, 0.7);
                    var se = truth * (0.02 + 0.03 * rng.NextDouble());
                    var z = Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
                    s.Add(sl); lny.Add(Math.Log(yl)); v.Add(truth + se * z); w.Add(1 / (se * se));
                }
        var lnMatrix = new double[s.Count, 1];
        for (var i = 0; i < s.Count; i++) lnMatrix[i, 0] = lny[i];
        return (new SaturationModel(s.ToArray(), lnMatrix, ["Y"]), v.ToArray(), weighted ? w.ToArray() : null);
    }

    /// <summary>Every number the fit reports, equal to the reference (see <see cref="Tight"/> and <see cref="LastStep"/>).</summary>
    private static void Same(FitResult expected, FitResult actual, double[] y)
    {
        static void Near(double e, double a, double tol, string what) =>
            Assert.True(Math.Abs(e - a) <= tol * Math.Max(Math.Abs(e), Math.Abs(a)) || (double.IsNaN(e) && double.IsNaN(a)), $"{what}: {e:R} against {a:R}");
        Assert.Equal(expected.Exit, actual.Exit);
        Assert.InRange(actual.Iterations, expected.Iterations - 1, expected.Iterations + 1);
        var tol = actual.Iterations == expected.Iterations ? Tight : LastStep;
        Assert.Equal(expected.PointCount, actual.PointCount);
        Assert.Equal(expected.DegreesOfFreedom, actual.DegreesOfFreedom);
        for (var j = 0; j < expected.Parameters.Count; j++)
        {
            Near(expected.Parameters[j].Value, actual.Parameters[j].Value, tol, expected.Parameters[j].Name);
            Near(expected.Parameters[j].StdError, actual.Parameters[j].StdError, tol, "SE " + expected.Parameters[j].Name);
        }
        Assert.NotNull(expected.Covariance);
        Assert.NotNull(actual.Covariance);
        // Each entry against the scale of its row and column (an off-diagonal entry can be near zero).
        var e = expected.Covariance!;
        var a = actual.Covariance!;
        for (var i = 0; i < expected.Parameters.Count; i++)
            for (var j = 0; j < expected.Parameters.Count; j++)
                Assert.True(Math.Abs(e[i, j] - a[i, j]) <= 2 * tol * Math.Sqrt(e[i, i] * e[j, j]), $"covariance [{i}, {j}]: {e[i, j]:R} against {a[i, j]:R}");
        Near(expected.ChiSquare, actual.ChiSquare, 1e-12, "chi-square");
        Near(expected.AicC, actual.AicC, 1e-12, "AICc");
        Near(expected.RSquared, actual.RSquared, 1e-12, "R²");
        Assert.Equal(expected.Residuals.Length, actual.Residuals.Length);
        // A residual is y − f: its rounding is that of f, on the scale of the data.
        var scale = y.Max(Math.Abs);
        for (var i = 0; i < expected.Residuals.Length; i++)
            Assert.True(Math.Abs(expected.Residuals[i] - actual.Residuals[i]) <= tol * scale, $"residual {i}");
    }
}
