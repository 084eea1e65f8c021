namespace TraceKin.Rates;

/// <summary>One sample excluded as a spike: 0-based index, time (s) and value.</summary>
public sealed record Spike(int Index, double Time, double Value);

/// <summary>
/// Spike finding by the Hampel identifier: a point is an outlier when it lies more than
/// <see cref="Cutoff"/> robust standard deviations from a robust centre, the scale being 1.4826·MAD (Hampel 1974,
/// J. Am. Stat. Assoc. 69, 383; Leys et al. 2013, J. Exp. Soc. Psychol. 49, 764, who recommend the MAD over the SD).
/// Stage 1 (model-free): residuals from a running median of 7 points. Stage 2 (confirmation): residuals from the
/// fitted integrated law, so that a genuine kink (the end of a zero-order run) is not taken for a spike.
/// Cutoff 3.5 after Iglewicz &amp; Hoaglin (1993), "How to Detect and Handle Outliers", from memory.
/// </summary>
public static class SpikeFilter
{
    public const double Cutoff = 3.5;
    private const int HalfWindow = 3;

    /// <summary>Candidate spikes: |y − running median| &gt; Cutoff·1.4826·MAD of those residuals.</summary>
    public static bool[] Candidates(ReadOnlySpan<double> y)
    {
        var n = y.Length;
        var flag = new bool[n];
        if (n < 2 * HalfWindow + 3) return flag;
        var d = new double[n];
        Span<double> win = stackalloc double[2 * HalfWindow + 1];
        for (var i = 0; i < n; i++)
        {
            var lo = Math.Clamp(i - HalfWindow, 0, n - win.Length);
            y.Slice(lo, win.Length).CopyTo(win);
            win.Sort();
            d[i] = y[i] - win[HalfWindow];
        }
        Mark(d, flag, null);
        return flag;
    }

    /// <summary>Confirmed spikes among all points, from the residuals of a fit that excluded the candidates.</summary>
    public static bool[] FromResiduals(ReadOnlySpan<double> residuals, double floor)
    {
        var flag = new bool[residuals.Length];
        Mark(residuals.ToArray(), flag, floor);
        return flag;
    }

    private static void Mark(double[] d, bool[] flag, double? floor)
    {
        var (centre, scale) = MedianAndScale(d);
        // A perfectly smooth (noise-free) trace has MAD 0; a floor keeps rounding from being called a spike.
        var s = Math.Max(scale, floor ?? 0);
        if (!(s > 0)) return;
        for (var i = 0; i < d.Length; i++) flag[i] = Math.Abs(d[i] - centre) > Cutoff * s;
    }

    /// <summary>Median and 1.4826·MAD (the MAD scaled to the SD of a normal sample; Leys et al. 2013, eq. 1).</summary>
    public static (double Median, double Scale) MedianAndScale(ReadOnlySpan<double> x)
    {
        if (x.Length == 0) return (double.NaN, double.NaN);
        var a = x.ToArray();
        Array.Sort(a);
        var med = Median(a);
        for (var i = 0; i < a.Length; i++) a[i] = Math.Abs(a[i] - med);
        Array.Sort(a);
        return (med, 1.4826 * Median(a));
    }

    private static double Median(double[] sorted) =>
        sorted.Length % 2 == 1 ? sorted[sorted.Length / 2] : 0.5 * (sorted[sorted.Length / 2 - 1] + sorted[sorted.Length / 2]);
}
