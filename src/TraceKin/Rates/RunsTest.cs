using MathNet.Numerics.Distributions;

namespace TraceKin.Rates;

/// <summary>
/// Wald–Wolfowitz runs test on the signs of residuals (Wald &amp; Wolfowitz 1940, Ann. Math. Statist. 11, 147):
/// with n₊ positive and n₋ negative residuals (zeros skipped) and R runs, E[R] = 2n₊n₋/N + 1,
/// Var[R] = 2n₊n₋(2n₊n₋ − N)/(N²(N − 1)), z = (R − E[R])/√Var. Too few runs (z ≪ 0) means the residuals follow a
/// pattern the model misses; <see cref="PValue"/> is the one-sided normal-approximation P(Z ≤ z).
/// </summary>
public sealed record RunsTest(int Runs, int Positive, int Negative, double Expected, double Z, double PValue)
{
    public static RunsTest Of(ReadOnlySpan<double> residuals, ReadOnlySpan<double> weights = default)
    {
        int pos = 0, neg = 0, runs = 0, last = 0;
        for (var i = 0; i < residuals.Length; i++)
        {
            if (!weights.IsEmpty && weights[i] == 0) continue;
            var s = Math.Sign(residuals[i]);
            if (s == 0) continue;
            if (s > 0) pos++; else neg++;
            if (s != last) runs++;
            last = s;
        }
        var n = (double)(pos + neg);
        if (pos == 0 || neg == 0)
            return new RunsTest(runs, pos, neg, 1, double.NegativeInfinity, n > 2 ? 0 : 1);
        var e = 2.0 * pos * neg / n + 1;
        var v = 2.0 * pos * neg * (2.0 * pos * neg - n) / (n * n * (n - 1));
        var z = v > 0 ? (runs - e) / Math.Sqrt(v) : 0;
        return new RunsTest(runs, pos, neg, e, z, Normal.CDF(0, 1, z));
    }
}
