using TraceKin.Fitting;

namespace TraceKin.Rates;

/// <summary>
/// A rate law as a least-squares model of one trace: y(t) = y_end + (y0 − y_end)·u(t; kk = |ν|·k, [A]0, shape)
/// (+ drift·t when a linear baseline drift is included). Parameters: y0, yEnd, k, shape…, [drift].
/// [A]0 is the plan's value when known (held exact), else |y0 − y_end|. Jacobian analytic by the chain rule.
/// For a fit to bin means, each point may carry the spread s_b (SD of the sample times in the bin): the model is then
/// the bin average of the curve, taken as ½[y(t̄ − s) + y(t̄ + s)], the two-point rule that matches the mean and
/// variance of the times in the bin and so is exact for a cubic (Gauss quadrature, common practice, no source). A
/// plain y(t̄) would miss ½·y″·s² in every bin.
/// </summary>
public sealed class LawModel : IFitModel
{
    private readonly double[] _t;
    private readonly double[]? _tLo, _tHi;
    private readonly double[] _grad;
    private readonly int _shapeCount;

    /// <param name="knownEnd">The whole change y0 − y_end is known: |y0 − y_end| = [A]0 (<paramref name="initialConcentration"/>),
    /// falling for a reactant (ν &lt; 0) and rising for a product; y_end then follows y0 and is no parameter of the fit.</param>
    public LawModel(RateLaw law, double[] times, double nu, double? initialConcentration, bool drift, double[]? spread = null, bool knownEnd = false)
    {
        if (knownEnd)
        {
            if (initialConcentration is not { } whole || !(whole > 0))
                throw new ArgumentException("a known end needs a positive [A]0", nameof(initialConcentration));
            KnownSpan = nu < 0 ? whole : -whole;
        }
        Law = law;
        _t = times;
        if (spread is not null)
        {
            if (spread.Length != times.Length) throw new ArgumentException("one spread per time is needed", nameof(spread));
            _tLo = new double[times.Length]; _tHi = new double[times.Length];
            for (var i = 0; i < times.Length; i++) { _tLo[i] = times[i] - spread[i]; _tHi[i] = times[i] + spread[i]; }
        }
        Nu = Math.Abs(nu);
        InitialConcentration = initialConcentration;
        Drift = drift;
        _shapeCount = law.ShapeNames.Count;
        _grad = new double[2 + _shapeCount];
        var names = new List<string> { "y0", "yEnd", "k" };
        names.AddRange(law.ShapeNames);
        if (drift) names.Add("drift");
        ParameterNames = names;
        Name = drift ? law.Name + " + drift" : law.Name;
    }

    public RateLaw Law { get; }
    public double Nu { get; }
    public double? InitialConcentration { get; }
    /// <summary>y0 − y_end when the end level is known from the plan (see the constructor), else null.</summary>
    public double? KnownSpan { get; }
    public bool Drift { get; }
    public string Name { get; }
    public IReadOnlyList<string> ParameterNames { get; }
    public int PointCount => _t.Length;
    public const int Y0 = 0, YEnd = 1, K = 2, FirstShape = 3;
    public int DriftIndex => Drift ? FirstShape + _shapeCount : -1;

    /// <summary>[A]0 used by the law at these parameters.</summary>
    public double A0(ReadOnlySpan<double> p) => InitialConcentration ?? Math.Abs(p[Y0] - p[YEnd]);

    /// <summary>y0 − y_end at these parameters (the known one when the end is known).</summary>
    public double Span(ReadOnlySpan<double> p) => KnownSpan ?? p[Y0] - p[YEnd];

    /// <summary>y_end and y0 − y_end at these parameters (y_end follows y0 when the end is known).</summary>
    private (double YEnd, double Span) Levels(ReadOnlySpan<double> p) =>
        KnownSpan is { } known ? (p[Y0] - known, known) : (p[YEnd], p[Y0] - p[YEnd]);

    public double Value(ReadOnlySpan<double> p, double t)
    {
        var u = Law.Fraction(t, Nu * p[K], A0(p), p.Slice(FirstShape, _shapeCount), _grad);
        var (yEnd, span) = Levels(p);
        var y = yEnd + span * u;
        return Drift ? y + p[DriftIndex] * t : y;
    }

    /// <summary>d y/dt at t0 = 0 from the chemistry alone (drift excluded): −(y0 − y_end)·kk·g([A]0, shape).</summary>
    public double InitialSlope(ReadOnlySpan<double> p) =>
        -Span(p) * Nu * p[K] * Law.InitialFactor(A0(p), p.Slice(FirstShape, _shapeCount));

    public double HalfLife(ReadOnlySpan<double> p) => Law.HalfLife(Nu * p[K], A0(p), p.Slice(FirstShape, _shapeCount));

    public void Evaluate(ReadOnlySpan<double> parameters, Span<double> values)
    {
        var a0 = A0(parameters);
        var shape = parameters.Slice(FirstShape, _shapeCount);
        var kk = Nu * parameters[K];
        var (yEnd, span) = Levels(parameters);
        var d = Drift ? parameters[DriftIndex] : 0;
        if (_tLo is null || _tHi is null)
        {
            for (var i = 0; i < _t.Length; i++)
                values[i] = yEnd + span * Law.Value(_t[i], kk, a0, shape) + d * _t[i];
            return;
        }
        for (var i = 0; i < _t.Length; i++)
        {
            var u = 0.5 * (Law.Value(_tLo[i], kk, a0, shape) + Law.Value(_tHi[i], kk, a0, shape));
            values[i] = yEnd + span * u + d * _t[i];
        }
    }

    public bool TryJacobian(ReadOnlySpan<double> parameters, Span<double> jacobian)
    {
        var a0 = A0(parameters);
        var shape = parameters.Slice(FirstShape, _shapeCount);
        var kk = Nu * parameters[K];
        var span = Span(parameters);
        var fromTrace = InitialConcentration is null;
        var known = KnownSpan is not null;
        var sgn = span >= 0 ? 1.0 : -1.0;
        var np = ParameterNames.Count;
        Span<double> g2 = stackalloc double[_grad.Length];
        for (var i = 0; i < _t.Length; i++)
        {
            double u;
            if (_tLo is null || _tHi is null) u = Law.Fraction(_t[i], kk, a0, shape, _grad);
            else
            {
                // Average of the two nodes, value and gradient alike.
                u = Law.Fraction(_tLo[i], kk, a0, shape, _grad);
                u = 0.5 * (u + Law.Fraction(_tHi[i], kk, a0, shape, g2));
                for (var j = 0; j < g2.Length; j++) _grad[j] = 0.5 * (_grad[j] + g2[j]);
            }
            var row = jacobian.Slice(i * np, np);
            var viaA0 = fromTrace ? span * _grad[1] * sgn : 0;
            row[Y0] = known ? 1 : u + viaA0;
            row[YEnd] = known ? 0 : 1 - u - viaA0;
            row[K] = span * Nu * _grad[0];
            for (var s = 0; s < _shapeCount; s++) row[FirstShape + s] = span * _grad[2 + s];
            if (Drift) row[DriftIndex] = _t[i];
        }
        return true;
    }
}
