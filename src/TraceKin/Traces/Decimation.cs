namespace TraceKin.Traces;

/// <summary>
/// Reduces a dense trace to what a plot can show: per pixel column, the first, minimum, maximum and last point,
/// in time order, so the drawn envelope looks the same as drawing every point (common practice, no source).
/// Sparse traces are returned whole.
/// </summary>
internal static class Decimation
{
    public static (double[] X, double[] Y) Envelope(ReadOnlySpan<double> x, ReadOnlySpan<double> y, int columns)
    {
        var keep = EnvelopeIndices(x, y, columns);
        if (keep is null) return (x.ToArray(), y.ToArray());
        return (Pick(x, keep), Pick(y, keep));
    }

    /// <summary>
    /// The indices (ascending) that <see cref="Envelope"/> keeps, or null when every point is kept, so that other
    /// arrays aligned with the same samples (fitted values, residuals) can be thinned at the same points.
    /// </summary>
    public static int[]? EnvelopeIndices(ReadOnlySpan<double> x, ReadOnlySpan<double> y, int columns)
    {
        var n = x.Length;
        if (columns < 1 || n <= columns * 4) return null;
        double x0 = x[0], span = x[n - 1] - x[0];
        if (!(span > 0)) return null;
        var keep = new List<int>(columns * 4);
        var i = 0;
        while (i < n)
        {
            var col = Column(x[i], x0, span, columns);
            int start = i, iMin = i, iMax = i;
            while (i < n && Column(x[i], x0, span, columns) == col)
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
                keep.Add(k);
                prev = k;
            }
        }
        return keep.ToArray();
    }

    /// <summary>
    /// Per pixel column: the column's mean x and the lowest and highest y in it, for drawing a dense scatter (such as
    /// residuals) as the band it looks like. Columns without points are skipped.
    /// </summary>
    public static (double[] X, double[] Low, double[] High) Band(ReadOnlySpan<double> x, ReadOnlySpan<double> y, int columns) =>
        Band(x, y, default, columns);

    /// <summary><see cref="Band"/> of the differences a − b (e.g. residuals from data and fitted values), formed point by
    /// point, so a long trace needs no array of them.</summary>
    public static (double[] X, double[] Low, double[] High) BandOfDifference(ReadOnlySpan<double> x, ReadOnlySpan<double> a, ReadOnlySpan<double> b, int columns)
    {
        if (b.Length != a.Length) throw new ArgumentException("one value of b per value of a is needed", nameof(b));
        return Band(x, a, b, columns);
    }

    private static (double[] X, double[] Low, double[] High) Band(ReadOnlySpan<double> x, ReadOnlySpan<double> a, ReadOnlySpan<double> b, int columns)
    {
        var n = x.Length;
        var xs = new List<double>(columns); var lo = new List<double>(columns); var hi = new List<double>(columns);
        if (n == 0 || columns < 1) return ([], [], []);
        double x0 = x[0], span = x[n - 1] - x[0];
        var i = 0;
        while (i < n)
        {
            var col = span > 0 ? Column(x[i], x0, span, columns) : 0;
            double sx = 0, min = double.PositiveInfinity, max = double.NegativeInfinity;
            var m = 0;
            while (i < n && (span > 0 ? Column(x[i], x0, span, columns) : 0) == col)
            {
                sx += x[i]; m++;
                var v = b.IsEmpty ? a[i] : a[i] - b[i];
                if (v < min) min = v;
                if (v > max) max = v;
                i++;
            }
            xs.Add(sx / m); lo.Add(min); hi.Add(max);
        }
        return (xs.ToArray(), lo.ToArray(), hi.ToArray());
    }

    /// <summary>The values of <paramref name="source"/> at <paramref name="indices"/> (ascending); indices past its end are skipped.</summary>
    public static double[] Pick(ReadOnlySpan<double> source, int[] indices)
    {
        var count = 0;
        while (count < indices.Length && indices[count] < source.Length) count++;
        var result = new double[count];
        for (var k = 0; k < count; k++) result[k] = source[indices[k]];
        return result;
    }

    private static int Column(double x, double x0, double span, int columns) => (int)Math.Min(columns - 1, (x - x0) / span * columns);
}
