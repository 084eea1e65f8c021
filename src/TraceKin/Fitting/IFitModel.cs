namespace TraceKin.Fitting;

/// <summary>
/// A model for nonlinear least squares: predicts <see cref="PointCount"/> values from a parameter vector.
/// A rate law is a small type implementing this, with its own start guess elsewhere.
/// </summary>
public interface IFitModel
{
    string Name { get; }
    IReadOnlyList<string> ParameterNames { get; }
    int PointCount { get; }

    /// <summary>Write the model's prediction for every point into <paramref name="values"/>.</summary>
    void Evaluate(ReadOnlySpan<double> parameters, Span<double> values);

    /// <summary>
    /// Write ∂value_i/∂p_j row-major (i·P + j) into <paramref name="jacobian"/> and return true,
    /// or return false to let the fitter use finite differences.
    /// </summary>
    bool TryJacobian(ReadOnlySpan<double> parameters, Span<double> jacobian) => false;
}

/// <summary>Options of a nonlinear fit. Null arrays mean: unit weights, no bounds, nothing fixed.</summary>
public sealed record FitOptions
{
    /// <summary>Relative weights w_i (e.g. 1/σ_i²); errors are scaled by the reduced chi-square.</summary>
    public double[]? Weights { get; init; }
    public double[]? Lower { get; init; }
    public double[]? Upper { get; init; }
    public bool[]? Fixed { get; init; }
    public int MaxIterations { get; init; } = 1000;
    /// <summary>Relative change in chi-square and in parameters below which the fit has converged.</summary>
    public double Tolerance { get; init; } = 1e-12;

    /// <summary>
    /// A constant added to chi-square wherever the fitter uses it (convergence tests, the gradient's cosine with the
    /// residual vector, the reported value): the within-group sum of squares of <see cref="GroupedLeastSquares"/>, so a
    /// fit to group means takes the path of the fit to every point.
    /// </summary>
    internal double ConstantChiSquare { get; init; }
}
