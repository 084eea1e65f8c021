namespace TraceKin.Rates;

/// <summary>
/// A run's initial rate of reaction v0 = (1/ν)·d[X]/dt at t = 0 (the moment of mixing), with its standard error and
/// degrees of freedom, the method that produced it and the time window (s) it used. <see cref="Slope"/> is the
/// raw d[X]/dt at t0 and <see cref="ConcentrationAtZero"/> the fitted [X] at t0 (they draw the tangent);
/// <see cref="Fitted"/> holds the estimator's model at the first <see cref="PointsUsed"/> points (for residual plots).
/// </summary>
public sealed record InitialRate(
    double Value,
    double StdError,
    int Dof,
    string Unit,
    string Method,
    double WindowStart,
    double WindowEnd,
    int PointsUsed,
    double Slope,
    double ConcentrationAtZero,
    double[] Fitted)
{
    private ModelCurve _fitted = ModelCurve.Of(Fitted);

    /// <summary>The estimator's model at the points it used; a law's curve is evaluated when first asked for.</summary>
    public double[] Fitted { get => _fitted.Values; init => _fitted = ModelCurve.Of(value); }

    /// <summary>Sets <see cref="Fitted"/> to be computed on first use.</summary>
    internal Func<double[]> FittedBy { init => _fitted = new ModelCurve(value); }

    public double RelativeError => StdError / Math.Abs(Value);

    /// <summary>The between-law part of <see cref="StdError"/> for a law-averaged estimate: the Akaike-weighted SD of the
    /// laws' slopes at t0 (0 for a single law or a local estimate). It comes from the trace's shape, not its noise.</summary>
    public double ModelStdError { get; init; }
}
