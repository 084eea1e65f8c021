using TraceKin.Traces;
using OxyPlot;
using OxyPlot.Series;
using OxyPlot.SkiaSharp;
using SkiaSharp;

namespace TraceKin.Reports;

/// <summary>
/// A dense scatter drawn as what it looks like at the plot's resolution: one vertical hairline per pixel column from
/// the column's lowest to its highest value (see <see cref="Decimation.Band"/>), all in one draw call.
/// </summary>
internal sealed class ColumnBandSeries : XYAxisSeries
{
    public double[] X { get; init; } = [];
    public double[] Low { get; init; } = [];
    public double[] High { get; init; } = [];
    public OxyColor Color { get; init; } = OxyColors.Black;

    public override void Render(IRenderContext rc)
    {
        if (X.Length == 0) return;
        if (rc is SkiaRenderContext { SkCanvas: { } canvas } skia && skia.RenderTarget != RenderTarget.VectorGraphic)
        {
            RenderHairlines(canvas, skia.DpiScale);
            return;
        }
        var segments = new List<ScreenPoint>(2 * X.Length);
        for (var k = 0; k < X.Length; k++)
        {
            var (a, b) = Column(k);
            segments.Add(a);
            segments.Add(b);
        }
        rc.DrawLineSegments(segments, Color, 1, EdgeRenderingMode.PreferSpeed);
    }

    /// <summary>
    /// On a pixel canvas, the columns as one-pixel, non-antialiased hairlines in one call: the same pixels as the
    /// drawing library's one-unit aliased lines, without stroking each of them as a path (about ten times cheaper).
    /// </summary>
    private void RenderHairlines(SKCanvas canvas, float scale)
    {
        var points = new SKPoint[2 * X.Length];
        for (var k = 0; k < X.Length; k++)
        {
            var (a, b) = Column(k);
            points[2 * k] = new SKPoint((float)a.X * scale, (float)a.Y * scale);
            points[2 * k + 1] = new SKPoint((float)b.X * scale, (float)b.Y * scale);
        }
        using var paint = new SKPaint { Color = new SKColor(Color.R, Color.G, Color.B, Color.A), Style = SKPaintStyle.Stroke, StrokeWidth = scale > 1.5f ? scale : 0, IsAntialias = false };
        canvas.DrawPoints(SKPointMode.Lines, points, paint);
    }

    /// <summary>The screen end points of column <paramref name="k"/>: from its lowest value up to its highest.</summary>
    private (ScreenPoint Low, ScreenPoint High) Column(int k)
    {
        var a = Transform(new DataPoint(X[k], Low[k]));
        var b = Transform(new DataPoint(X[k], High[k]));
        // A column whose extremes meet still gets a one-pixel mark.
        if (Math.Abs(b.Y - a.Y) < 1) b = new ScreenPoint(b.X, a.Y - 1);
        return (a, b);
    }

    /// <summary>A short line in the series colour, as for a line series.</summary>
    public override void RenderLegend(IRenderContext rc, OxyRect legendBox)
    {
        var y = (legendBox.Top + legendBox.Bottom) / 2;
        rc.DrawLine([new ScreenPoint(legendBox.Left, y), new ScreenPoint(legendBox.Right, y)], Color, 1, EdgeRenderingMode.PreferSpeed);
    }

    protected override void UpdateMaxMin()
    {
        base.UpdateMaxMin();
        if (X.Length == 0) return;
        MinX = X.Min(); MaxX = X.Max();
        MinY = Low.Min(); MaxY = High.Max();
    }
}
