using TraceKin.Fitting;

namespace TraceKin.Series;

/// <summary>
/// Carries the per-run uncertainty of which integrated law holds into the series results. A run's initial rate averaged
/// over several laws has a between-law part s_i (the Akaike-weighted spread of the laws' slopes at t0): it comes from
/// the shape of the trace, so it does not shrink as runs are added and may push every run the same way. It is
/// propagated as a systematic error through the linearised fit, Δp = H·Δv with H = (JᵀWJ)⁻¹JᵀW (the fit's own
/// sensitivity of each parameter to each rate; Draper &amp; Smith, Applied Regression Analysis, 3rd ed., §2.7, from
/// memory), with the runs' law-choice errors taken as fully correlated (one common effect, correlation 1: JCGM
/// 100:2008 §5.2.2): u_sys(p_j) = |Σ_i H_ji·s_i|. A common relative shift of every rate moves k and leaves the orders,
/// so k carries most of it. Combined with the statistical uncertainty in quadrature for the 95 % interval (ibid. §5.1):
/// however many runs, k is not narrowed below what the law choice allows. (Taking the worst case over signs instead,
/// Σ|H_ji|·s_i, covered the truth in 100 % of simulated series: far too wide.)
/// </summary>
internal static class LawChoiceUncertainty
{
    /// <summary>u_sys for every parameter of a fit with Jacobian <paramref name="jac"/> (n × p, row-major), weights
    /// <paramref name="w"/> (null: equal), and per-run systematic errors <paramref name="s"/> (absolute, in rate units).
    /// Null when no run carries one or the design is singular.</summary>
    public static double[]? Propagate(double[] jac, int n, int p, double[]? w, double[] s)
    {
        if (!s.Any(x => x > 0)) return null;
        var inv = SandwichCovariance.NormalInverse(jac, n, p, w);
        if (inv is null) return null;
        var u = new double[p];
        for (var i = 0; i < n; i++)
        {
            if (!(s[i] > 0)) continue;
            var wi = w?[i] ?? 1;
            for (var j = 0; j < p; j++)
            {
                double h = 0;
                for (var k = 0; k < p; k++) h += inv[j, k] * jac[i * p + k];
                u[j] += h * wi * s[i];
            }
        }
        for (var j = 0; j < p; j++) u[j] = Math.Abs(u[j]);
        return u;
    }

    /// <summary>√(se² + u_sys²).</summary>
    public static double Combined(double se, double sys) => Math.Sqrt(se * se + sys * sys);
}
