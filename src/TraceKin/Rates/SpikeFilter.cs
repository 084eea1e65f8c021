using TraceKin.Fitting;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Statistics;

namespace TraceKin.Rates;

/// <summary>One sample excluded as a spike: 0-based index, time (s) and value.</summary>
public sealed record Spike(int Index, double Time, double Value);

/// <summary>
/// Spike finding by the Hampel identifier: a point is an outlier when it lies more than a cutoff number of robust
/// standard deviations from a robust centre, the scale being 1.4826·MAD (Hampel 1974, J. Am. Stat. Assoc. 69, 383;
/// Leys et al. 2013, J. Exp. Soc. Psychol. 49, 764, who recommend the MAD over the SD).
/// Stage 1 (model-free): each point against a running median of seven (the trace's ends against a robust line through
/// their neighbours), on the noise scale of the second differences.
/// Stage 2 (confirmation):
/// residuals from the fitted integrated law, so that a genuine kink (the end of a zero-order run) is not taken for a spike.
/// The cutoff grows with the number of points so that a clean trace of any length rarely loses a sample: see
/// <see cref="CutoffFor"/>.
/// </summary>
internal static class SpikeFilter
{
    /// <summary>The smallest cutoff, for short traces: 3.5 after Iglewicz &amp; Hoaglin (1993), "How to Detect and
    /// Handle Outliers", from memory.</summary>
    public const double MinimumCutoff = 3.5;

    /// <summary>Chance that a clean trace loses any sample to the spike rule (family-wise, per trace).</summary>
    public const double FalseFlagRate = 0.01;

    /// <summary>
    /// Cutoff for n points: c = max(3.5, Φ⁻¹(1 − α/(2n))), α = <see cref="FalseFlagRate"/>. By Boole's inequality
    /// (the Bonferroni bound) n normal residuals all stay within ±c with probability ≥ 1 − α (common practice, no
    /// source). n = 60 gives 3.8, n = 400 gives 4.2, n = 10,000 gives 4.9. A fixed 3.5 would flag about 5 samples
    /// of pure noise in every 10,000-point trace.
    /// </summary>
    public static double CutoffFor(int n) =>
        n < 2 ? MinimumCutoff : Math.Max(MinimumCutoff, Normal.InvCDF(0, 1, 1 - FalseFlagRate / (2.0 * n)));

    /// <summary>
    /// Candidate spikes: |y_i − median of y_(i−3…i+3)| &gt; cutoff·σ̂. The running median of seven keeps any monotone
    /// stretch exactly (the residual is 0 however sharply the trace curves) and is not pulled by a burst of up to
    /// three consecutive spikes, so only points out of line with their neighbours are candidates. The first and last
    /// three points have no centred window: each is compared with the straight line through its six nearest
    /// neighbours (Theil–Sen: median of pairwise slopes, Sen 1968, J. Am. Stat. Assoc. 63, 1379), which a
    /// curving end of the trace follows, and only beyond <see cref="EndFactor"/> times the limit, since an
    /// extrapolated line is less certain than a median inside the trace.
    /// σ̂ = 1.4826·median|Δ²y|/√6 is the noise SD from the second differences
    /// Δ²y_i = y_(i−1) − 2y_i + y_(i+1) (SD √6·σ for white noise; the MAD keeps it robust to the spikes themselves).
    /// </summary>
    public static bool[] Candidates(ReadOnlySpan<double> y)
    {
        var n = y.Length;
        if (n < 9) return new bool[n];
        // Second differences of a smooth, densely sampled trace centre on 0, so the MAD is taken about 0 (one
        // selection instead of two). Beyond 4,000 points every other one is enough: the MAD of 2,000 values is
        // within about 3 % of the scale (SE of the MAD ≈ 1.17σ/√n: Rousseeuw & Croux 1993, JASA 88, 1273, from memory).
        var stride = n > 4000 ? 2 : 1;
        var second = new double[(n - 2 + stride - 1) / stride];
        for (int i = 1, k = 0; i < n - 1; i += stride) second[k++] = Math.Abs(y[i - 1] - 2 * y[i] + y[i + 1]);
        var sigma = 1.4826 * ArrayStatistics.MedianInplace(second) / Math.Sqrt(6);
        return sigma > 0 ? Candidates(y, CutoffFor(n) * sigma) : new bool[n];
    }

    /// <summary>How much further than the limit an end point must lie from the line through its neighbours.</summary>
    public const double EndFactor = 1.5;

    /// <summary>Interior points: |y_i − median of y_(i−3…i+3)| &gt; limit; the three points at each end:
    /// |y_i − Theil–Sen line of the six nearest others| &gt; <see cref="EndFactor"/>·limit.</summary>
    internal static bool[] Candidates(ReadOnlySpan<double> y, double limit)
    {
        var n = y.Length;
        var flag = new bool[n];
        if (n < 7) return flag;
        Span<double> w = stackalloc double[7];
        for (var i = 3; i < n - 3; i++)
        {
            // A point beyond the limit from the median of seven lies beyond it from at least four of its six
            // neighbours (four of the seven are on the median's far side, and the point is not one of them); so a
            // point within the limit of three neighbours is no candidate, and most points are settled without the
            // median (floating-point subtraction is monotone, so the shortcut gives the same flags).
            if (Math.Abs(y[i] - y[i - 1]) <= limit && Math.Abs(y[i] - y[i + 1]) <= limit && Math.Abs(y[i] - y[i - 2]) <= limit) continue;
            y.Slice(i - 3, 7).CopyTo(w);
            flag[i] = Math.Abs(y[i] - MedianOf7(w)) > limit;
        }
        for (var i = 0; i < 3; i++)
        {
            flag[i] = EndResidual(y, i, 0) > EndFactor * limit;
            flag[n - 1 - i] = EndResidual(y, n - 1 - i, n - 7) > EndFactor * limit;
        }
        return flag;
    }

    /// <summary>|y_i − the Theil–Sen line through the other six of y_(from…from+6)|, positions as abscissae.</summary>
    internal static double EndResidual(ReadOnlySpan<double> y, int i, int from)
    {
        Span<double> slopes = stackalloc double[15];
        Span<int> xs = stackalloc int[6];
        var m = 0;
        for (var j = from; j < from + 7; j++) if (j != i) xs[m++] = j;
        var k = 0;
        for (var a = 0; a < 6; a++)
            for (var b = a + 1; b < 6; b++) slopes[k++] = (y[xs[b]] - y[xs[a]]) / (xs[b] - xs[a]);
        slopes.Sort();
        var slope = slopes[7];
        Span<double> icpt = stackalloc double[6];
        for (var a = 0; a < 6; a++) icpt[a] = y[xs[a]] - slope * xs[a];
        icpt.Sort();
        var intercept = 0.5 * (icpt[2] + icpt[3]);
        return Math.Abs(y[i] - (intercept + slope * i));
    }

    /// <summary>Median of seven values (sorts the span in place).</summary>
    internal static double MedianOf7(Span<double> w)
    {
        // Insertion sort: seven values, no allocation.
        for (var a = 1; a < 7; a++)
        {
            var v = w[a]; var b = a - 1;
            while (b >= 0 && w[b] > v) { w[b + 1] = w[b]; b--; }
            w[b + 1] = v;
        }
        return w[3];
    }

    /// <summary>Confirmed spikes among all points, from the residuals of a fit that excluded the candidates:
    /// |r − median r| &gt; cutoff·max(1.4826·MAD, floor).</summary>
    public static bool[] FromResiduals(ReadOnlySpan<double> residuals, double floor)
    {
        var flag = new bool[residuals.Length];
        var (centre, scale) = RobustScale.MedianAndScaleInPlace(residuals.ToArray());
        // A perfectly smooth (noise-free) trace has MAD 0; a floor keeps rounding from being called a spike.
        var s = Math.Max(scale, floor);
        if (!(s > 0)) return flag;
        var limit = CutoffFor(residuals.Length) * s;
        for (var i = 0; i < flag.Length; i++) flag[i] = Math.Abs(residuals[i] - centre) > limit;
        return flag;
    }

    /// <summary><see cref="FromResiduals"/> of the residuals y − fitted, with one working array instead of two (the
    /// residuals are formed again, by the same subtraction, where the flags are set): the same flags.</summary>
    internal static bool[] FromFit(ReadOnlySpan<double> y, ReadOnlySpan<double> fitted, double floor)
    {
        var n = y.Length;
        var flag = new bool[n];
        var work = new double[n];
        for (var i = 0; i < n; i++) work[i] = y[i] - fitted[i];
        var (centre, scale) = RobustScale.MedianAndScaleInPlace(work);
        var s = Math.Max(scale, floor);
        if (!(s > 0)) return flag;
        var limit = CutoffFor(n) * s;
        for (var i = 0; i < n; i++) flag[i] = Math.Abs(y[i] - fitted[i] - centre) > limit;
        return flag;
    }
}
