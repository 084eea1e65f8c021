namespace TraceKin.Fitting;

/// <summary>
/// A one-variable model y = f(p, x) at fixed abscissae, for short rate laws and tests. The optional gradient writes
/// ∂f/∂p_j at one x into its span; without it the fitter uses finite differences.
/// </summary>
public sealed class CurveModel : IFitModel
{
    private readonly double[] _x;
    private readonly Func<double[], double, double> _f;
    private readonly Action<double[], double, Span<double>>? _gradient;
    private readonly double[] _p;

    public CurveModel(string name, IReadOnlyList<string> parameterNames, double[] x,
        Func<double[], double, double> f, Action<double[], double, Span<double>>? gradient = null)
    {
        Name = name;
        ParameterNames = parameterNames;
        _x = x;
        _f = f;
        _gradient = gradient;
        _p = new double[parameterNames.Count];
    }

    public string Name { get; }
    public IReadOnlyList<string> ParameterNames { get; }
    public int PointCount => _x.Length;
    public ReadOnlySpan<double> X => _x;

    public void Evaluate(ReadOnlySpan<double> parameters, Span<double> values)
    {
        parameters.CopyTo(_p);
        for (var i = 0; i < _x.Length; i++) values[i] = _f(_p, _x[i]);
    }

    public bool TryJacobian(ReadOnlySpan<double> parameters, Span<double> jacobian)
    {
        if (_gradient is null) return false;
        parameters.CopyTo(_p);
        var np = _p.Length;
        for (var i = 0; i < _x.Length; i++) _gradient(_p, _x[i], jacobian.Slice(i * np, np));
        return true;
    }
}
