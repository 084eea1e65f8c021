using System.Globalization;
using System.Text;
using MathNet.Numerics.Distributions;

namespace TraceKin.Fitting;

/// <summary>Why a fit stopped. Only <see cref="Converged"/> results may be reported as estimates.</summary>
public enum FitExit
{
    Converged,
    MaxIterations,
    Singular,
    InvalidValues,
    AtBound,
    TooFewPoints,
    /// <summary>No trial step lowers chi-square although the gradient is not zero (e.g. a kink or noise in the model).</summary>
    Stalled,
}

/// <summary>One parameter of a fit: value, standard error (NaN when it cannot be estimated), start value, varied or fixed.</summary>
public sealed record FitParameter(string Name, double Value, double StdError, double Initial, bool Varied = true)
{
    public double RelativeError => StdError / Math.Abs(Value);
}

/// <summary>
/// The immutable result of a least-squares fit. Covariance is s²(JᵀWJ)⁻¹ over the varied parameters, in the order
/// of <see cref="Parameters"/> with fixed ones having zero rows/columns. Information criteria follow
/// Burnham &amp; Anderson (2002), "Model Selection and Multimodel Inference", eqs. 2.13-2.14 with the
/// least-squares log-likelihood (n·ln(RSS/n)), counting the error variance as a parameter.
/// </summary>
public sealed record FitResult
{
    public required string Model { get; init; }
    public required IReadOnlyList<FitParameter> Parameters { get; init; }
    /// <summary>Covariance of all parameters (fixed ones: zero rows/columns). Null when it could not be estimated.</summary>
    public double[,]? Covariance { get; init; }
    public required double[] Residuals { get; init; }
    public required int PointCount { get; init; }
    public required int VariedCount { get; init; }
    /// <summary>Weighted residual sum of squares Σ w·r².</summary>
    public required double ChiSquare { get; init; }
    public required double RSquared { get; init; }
    public int Iterations { get; init; }
    public required FitExit Exit { get; init; }
    /// <summary>A sentence on why the fit stopped, or what is wrong (names the parameter to blame where known).</summary>
    public string ExitDetail { get; init; } = "";

    public int DegreesOfFreedom => PointCount - VariedCount;
    public double ReducedChiSquare => DegreesOfFreedom > 0 ? ChiSquare / DegreesOfFreedom : double.NaN;
    public double ResidualStdDev => Math.Sqrt(ReducedChiSquare);
    public bool Converged => Exit == FitExit.Converged;

    /// <summary>Converged, with a covariance and a finite standard error for every parameter: safe to report.</summary>
    [System.Diagnostics.CodeAnalysis.MemberNotNullWhen(true, nameof(Covariance))]
    public bool HasUsableErrors => Converged && Covariance is not null && Parameters.All(p => double.IsFinite(p.StdError));

    private int K => VariedCount + 1;
    public double Aic => PointCount * Math.Log(ChiSquare / PointCount) + 2.0 * K;
    public double AicC => PointCount - K - 1 > 0 ? Aic + 2.0 * K * (K + 1) / (PointCount - K - 1) : double.PositiveInfinity;
    public double Bic => PointCount * Math.Log(ChiSquare / PointCount) + K * Math.Log(PointCount);

    public FitParameter this[string name] => Parameters.First(p => p.Name == name);
    public double Value(string name) => this[name].Value;

    /// <summary>Two-sided Student-t quantile for a 95 % interval with this fit's degrees of freedom.</summary>
    public double T95 => StudentT95(DegreesOfFreedom);

    public (double Low, double High) Ci95(string name)
    {
        var p = this[name];
        var h = T95 * p.StdError;
        return (p.Value - h, p.Value + h);
    }

    /// <summary>Correlation matrix from the covariance (NaN where a variance is zero or unknown).</summary>
    public double[,]? Correlation
    {
        get
        {
            if (Covariance is null) return null;
            var n = Parameters.Count;
            var c = new double[n, n];
            for (var i = 0; i < n; i++)
                for (var j = 0; j < n; j++)
                    c[i, j] = Covariance[i, j] / Math.Sqrt(Covariance[i, i] * Covariance[j, j]);
            return c;
        }
    }

    /// <summary>t(0.975, dof); NaN when dof &lt; 1. StudentT.InvCDF from MathNet.Numerics.</summary>
    public static double StudentT95(int dof)
    {
        if (dof < 1) return double.NaN;
        if (dof >= T95Cache.Length) return StudentT.InvCDF(0, 1, dof, 0.975);
        // The quantile is a pure function of dof and costs an iterative inversion; a race only recomputes it.
        var t = T95Cache[dof];
        if (t == 0) T95Cache[dof] = t = StudentT.InvCDF(0, 1, dof, 0.975);
        return t;
    }

    private static readonly double[] T95Cache = new double[20_001];

    /// <summary>A fixed-section, human-readable account of the fit.</summary>
    public string ToReport()
    {
        var ci = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        sb.AppendLine($"[model] {Model}");
        sb.AppendLine("[fit statistics]");
        sb.AppendLine(ci, $"  exit: {Exit}{(ExitDetail.Length > 0 ? " (" + ExitDetail + ")" : "")}");
        sb.AppendLine(ci, $"  points: {PointCount}, varied: {VariedCount}, dof: {DegreesOfFreedom}, iterations: {Iterations}");
        sb.AppendLine(ci, $"  chi-square: {ChiSquare:G6}, reduced chi-square: {ReducedChiSquare:G6}, R²: {RSquared:G6}");
        sb.AppendLine(ci, $"  AIC: {Aic:G6}, AICc: {AicC:G6}, BIC: {Bic:G6}");
        sb.AppendLine("[parameters]");
        foreach (var p in Parameters)
        {
            var err = !p.Varied ? "(fixed)"
                : double.IsFinite(p.StdError) ? string.Format(ci, "± {0:G6} ({1:F2} %)", p.StdError, 100 * Math.Abs(p.RelativeError))
                : "± (not estimable)";
            sb.AppendLine(ci, $"  {p.Name} = {p.Value:G10} {err} (start = {p.Initial:G6})");
        }
        var corr = Correlation;
        if (corr is not null)
        {
            var strong = new List<string>();
            for (var i = 0; i < Parameters.Count; i++)
                for (var j = i + 1; j < Parameters.Count; j++)
                    if (Math.Abs(corr[i, j]) > 0.9) strong.Add(string.Format(ci, "  ({0}, {1}) = {2:F3}", Parameters[i].Name, Parameters[j].Name, corr[i, j]));
            if (strong.Count > 0)
            {
                sb.AppendLine("[strong correlations, |r| > 0.9]");
                foreach (var s in strong) sb.AppendLine(s);
            }
        }
        return sb.ToString();
    }
}
