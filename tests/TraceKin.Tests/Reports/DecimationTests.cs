using TraceKin.Traces;
using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

/// <summary>
/// What a plot draws of a dense trace must show what every point would: the per-column envelope keeps each column's
/// extremes, and the band gives each column's lowest and highest value (checked against a brute-force pass over
/// the same columns; common practice, no source).
/// </summary>
public sealed class DecimationTests
{
    private static (double[] X, double[] Y) Noisy(int n, int seed)
    {
        var rng = new Random(seed);
        var x = Enumerable.Range(0, n).Select(i => 0.5 * i).ToArray();
        var y = x.Select(v => Math.Exp(-v / 1000) + 0.05 * (rng.NextDouble() - 0.5)).ToArray();
        return (x, y);
    }

    [Fact]
    public void Band_of_differences_equals_the_band_of_the_difference_array()
    {
        // The residual band of a run plot is formed point by point; it must be the same numbers, bit for bit.
        var (x, y) = Noisy(10_000, 5);
        var fitted = x.Select(v => Math.Exp(-v / 1000)).ToArray();
        var diff = y.Select((v, i) => v - fitted[i]).ToArray();
        var (ax, alo, ahi) = Decimation.Band(x, diff, 900);
        var (bx, blo, bhi) = Decimation.BandOfDifference(x, y, fitted, 900);
        Assert.Equal(ax, bx);
        Assert.Equal(alo, blo);
        Assert.Equal(ahi, bhi);
    }

    [Fact]
    public void Band_gives_each_columns_lowest_and_highest_value()
    {
        var (x, y) = Noisy(10_000, 3);
        const int columns = 900;
        var (bx, lo, hi) = Decimation.Band(x, y, columns);
        // Brute force: group by the same column rule, min and max per group.
        var span = x[^1] - x[0];
        var groups = Enumerable.Range(0, x.Length).GroupBy(i => (int)Math.Min(columns - 1, (x[i] - x[0]) / span * columns)).ToList();
        Assert.Equal(groups.Count, bx.Length);
        for (var k = 0; k < groups.Count; k++)
        {
            Assert.Equal(groups[k].Min(i => y[i]), lo[k]);
            Assert.Equal(groups[k].Max(i => y[i]), hi[k]);
            Assert.Equal(groups[k].Average(i => x[i]), bx[k], 9);
        }
        Assert.Equal(y.Min(), lo.Min());
        Assert.Equal(y.Max(), hi.Max());
    }

    [Fact]
    public void Envelope_keeps_every_columns_extremes_and_every_point_of_a_sparse_trace()
    {
        var (x, y) = Noisy(10_000, 4);
        var keep = Decimation.EnvelopeIndices(x, y, 900)!;
        Assert.True(keep.Length <= 4 * 900);
        var kept = keep.Select(i => y[i]).ToArray();
        Assert.Equal(y.Min(), kept.Min());
        Assert.Equal(y.Max(), kept.Max());
        var (sx, sy) = Noisy(300, 5);
        Assert.Null(Decimation.EnvelopeIndices(sx, sy, 900));
    }
}
