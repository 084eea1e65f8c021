using MathNet.Numerics.Statistics;

namespace TraceKin.Fitting;

/// <summary>A robust centre and spread shared by the spike screen and the report's distribution of k per run.</summary>
internal static class RobustScale
{
    /// <summary>Median and 1.4826·MAD (the MAD scaled to the SD of a normal sample; Leys et al. 2013, eq. 1), found by
    /// selection (MathNet's in-place median), not by sorting; reorders and overwrites the array it is given.</summary>
    public static (double Median, double Scale) MedianAndScaleInPlace(double[] a)
    {
        if (a.Length == 0) return (double.NaN, double.NaN);
        var med = ArrayStatistics.MedianInplace(a);
        for (var i = 0; i < a.Length; i++) a[i] = Math.Abs(a[i] - med);
        return (med, 1.4826 * ArrayStatistics.MedianInplace(a));
    }
}
