using MathNet.Numerics.LinearAlgebra;

namespace TraceKin.Series;

/// <summary>
/// Checks, before any fit, whether the series can separate the orders of its varied species. The ln[X]0 columns are
/// centred (within each temperature group, which has its own k) and scaled to unit length; the condition number is the
/// ratio of the largest to the smallest singular value of that matrix (Belsley, Kuh &amp; Welsch, Regression Diagnostics,
/// 1980, ch. 3, from memory: indices above ~30 mean strong collinearity). A singular value that is zero to rounding
/// means some combination of species never varies: the species that carry weight in its right singular vector are
/// confounded and get no order.
/// </summary>
internal static class OrderDesign
{
    /// <summary>Condition number above which the design is treated as singular.</summary>
    public const double SingularCondition = 1e8;

    /// <summary>Condition number above which orders are flagged as poorly determined.</summary>
    public const double StrongCollinearity = 30;

    public static DesignCheck Check(IReadOnlyList<RunPoint> runs, IReadOnlyList<string> species, IReadOnlyList<int> group)
    {
        int n = runs.Count, p = species.Count;
        if (p == 0) return new DesignCheck(species, 1, true, []);
        var x = Matrix<double>.Build.Dense(n, p);
        var flat = new List<string>();
        for (var j = 0; j < p; j++)
        {
            for (var i = 0; i < n; i++) x[i, j] = Math.Log(runs[i].InitialConcentrations[species[j]]);
            foreach (var g in group.Distinct())
            {
                var idx = Enumerable.Range(0, n).Where(i => group[i] == g).ToArray();
                var mean = idx.Average(i => x[i, j]);
                foreach (var i in idx) x[i, j] -= mean;
            }
            var norm = x.Column(j).L2Norm();
            // A column that is constant within every group varies only together with temperature.
            if (norm <= 1e-12 * Math.Sqrt(n)) { flat.Add(species[j]); continue; }
            x.SetColumn(j, x.Column(j) / norm);
        }
        if (flat.Count > 0)
            return new DesignCheck(species, double.PositiveInfinity, false, flat.Select(s => (IReadOnlyList<string>)[s, "temperature"]).ToList());
        if (n < p) return new DesignCheck(species, double.PositiveInfinity, false, [species.ToList()]);

        // Singular values and right vectors of X are those of R in X = QR (thin): no n×n factor for a big series.
        var svd = x.QR(MathNet.Numerics.LinearAlgebra.Factorization.QRMethod.Thin).R.Svd(computeVectors: true);
        var s = svd.S;
        var cond = s[p - 1] > 0 ? s[0] / s[p - 1] : double.PositiveInfinity;
        var confounded = new List<IReadOnlyList<string>>();
        for (var k = 0; k < p; k++)
        {
            if (s[k] > 0 && s[0] / s[k] <= SingularCondition) continue;
            var v = svd.VT.Row(k);
            var members = Enumerable.Range(0, p).Where(j => Math.Abs(v[j]) > 0.1).Select(j => species[j]).ToList();
            if (members.Count > 0) confounded.Add(members);
        }
        return new DesignCheck(species, cond, confounded.Count == 0, confounded);
    }
}
