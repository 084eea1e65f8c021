using TraceKin.Fitting;

namespace TraceKin.Series;

/// <summary>
/// The power rate law integrated over whole concentration–time courses of all runs at once. Each run is described by
/// its extent of reaction ξ (mol/L), dξ/dt = k_g·Π_j max(c_j0 + ν_j·ξ, 0)^n_j with ξ(0) = 0, and the followed species is
/// [X](t) = [X]0 + ν_X·ξ(t) (IUPAC Green Book, 3rd ed., §2.12: rate = dξ/dt per volume). ν_X comes from the signal
/// settings; every other species with an order is taken as consumed 1:1 (ν = −1), as `tracekin simulate` does by
/// default. Integrated by <see cref="Rosenbrock2"/>. Parameters: k_1..k_G, then n_1..n_m.
/// </summary>
internal sealed class ProgressCurveModel : IFitModel
{
    private readonly IReadOnlyList<RunPoint> _runs;
    private readonly int[] _group, _offset;
    private readonly int _groups;
    private readonly string[] _species;
    private readonly double[][] _c0, _nu;
    private readonly int[] _followed;

    public ProgressCurveModel(IReadOnlyList<RunPoint> runs, int[] group, IReadOnlyList<string> groupNames, IReadOnlyList<string> species)
    {
        _runs = runs;
        _group = group;
        _groups = groupNames.Count;
        _species = species.ToArray();
        _offset = new int[runs.Count + 1];
        _c0 = new double[runs.Count][];
        _nu = new double[runs.Count][];
        _followed = new int[runs.Count];
        for (var r = 0; r < runs.Count; r++)
        {
            var tr = runs[r].Trace ?? throw new ArgumentException($"run {runs[r].RunId} has no concentration trace");
            _offset[r + 1] = _offset[r] + tr.Times.Length;
            _c0[r] = _species.Select(s => runs[r].InitialConcentrations.GetValueOrDefault(s, 0)).ToArray();
            _followed[r] = Array.IndexOf(_species, tr.Species);
            _nu[r] = _species.Select(s => s == tr.Species ? tr.Coefficient : -1.0).ToArray();
        }
        ParameterNames = groupNames.Select(g => g.Length == 0 ? "k" : $"k({g})").Concat(_species.Select(s => $"n({s})")).ToArray();
        Observed = runs.SelectMany(r => r.Trace!.Concentrations).ToArray();
    }

    public string Name => "d[X]/dt = ν·k·Π[X]^n, integrated over every run";
    public IReadOnlyList<string> ParameterNames { get; }
    public int PointCount => _offset[^1];

    /// <summary>All runs' observed concentrations, in model order.</summary>
    public double[] Observed { get; }

    public void Evaluate(ReadOnlySpan<double> p, Span<double> values)
    {
        var m = _species.Length;
        for (var r = 0; r < _runs.Count; r++)
        {
            var k = p[_group[r]];
            var n = p.Slice(_groups, m).ToArray();
            var c0 = _c0[r];
            var nu = _nu[r];
            double Rate(double xi)
            {
                var v = k;
                for (var j = 0; j < m; j++) v *= Math.Pow(Math.Max(c0[j] + nu[j] * xi, 0), n[j]);
                return v;
            }
            double Slope(double xi)
            {
                // d/dξ of k·Π c_j^n_j = rate·Σ n_j·ν_j/c_j (zero where a species is used up).
                var v = Rate(xi);
                double s = 0;
                for (var j = 0; j < m; j++)
                {
                    var c = c0[j] + nu[j] * xi;
                    if (c > 0) s += n[j] * nu[j] / c;
                }
                return v * s;
            }
            var tr = _runs[r].Trace!;
            var span = values.Slice(_offset[r], tr.Times.Length);
            if (!Rosenbrock2.Solve(Rate, Slope, 0, tr.Times, span))
            {
                span.Fill(double.NaN);
                continue;
            }
            var f = _followed[r];
            var cf = f >= 0 ? c0[f] : _runs[r].InitialConcentrations.GetValueOrDefault(tr.Species, 0);
            var nuf = f >= 0 ? nu[f] : tr.Coefficient;
            for (var i = 0; i < span.Length; i++) span[i] = cf + nuf * span[i];
        }
    }
}
