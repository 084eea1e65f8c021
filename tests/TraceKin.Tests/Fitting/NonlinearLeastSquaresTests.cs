using TraceKin.Fitting;

namespace TraceKin.Tests.Fitting;

/// <summary>Behaviour of the Levenberg–Marquardt engine beyond the NIST oracles: bounds, fixed parameters, weights, honest exits.</summary>
public sealed class NonlinearLeastSquaresTests
{
    // NIST StRD nonlinear regression, Misra1a.dat, certified values.
    private const double B1 = 2.3894212918E+02, B2 = 5.5015643181E-04, Sd1 = 2.7070075241E+00, Sd2 = 7.2668688436E-06;

    private static (CurveModel Model, double[] Y) Misra1a(bool analytic = false)
    {
        var nist = NistStrdFile.Read("nonlinear", "Misra1a.dat");
        var x = nist.X.Select(r => r[0]).ToArray();
        Action<double[], double, Span<double>>? grad = analytic
            ? (b, xi, g) => { var e = Math.Exp(-b[1] * xi); g[0] = 1 - e; g[1] = b[0] * xi * e; }
            : null;
        return (new CurveModel("Misra1a", ["b1", "b2"], x, (b, xi) => b[0] * (1 - Math.Exp(-b[1] * xi)), grad), nist.Y);
    }

    [Fact]
    public void Analytic_jacobian_reaches_the_certified_misra1a_values()
    {
        var (m, y) = Misra1a(analytic: true);
        var fit = NonlinearLeastSquares.Fit(m, y, [500, 1e-4]);
        Assert.Equal(FitExit.Converged, fit.Exit);
        Assert.True(NistStrdFile.Lre(fit.Value("b1"), B1) >= 8);
        Assert.True(NistStrdFile.Lre(fit.Value("b2"), B2) >= 8);
        Assert.True(NistStrdFile.Lre(fit["b1"].StdError, Sd1) >= 6);
        Assert.True(NistStrdFile.Lre(fit["b2"].StdError, Sd2) >= 6);
    }

    [Fact]
    public void Start_vector_is_not_changed_by_the_fit()
    {
        var (m, y) = Misra1a();
        double[] start = [500, 1e-4];
        NonlinearLeastSquares.Fit(m, y, start);
        Assert.Equal([500, 1e-4], start);
    }

    [Fact]
    public void Fixing_b1_at_its_certified_value_returns_the_certified_b2()
    {
        // At the joint optimum ∂χ²/∂b2 = 0, so the conditional optimum with b1 fixed there is the certified b2.
        var (m, y) = Misra1a();
        var fit = NonlinearLeastSquares.Fit(m, y, [B1, 1e-4], new FitOptions { Fixed = [true, false] });
        Assert.Equal(FitExit.Converged, fit.Exit);
        Assert.Equal(B1, fit.Value("b1"));
        Assert.False(fit["b1"].Varied);
        Assert.Equal(1, fit.VariedCount);
        Assert.True(NistStrdFile.Lre(fit.Value("b2"), B2) >= 8);
    }

    [Fact]
    public void A_bound_below_the_optimum_stops_the_fit_at_that_bound_and_says_so()
    {
        var (m, y) = Misra1a();
        var fit = NonlinearLeastSquares.Fit(m, y, [500, 1e-4], new FitOptions { Upper = [double.PositiveInfinity, 5e-4] });
        Assert.Equal(FitExit.AtBound, fit.Exit);
        Assert.Equal(5e-4, fit.Value("b2"));
        Assert.True(double.IsNaN(fit["b2"].StdError));
        Assert.Contains("b2", fit.ExitDetail);
        Assert.False(fit.Converged);
    }

    [Fact]
    public void Uniform_weights_are_relative_and_leave_values_and_errors_unchanged()
    {
        var (m, y) = Misra1a();
        var plain = NonlinearLeastSquares.Fit(m, y, [500, 1e-4]);
        var weighted = NonlinearLeastSquares.Fit(m, y, [500, 1e-4], new FitOptions { Weights = Enumerable.Repeat(25.0, y.Length).ToArray() });
        Assert.Equal(plain.Value("b2"), weighted.Value("b2"), 1e-12);
        Assert.Equal(1.0, plain["b2"].StdError / weighted["b2"].StdError, 1e-7);
    }

    [Fact]
    public void A_zero_weight_removes_a_point_from_the_fit_and_from_the_degrees_of_freedom()
    {
        var (m, y) = Misra1a();
        var spoiled = (double[])y.Clone();
        spoiled[5] += 1000; // a gross outlier
        var w = Enumerable.Repeat(1.0, y.Length).ToArray();
        w[5] = 0;
        var fit = NonlinearLeastSquares.Fit(m, spoiled, [500, 1e-4], new FitOptions { Weights = w });
        Assert.Equal(y.Length - 1, fit.PointCount);
        Assert.Equal(y.Length - 3, fit.DegreesOfFreedom);
        // Dropping one of 14 points moves b1 by much less than 3 % (its certified SE is 1.1 %).
        Assert.Equal(B1, fit.Value("b1"), B1 * 0.03);
    }

    [Fact]
    public void Parameters_that_only_appear_as_a_product_are_reported_singular_by_name()
    {
        var x = Enumerable.Range(1, 10).Select(i => (double)i).ToArray();
        var y = x.Select(v => 3 * v + 0.01 * Math.Sin(v)).ToArray();
        var m = new CurveModel("product", ["a", "b"], x, (p, v) => p[0] * p[1] * v);
        var fit = NonlinearLeastSquares.Fit(m, y, [1, 2]);
        Assert.Equal(FitExit.Singular, fit.Exit);
        Assert.Matches("'a'|'b'", fit.ExitDetail);
        Assert.All(fit.Parameters, p => Assert.True(double.IsNaN(p.StdError)));
    }

    [Fact]
    public void A_singular_fit_names_the_parameter_to_blame_by_index_as_well_as_in_words()
    {
        // a·b·x: only the product is determined (common practice, no source); the index is the parameter the detail names.
        var x = Enumerable.Range(1, 10).Select(i => (double)i).ToArray();
        var y = x.Select(v => 3 * v + 0.01 * Math.Sin(v)).ToArray();
        var m = new CurveModel("product", ["a", "b"], x, (p, v) => p[0] * p[1] * v);
        var fit = NonlinearLeastSquares.Fit(m, y, [1, 2]);
        Assert.Equal(FitExit.Singular, fit.Exit);
        Assert.NotNull(fit.SingularParameter);
        Assert.Contains($"'{fit.Parameters[fit.SingularParameter!.Value].Name}'", fit.ExitDetail);
    }

    [Fact]
    public void A_parameter_without_effect_is_the_singular_one()
    {
        // c multiplies nothing: its Jacobian column is zero at every point (common practice, no source).
        var x = Enumerable.Range(1, 8).Select(i => (double)i).ToArray();
        var y = x.Select(v => 2 * v + 1).ToArray();
        var m = new CurveModel("line", ["a", "c", "b"], x, (p, v) => p[0] + p[2] * v + 0 * p[1]);
        var fit = NonlinearLeastSquares.Fit(m, y, [0.5, 1, 1]);
        Assert.Equal(FitExit.Singular, fit.Exit);
        Assert.Equal(1, fit.SingularParameter);
        Assert.Contains("'c'", fit.ExitDetail);
    }

    [Fact]
    public void A_converged_fit_blames_no_parameter()
    {
        var (m, y) = Misra1a(analytic: true);
        var fit = NonlinearLeastSquares.Fit(m, y, [500, 1e-4]);
        Assert.Equal(FitExit.Converged, fit.Exit);
        Assert.Null(fit.SingularParameter);
    }

    [Fact]
    public void A_linear_design_with_a_repeated_column_blames_the_repeat()
    {
        // Columns 1 and 2 equal: the second is not separable from the first (common practice, no source).
        var x = new double[6, 2];
        for (var i = 0; i < 6; i++) { x[i, 0] = i + 1; x[i, 1] = i + 1; }
        var fit = LinearLeastSquares.Fit("repeat", ["u", "v"], x, [1.0, 2.1, 2.9, 4.2, 5.0, 6.1]);
        Assert.Equal(FitExit.Singular, fit.Exit);
        Assert.Equal(1, fit.SingularParameter);
        Assert.Contains("'v'", fit.ExitDetail);
    }

    [Fact]
    public void A_model_that_gives_nan_at_the_start_is_reported_as_invalid_values()
    {
        var x = new[] { 1.0, 2, 3, 4 };
        var m = new CurveModel("log", ["a"], x, (p, v) => Math.Log(p[0] * v));
        var fit = NonlinearLeastSquares.Fit(m, [0.1, 0.2, 0.3, 0.4], [-1]);
        Assert.Equal(FitExit.InvalidValues, fit.Exit);
        Assert.Contains("point 1", fit.ExitDetail);
    }

    [Fact]
    public void Too_few_points_for_the_varied_parameters_is_reported()
    {
        var m = new CurveModel("line", ["a", "b"], [1.0, 2.0], (p, v) => p[0] + p[1] * v);
        var fit = NonlinearLeastSquares.Fit(m, [1.0, 2.0], [0, 0]);
        Assert.Equal(FitExit.TooFewPoints, fit.Exit);
    }

    [Fact]
    public void Hitting_the_iteration_limit_is_reported_and_carries_no_standard_errors()
    {
        var (m, y) = Misra1a();
        var fit = NonlinearLeastSquares.Fit(m, y, [500, 1e-4], new FitOptions { MaxIterations = 2 });
        Assert.Equal(FitExit.MaxIterations, fit.Exit);
        Assert.All(fit.Parameters, p => Assert.True(double.IsNaN(p.StdError)));
        Assert.Contains("did not converge (MaxIterations)", fit.ToReport());
    }
}
