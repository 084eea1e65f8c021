namespace TraceKin.Reports;

/// <summary>
/// Reduces a dense trace to what a plot can show: per pixel column, the first, minimum, maximum and last point,
/// in time order, so the drawn envelope looks the same as drawing every point (common practice, no source).
/// Sparse traces are returned whole.
/// </summary>
public static class Decimation
{
    public static (double[] X, double[] Y) Envelope(ReadOnlySpan<double> x, ReadOnlySpan<double> y, int columns)
    {
        var n = x.Length;
        if (n <= columns * 4) return (x.ToArray(), y.ToArray());
        double x0 = x[0], span = x[n - 1] - x[0];
        if (!(span > 0)) return (x.ToArray(), y.ToArray());
        var xs = new List<double>(columns * 4);
        var ys = new List<double>(columns * 4);
        var i = 0;
        while (i < n)
        {
            var col = (int)Math.Min(columns - 1, (x[i] - x0) / span * columns);
            int start = i, iMin = i, iMax = i;
            while (i < n && (int)Math.Min(columns - 1, (x[i] - x0) / span * columns) == col)
            {
                if (y[i] < y[iMin]) iMin = i;
                if (y[i] > y[iMax]) iMax = i;
                i++;
            }
            var last = i - 1;
            Span<int> idx = [start, iMin, iMax, last];
            idx.Sort();
            var prev = -1;
            foreach (var k in idx)
            {
                if (k == prev) continue;
                xs.Add(x[k]);
                ys.Add(y[k]);
                prev = k;
            }
        }
        return (xs.ToArray(), ys.ToArray());
    }
}
