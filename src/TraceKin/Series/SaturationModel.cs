using TraceKin.Fitting;

namespace TraceKin.Series;

/// <summary>
/// The saturation (Michaelis–Menten–Langmuir) law on initial rates with optional power-law co-reactants,
/// v0 = Vmax·[S]0/(Km + [S]0)·Π_j [Y_j]0^m_j (Michaelis &amp; Menten 1913; Bates &amp; Watts 1988, §2.1).
/// Parameters: Vmax, Km, then m_1..m_q. Analytic Jacobian. A run's covariates are [S]0 and its ln[Y_j]0.
/// </summary>
internal sealed class SaturationModel : IRowModel
{
    private readonly double[] _s;
    private readonly double[,] _lny;
    private readonly int _q;
    private readonly IReadOnlyList<string> _coReactants;

    /// <param name="substrate">[S]0 of each run.</param>
    /// <param name="lnCoReactants">n×q matrix of ln[Y_j]0 (may have q = 0 columns).</param>
    public SaturationModel(double[] substrate, double[,] lnCoReactants, IReadOnlyList<string> coReactants)
    {
        _s = substrate;
        _lny = lnCoReactants;
        _q = coReactants.Count;
        _coReactants = coReactants;
        ParameterNames = new[] { "Vmax", "Km" }.Concat(coReactants.Select(c => $"n({c})")).ToArray();
    }

    /// <summary>The plain hyperbola v = Vmax·x/(Km + x).</summary>
    public static SaturationModel Hyperbola(double[] x) => new(x, new double[x.Length, 0], []);

    public string Name => _q == 0 ? "v0 = Vmax·[S]0/(Km + [S]0)" : "v0 = Vmax·[S]0/(Km + [S]0)·Π[Y]0^n";
    public IReadOnlyList<string> ParameterNames { get; }
    public int PointCount => _s.Length;
    public int CovariateCount => 1 + _q;

    public void Covariates(int point, Span<double> row)
    {
        row[0] = _s[point];
        for (var j = 0; j < _q; j++) row[1 + j] = _lny[point, j];
    }

    public IFitModel OnPoints(IReadOnlyList<int> points)
    {
        var s = new double[points.Count];
        var lny = new double[points.Count, _q];
        for (var i = 0; i < points.Count; i++)
        {
            s[i] = _s[points[i]];
            for (var j = 0; j < _q; j++) lny[i, j] = _lny[points[i], j];
        }
        return new SaturationModel(s, lny, _coReactants);
    }

    public void Evaluate(ReadOnlySpan<double> p, Span<double> values)
    {
        for (var i = 0; i < _s.Length; i++) values[i] = p[0] * _s[i] / (p[1] + _s[i]) * Co(p, i);
    }

    public bool TryJacobian(ReadOnlySpan<double> p, Span<double> jac)
    {
        var np = 2 + _q;
        for (var i = 0; i < _s.Length; i++)
        {
            var co = Co(p, i);
            var d = p[1] + _s[i];
            var v = p[0] * _s[i] / d * co;
            jac[i * np] = _s[i] / d * co;
            jac[i * np + 1] = -p[0] * _s[i] / (d * d) * co;
            for (var j = 0; j < _q; j++) jac[i * np + 2 + j] = v * _lny[i, j];
        }
        return true;
    }

    /// <summary>
    /// Start values from the data, not from a linearisation: Vmax ≈ 1.1 × the largest co-reactant-adjusted rate, Km ≈ the
    /// [S]0 whose adjusted rate is nearest Vmax/2.
    /// </summary>
    public double[] Guess(ReadOnlySpan<double> v, IReadOnlyList<double> coOrders)
    {
        var adj = new double[_s.Length];
        for (var i = 0; i < _s.Length; i++)
        {
            double s = 0;
            for (var j = 0; j < _q; j++) s += coOrders[j] * _lny[i, j];
            adj[i] = v[i] / Math.Exp(s);
        }
        var vmax = 1.1 * adj.Max();
        var best = 0;
        for (var i = 1; i < adj.Length; i++)
            if (Math.Abs(adj[i] / vmax - 0.5) < Math.Abs(adj[best] / vmax - 0.5)) best = i;
        return [vmax, _s[best], .. coOrders];
    }

    private double Co(ReadOnlySpan<double> p, int i)
    {
        if (_q == 0) return 1;
        double s = 0;
        for (var j = 0; j < _q; j++) s += p[2 + j] * _lny[i, j];
        return Math.Exp(s);
    }
}
