using TraceKin.Fitting;

namespace TraceKin.Series;

/// <summary>
/// The power rate law on initial rates, v0_i = k_g(i)·Π_j [X_j]0,i^n_j, with one k per temperature group g and orders
/// shared by all groups. Parameters: k_1..k_G, then n_1..n_m. Analytic Jacobian: ∂v/∂k_g = Π[X]^n (runs of group g),
/// ∂v/∂n_j = v·ln[X_j]0.
/// </summary>
internal sealed class PowerLawModel : IFitModel
{
    private readonly double[,] _lnc;
    private readonly int[] _group;
    private readonly int _groups, _m;

    /// <param name="lnConcentrations">n×m matrix of ln[X_j]0 (mol/L).</param>
    /// <param name="group">Group index (0-based) of each run.</param>
    public PowerLawModel(double[,] lnConcentrations, int[] group, IReadOnlyList<string> groupNames, IReadOnlyList<string> species)
    {
        _lnc = lnConcentrations;
        _group = group;
        _groups = groupNames.Count;
        _m = species.Count;
        ParameterNames = groupNames.Select(g => g.Length == 0 ? "k" : $"k({g})").Concat(species.Select(s => $"n({s})")).ToArray();
    }

    public string Name => "v0 = k·Π[X]0^n";
    public IReadOnlyList<string> ParameterNames { get; }
    public int PointCount => _group.Length;

    public void Evaluate(ReadOnlySpan<double> p, Span<double> values)
    {
        for (var i = 0; i < _group.Length; i++) values[i] = p[_group[i]] * Product(p, i);
    }

    public bool TryJacobian(ReadOnlySpan<double> p, Span<double> jac)
    {
        var np = _groups + _m;
        jac.Clear();
        for (var i = 0; i < _group.Length; i++)
        {
            var prod = Product(p, i);
            var v = p[_group[i]] * prod;
            jac[i * np + _group[i]] = prod;
            for (var j = 0; j < _m; j++) jac[i * np + _groups + j] = v * _lnc[i, j];
        }
        return true;
    }

    private double Product(ReadOnlySpan<double> p, int i)
    {
        double s = 0;
        for (var j = 0; j < _m; j++) s += p[_groups + j] * _lnc[i, j];
        return Math.Exp(s);
    }
}
