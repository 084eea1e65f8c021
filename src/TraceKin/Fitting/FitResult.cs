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
    /// <summary>
    /// With <see cref="FitExit.Singular"/>: the index (in <see cref="Parameters"/>) of the parameter the data do not
    /// determine, the one <see cref="ExitDetail"/> names; null when no single parameter is to blame or the fit is not singular.
    /// </summary>
    public int? SingularParameter { get; init; }

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
        // Written as a chemist reads a fit: what was fitted, whether it worked, how well, each parameter with its
        // uncertainty, and what to distrust.
        var ci = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        sb.AppendLine(ci, $"Fitted: {Model}");
        var detail = ExitDetail.Length > 0 ? ": " + ExitDetail : "";
        var outcome = Converged
            ? string.Format(ci, "Outcome: converged after {0} iteration(s){1}.", Iterations, detail)
            : string.Format(ci, "Outcome: did not converge ({0}){1}; the numbers below are where it stopped, not a result.", Exit, detail);
        sb.AppendLine(outcome);
        sb.AppendLine(ci, $"Data: {PointCount} point(s), {VariedCount} parameter(s) varied, {DegreesOfFreedom} degree(s) of freedom.");
        sb.AppendLine(ci, $"Scatter: residual sum of squares {ChiSquare:G6}, {ReducedChiSquare:G6} per degree of freedom; R² = {RSquared:G6}.");
        sb.AppendLine(ci, $"For comparing models: AICc {AicC:G6} (AIC {Aic:G6}, BIC {Bic:G6}).");
        sb.AppendLine("Parameters (value ± standard error, relative error; start of the fit):");
        foreach (var p in Parameters)
        {
            var err = !p.Varied ? "held fixed"
                : double.IsFinite(p.StdError) ? string.Format(ci, "± {0:G6} ({1:F2} %)", p.StdError, 100 * Math.Abs(p.RelativeError))
                : "error not estimable: the data do not determine it";
            sb.AppendLine(ci, $"  {p.Name} = {p.Value:G10} {err}; started at {p.Initial:G6}");
        }
        var corr = Correlation;
        if (corr is not null)
        {
            var strong = new List<string>();
            for (var i = 0; i < Parameters.Count; i++)
                for (var j = i + 1; j < Parameters.Count; j++)
                    if (Math.Abs(corr[i, j]) > 0.9)
                        strong.Add(string.Format(ci, "  {0} and {1} {2}, r = {3:F3}", Parameters[i].Name, Parameters[j].Name,
                            corr[i, j] > 0 ? "rise and fall together" : "trade off against each other", corr[i, j]));
            if (strong.Count > 0)
            {
                sb.AppendLine("Distrust taken singly (|r| > 0.9; the data fix a combination, not each one):");
                foreach (var s in strong) sb.AppendLine(s);
            }
        }
        return sb.ToString();
    }
}
