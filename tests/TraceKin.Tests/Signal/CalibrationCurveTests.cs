using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Tests.Signal;

public class CalibrationCurveTests
{
    // Invented standards (concentration in mmol/L, signal).
    private static readonly double[] X = [0, 1, 2, 3, 4];
    private static readonly double[] Y = [0.003, 0.205, 0.398, 0.607, 0.801];

    private static CalibrationCurve Linear() => CalibrationCurve.FromStandards(new CalibrationStandards(Y, X, []), "linear", "series.toml");

    [Fact]
    public void Inverse_prediction_error_matches_the_straight_line_formula_worked_by_hand()
    {
        // Miller & Miller, Statistics and Chemometrics for Analytical Chemistry, 6th ed., §5.6:
        // s(x0) = (s/b)·√(1/m + 1/n + (y0 − ȳ)²/(b²·Σ(x − x̄)²)). Worked by hand in exact fractions for the standards above:
        // x̄ = 2, ȳ = 0.4028, Σ(x − x̄)² = 10, Σ(x − x̄)(y − ȳ) = 1.998, b = 0.1998, a = 0.0032, SSE = 4.84e-5,
        // s = √(SSE/3) = 0.004016632088371218. For y0 = 0.5, m = 1: x0 = (0.5 − 0.0032)/0.1998 = 92/37 = 2.486486…,
        // s(x0) = 0.022238125543377264; for y0 = 0.1: x0 = 0.4844844844…, s(x0) = 0.024037306281370678.
        var curve = Linear();
        Assert.Equal(0.1998, curve.Fit.Value("c1"), 1e-14);
        Assert.Equal(0.0032, curve.Fit.Value("c0"), 1e-14);
        Assert.Equal(92.0 / 37, curve.ToConcentration(0.5), 1e-12);
        Assert.Equal(0.022238125543377264, curve.StdError(0.5), 1e-12);
        Assert.Equal(0.024037306281370678, curve.StdError(0.1), 1e-12);
    }

    [Fact]
    public void Averaging_readings_shrinks_only_the_reading_term()
    {
        // Same formula with m = 4: the 1/m term drops from 1 to 0.25. By hand for y0 = 0.5:
        // (s/b)² × (0.25 + 0.2 + (0.0972)²/(0.1998² × 10)).
        var curve = Linear();
        var s = 0.004016632088371218;
        var expected = s / 0.1998 * Math.Sqrt(0.25 + 0.2 + 0.0972 * 0.0972 / (0.1998 * 0.1998 * 10));
        Assert.Equal(expected, curve.StdError(0.5, replicates: 4), 1e-12);
    }

    [Fact]
    public void Scale_uncertainty_of_a_straight_line_is_the_relative_error_of_its_slope()
    {
        // d x/d y = 1/b, so its relative uncertainty is s(b)/b; s(b) = s/√Σ(x − x̄)² (Miller & Miller §5.5).
        var curve = Linear();
        var sb = 0.004016632088371218 / Math.Sqrt(10);
        Assert.Equal(sb / 0.1998, curve.RelativeScaleUncertainty(2), 1e-12);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(0.7)]
    [InlineData(2.5)]
    [InlineData(3.9)]
    public void Concentration_to_signal_and_back_round_trips_for_linear_and_quadratic_curves(double c)
    {
        // Round trips to 1e-12 relative (invented standards; the quadratic bends like a detector near saturation).
        var linear = Linear();
        Assert.Equal(c, linear.ToConcentration(linear.ToSignal(c)), 1e-12 * Math.Max(c, 1));
        double[] yq = [0.010, 0.262, 0.498, 0.716, 0.921, 1.101];
        double[] xq = [0, 1, 2, 3, 4, 5];
        var quadratic = CalibrationCurve.FromStandards(new CalibrationStandards(yq, xq, []), "quadratic", "series.toml");
        Assert.True(quadratic.Fit.Value("c2") < 0);
        Assert.Equal(c, quadratic.ToConcentration(quadratic.ToSignal(c)), 1e-12 * Math.Max(c, 1));
    }

    [Fact]
    public void Quadratic_inverse_error_reduces_to_the_straight_line_form_when_the_curvature_vanishes()
    {
        // Standards lying exactly on a straight line plus symmetric noise give c2 ≈ 0; the delta-method error must then
        // agree with a direct evaluation of gᵀCg/f′² + s²/f′² from the fit's own covariance.
        double[] yq = [0.010, 0.262, 0.498, 0.716, 0.921, 1.101];
        double[] xq = [0, 1, 2, 3, 4, 5];
        var q = CalibrationCurve.FromStandards(new CalibrationStandards(yq, xq, []), "quadratic", "series.toml");
        var y0 = 0.6;
        var x0 = q.ToConcentration(y0);
        double[] g = [1, x0, x0 * x0];
        var cov = q.Fit.Covariance!;
        double gcg = 0;
        for (var i = 0; i < 3; i++) for (var j = 0; j < 3; j++) gcg += g[i] * cov[i, j] * g[j];
        var slope = q.Fit.Value("c1") + 2 * q.Fit.Value("c2") * x0;
        Assert.Equal(Math.Sqrt((gcg + q.Fit.ReducedChiSquare) / (slope * slope)), q.StdError(y0), 1e-12);
    }

    [Fact]
    public void Two_species_calibration_separates_their_contributions_and_follows_the_stoichiometry()
    {
        // Invented standards from signal = 0.01 + 0.2·[A] + 0.05·[P] exactly (mmol/L), plus a small known perturbation
        // so the fit has residual degrees of freedom. The fit must recover the sensitivities.
        double[] a = [0, 1, 2, 0, 0, 1, 2];
        double[] p = [0, 0, 0, 1, 2, 1, 2];
        double[] noise = [0.0005, -0.0005, 0.0003, -0.0003, 0.0002, -0.0004, 0.0002];
        var y = a.Select((ai, i) => 0.01 + 0.2 * ai + 0.05 * p[i] + noise[i]).ToArray();
        var curve = CalibrationCurve.FromStandards(new CalibrationStandards(y, a, [new CalibrationOther("P", 1, p)]), "linear", "series.toml");
        Assert.Equal(0.2, curve.Fit.Value("sensitivity"), 2e-3);
        Assert.Equal(0.05, curve.Fit.Value("sensitivity of P"), 2e-3);
        // A → P with [A]0 = 2: the scale is ν_A/(S_A·ν_A + S_P·ν_P) = −1/(−S_A + S_P).
        var run = curve with { Coefficient = -1, Initial = 2 };
        var expectedScale = -1 / (-curve.Fit.Value("sensitivity") + curve.Fit.Value("sensitivity of P"));
        Assert.Equal(expectedScale, run.Scale(1), 1e-12);
        foreach (var c in new[] { 2.0, 1.3, 0.4 })
            Assert.Equal(c, run.ToConcentration(run.ToSignal(c)), 1e-12 * c);
        Assert.True(run.StdError(run.ToSignal(1)) > 0);
    }

    [Fact]
    public void Fewer_standards_than_the_model_needs_is_an_error_naming_the_key()
    {
        var ex = Assert.Throws<InputException>(() =>
            CalibrationCurve.FromStandards(new CalibrationStandards([0.1, 0.5, 0.9], [1, 2, 3], []), "quadratic", "series.toml"));
        Assert.Equal("signal.calibration.signal", ex.Problem.Key);
        Assert.Contains("3 standards", ex.Problem.Found);
    }

    [Fact]
    public void Standards_read_from_a_decimal_comma_csv()
    {
        var csv = "signal;[A] (mmol/L)\n0,003;0\n0,205;1\n0,398;2\n0,607;3\n0,801;4\n";
        var st = CalibrationStandards.FromCsvText(csv, "standards.csv", "A", []);
        Assert.Equal(Y, st.Signals);
        Assert.Equal(X.Select(x => x * 1e-3).ToArray(), st.Concentrations);
    }

    [Fact]
    public void A_bad_number_in_the_standards_csv_is_located()
    {
        var ex = Assert.Throws<InputException>(() => CalibrationStandards.FromCsvText("signal,[A] (mol/L)\n0.1,0.001\n0.2,abc\n", "standards.csv", "A", []));
        Assert.Equal(3, ex.Problem.Line);
        // The column is the character position where the cell starts ("0.2,abc": "abc" starts at character 5).
        Assert.Equal(5, ex.Problem.Column);
    }
}

public class CalibrationFileTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("tracekin-cal-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    [Fact]
    public void Standards_file_beside_series_toml_is_read_and_fitted()
    {
        File.WriteAllText(Path.Combine(_dir, "standards.csv"), "signal,[A] (mmol/L)\n0.003,0\n0.205,1\n0.398,2\n0.607,3\n0.801,4\n");
        var s = SignalSettingsTests.Read("kind = \"calibrated\"\n[signal.calibration]\nfile = \"standards.csv\"");
        Assert.Null(s.Calibration!.Curve);
        var loaded = s.WithFilesFrom(_dir);
        // Same standards as the hand-worked straight line (CalibrationCurveTests), concentrations now in mol/L.
        Assert.Equal(92.0 / 37 * 1e-3, loaded.Calibration!.Curve!.ToConcentration(0.5), 1e-15);
    }

    [Fact]
    public void A_missing_standards_file_names_the_file_key()
    {
        var s = SignalSettingsTests.Read("kind = \"calibrated\"\n[signal.calibration]\nfile = \"nowhere.csv\"");
        var ex = Assert.Throws<InputException>(() => s.WithFilesFrom(_dir));
        Assert.Equal("signal.calibration.file", ex.Problem.Key);
    }

    [Fact]
    public void A_file_and_inline_standards_together_are_refused()
    {
        var ex = Assert.Throws<InputException>(() => SignalSettingsTests.Read("kind = \"calibrated\"\n[signal.calibration]\nfile = \"s.csv\"\nsignal = [1, 2, 3]"));
        Assert.Equal("signal.calibration.file", ex.Problem.Key);
    }
}
