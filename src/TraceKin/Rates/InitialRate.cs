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
    public double RelativeError => StdError / Math.Abs(Value);
}
