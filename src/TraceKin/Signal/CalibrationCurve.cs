using System.Globalization;
using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// A calibration curve fitted to standards by ordinary least squares (<see cref="LinearLeastSquares"/>), read
/// backwards to turn a signal into a concentration.
/// <list type="bullet">
/// <item>Single species: signal = c0 + c1·x ("linear") or c0 + c1·x + c2·x² ("quadratic").</item>
/// <item>Several species (linear only): signal = b0 + Σ S_k·x_k; during a run the other species' concentrations
/// follow the followed species' through the stoichiometry (<see cref="LinearResponse"/>).</item>
/// </list>
/// Standard error of an inverse prediction x̂0 from one reading y0 (Miller &amp; Miller, Statistics and Chemometrics
/// for Analytical Chemistry, 6th ed., §5.6, eq. 5.9 (equation number from memory); Draper &amp; Smith, Applied Regression Analysis, 3rd ed., §3.2):
/// s(x̂0) = (s/b)·√(1/m + 1/n + (y0 − ȳ)²/(b²·Σ(x_i − x̄)²)) for a straight line; in general the first-order (delta-method)
/// form s²(x̂0) = [s²/m + gᵀ·C·g]/f′(x̂0)², with g = ∂f/∂β at x̂0 and C the parameter covariance, which reduces to
/// eq. 5.9 for a straight line. m is the number of readings averaged (1 for a point of a trace).
/// </summary>
public sealed record CalibrationCurve
{
    /// <summary>"linear" or "quadratic".</summary>
    public required string Model { get; init; }
    public required FitResult Fit { get; init; }
    public required IReadOnlyList<CalibrationOther> Others { get; init; }
    public required double SignalMin { get; init; }
    public required double SignalMax { get; init; }
    public required double ConcentrationMin { get; init; }
    public required double ConcentrationMax { get; init; }

    /// <summary>Stoichiometric coefficient of the followed species (used only with other contributing species).</summary>
    public double Coefficient { get; init; } = -1;
    /// <summary>Initial concentration of the followed species, mol/L (used only with other contributing species).</summary>
    public double Initial { get; init; }
    /// <summary>Initial concentrations of the other contributing species, mol/L; absent ones start at 0.</summary>
    public IReadOnlyDictionary<string, double> OthersInitial { get; init; } = new Dictionary<string, double>();

    public int Degree => Model == "quadratic" ? 2 : 1;

    /// <summary>
    /// Fit the standards. <paramref name="file"/> and <paramref name="key"/> name where they came from, for errors
    /// (too few standards for the model's parameters, standards that do not vary).
    /// </summary>
    public static CalibrationCurve FromStandards(CalibrationStandards standards, string model, string file, string key = "signal.calibration")
    {
        var n = standards.Signals.Length;
        if (standards.Concentrations.Length != n)
            throw Fail.Setting(file, $"{key}.concentration", $"{standards.Concentrations.Length} concentrations", $"one concentration per signal value ({n})");
        foreach (var o in standards.Others)
            if (o.Concentrations.Length != n)
                throw Fail.Setting(file, $"{key}.other", $"{o.Concentrations.Length} concentrations of {o.Species}", $"one concentration per signal value ({n})");
        if (model == "quadratic" && standards.Others.Count > 0)
            throw Fail.Setting(file, $"{key}.model", "\"quadratic\" with other contributing species", "\"linear\" when several species contribute to the signal");
        var p = model == "quadratic" ? 3 : 2 + standards.Others.Count;
        if (n < p + 1)
            throw Fail.Setting(file, $"{key}.signal", $"{n} standards", $"at least {p + 1} standards for a {model} calibration ({p} parameters and one degree of freedom for its uncertainty)",
                "add standards, or use a simpler model");

        FitResult fit;
        if (standards.Others.Count == 0)
            fit = LinearLeastSquares.Polynomial(standards.Concentrations, standards.Signals, model == "quadratic" ? 2 : 1);
        else
        {
            var design = new double[n, p];
            for (var i = 0; i < n; i++)
            {
                design[i, 0] = 1;
                design[i, 1] = standards.Concentrations[i];
                for (var k = 0; k < standards.Others.Count; k++) design[i, 2 + k] = standards.Others[k].Concentrations[i];
            }
            fit = LinearLeastSquares.Fit("multi-species linear calibration",
                ["intercept", "sensitivity", .. standards.Others.Select(o => $"sensitivity of {o.Species}")], design, standards.Signals);
        }
        if (!fit.Converged)
            throw Fail.Setting(file, $"{key}.concentration", "standards that cannot be fitted (" + fit.ExitDetail + ")",
                "standards whose concentrations differ from one another", "each species needs concentrations that vary independently of the others");
        return new CalibrationCurve
        {
            Model = model, Fit = fit, Others = standards.Others,
            SignalMin = standards.Signals.Min(), SignalMax = standards.Signals.Max(),
            ConcentrationMin = standards.Concentrations.Min(), ConcentrationMax = standards.Concentrations.Max(),
        };
    }

    private double[] Beta => Fit.Parameters.Select(q => q.Value).ToArray();

    private LinearResponse ResponseOf(double[] beta) => new(beta[0], beta[1], Coefficient, Initial,
        Others.Select((o, k) => new Contributor(o.Species, beta[2 + k], o.Coefficient, OthersInitial.TryGetValue(o.Species, out var c) ? c : 0)).ToArray());

    /// <summary>Signal predicted for a concentration of the followed species (mol/L).</summary>
    public double ToSignal(double concentration)
    {
        var b = Beta;
        if (Others.Count > 0) return ResponseOf(b).ToSignal(concentration);
        return Degree == 2 ? b[0] + concentration * (b[1] + concentration * b[2]) : b[0] + b[1] * concentration;
    }

    /// <summary>Concentration (mol/L) read back from a signal; NaN when a quadratic curve never reaches that signal.</summary>
    public double ToConcentration(double signal) => ConcentrationOf(Beta, signal);

    private double ConcentrationOf(double[] b, double y)
    {
        if (Others.Count > 0) return ResponseOf(b).ToConcentration(y);
        if (Degree == 1 || b[2] == 0) return (y - b[0]) / b[1];
        // c2·x² + c1·x + (c0 − y) = 0, the root nearer the middle of the standards; the cancellation-free
        // form of the quadratic formula (Press et al., Numerical Recipes, 3rd ed., §5.6, from memory).
        double a = b[2], bb = b[1], c = b[0] - y;
        var disc = bb * bb - 4 * a * c;
        if (disc < 0) return double.NaN;
        var q = -0.5 * (bb + Math.CopySign(Math.Sqrt(disc), bb));
        var r1 = q / a;
        var r2 = q != 0 ? c / q : r1;
        var mid = 0.5 * (ConcentrationMin + ConcentrationMax);
        return Math.Abs(r1 - mid) <= Math.Abs(r2 - mid) ? r1 : r2;
    }

    /// <summary>d concentration / d signal at a concentration x.</summary>
    public double Scale(double concentration)
    {
        var b = Beta;
        if (Others.Count > 0) return ResponseOf(b).Scale;
        return 1 / (Degree == 2 ? b[1] + 2 * b[2] * concentration : b[1]);
    }

    /// <summary>∂x̂/∂β: how the concentration read from a signal moves with each curve parameter.</summary>
    private double[] ConcentrationGradient(double signal)
    {
        var b = Beta;
        var p = b.Length;
        var g = new double[p];
        if (Others.Count == 0)
        {
            // Implicit function: f(x̂; β) = y  ⇒  ∂x̂/∂β_j = −x̂^j / f′(x̂).
            var x = ConcentrationOf(b, signal);
            var slope = 1 / Scale(x);
            for (var j = 0; j < p; j++) g[j] = -Math.Pow(x, j) / slope;
            return g;
        }
        return NumericGradient(b, bb => ConcentrationOf(bb, signal));
    }

    private double[] NumericGradient(double[] b, Func<double[], double> f)
    {
        var g = new double[b.Length];
        for (var j = 0; j < b.Length; j++)
        {
            var u = Fit.Parameters[j].StdError;
            if (!(u > 0)) continue;
            var h = 1e-3 * u;
            var plus = (double[])b.Clone(); plus[j] += h;
            var minus = (double[])b.Clone(); minus[j] -= h;
            g[j] = (f(plus) - f(minus)) / (2 * h);
        }
        return g;
    }

    private double Quadratic(double[] g)
    {
        var c = Fit.Covariance!;
        double sum = 0;
        for (var i = 0; i < g.Length; i++)
            for (var j = 0; j < g.Length; j++) sum += g[i] * c[i, j] * g[j];
        return Math.Max(sum, 0);
    }

    /// <summary>
    /// Standard error of the concentration read from <paramref name="signal"/> (mean of <paramref name="replicates"/>
    /// readings): the curve's own uncertainty plus the scatter of a reading about the curve (Miller &amp; Miller eq. 5.9).
    /// </summary>
    public double StdError(double signal, int replicates = 1)
    {
        var x = ToConcentration(signal);
        var s2 = Fit.ReducedChiSquare;
        var scale = Scale(x);
        return Math.Sqrt(Quadratic(ConcentrationGradient(signal)) + s2 / replicates * scale * scale);
    }

    /// <summary>
    /// Relative standard uncertainty of the scale d x/d signal at a concentration x, from the curve parameters'
    /// covariance (first order, JCGM 100:2008 eq. 13). This part is the same for every point of every run, so it
    /// scales a rate rather than scattering it.
    /// </summary>
    public double RelativeScaleUncertainty(double concentration)
    {
        var b = Beta;
        var scale = Scale(concentration);
        double[] g;
        if (Others.Count == 0)
        {
            // Scale = 1/f′(x), f′ = c1 + 2·c2·x: ∂Scale/∂c_j = −Scale²·∂f′/∂c_j.
            g = new double[b.Length];
            g[1] = -scale * scale;
            if (Degree == 2) g[2] = -scale * scale * 2 * concentration;
        }
        else g = NumericGradient(b, bb => ResponseOf(bb).Scale);
        return Math.Sqrt(Quadratic(g)) / Math.Abs(scale);
    }

    /// <summary>Whether a signal lies within the range spanned by the standards.</summary>
    public bool Covers(double signal) => signal >= SignalMin && signal <= SignalMax;

    public string Describe()
    {
        var inv = CultureInfo.InvariantCulture;
        return $"{Model} calibration, {Fit.PointCount} standards, " +
               string.Join(", ", Fit.Parameters.Select(q => $"{q.Name} = {q.Value.ToString("G6", inv)} ± {q.StdError.ToString("G2", inv)}"));
    }
}
