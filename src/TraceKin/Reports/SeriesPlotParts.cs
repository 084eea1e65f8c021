using OxyPlot;
using OxyPlot.Axes;
using OxyPlot.Series;

namespace TraceKin.Reports;

/// <summary>Small building blocks shared by the series plots (axes, points with error bars, fitted curves, bands).</summary>
internal static class SeriesPlotParts
{
    public static LinearAxis Axis(AxisPosition position, string title) =>
        new() { Position = position, Title = title, MajorGridlineStyle = LineStyle.Solid, MajorGridlineColor = PlotStyle.Grid };

    public static ScatterErrorSeries Points(string title, OxyColor color) => new()
    {
        Title = title, MarkerType = MarkerType.Circle, MarkerSize = 4, MarkerFill = color, ErrorBarColor = color, ErrorBarStrokeThickness = 1,
    };

    public static LineSeries Curve(string title, OxyColor color, Func<double, double> f, double x0, double x1, int n = 80, LineStyle style = LineStyle.Solid)
    {
        var line = new LineSeries { Title = title, Color = color, StrokeThickness = 1.8, LineStyle = style };
        for (var i = 0; i <= n; i++)
        {
            var x = x0 + (x1 - x0) * i / n;
            var y = f(x);
            if (double.IsFinite(y)) line.Points.Add(new DataPoint(x, y));
        }
        return line;
    }

    /// <summary>A shaded band between two curves (e.g. a 95 % confidence band of a fitted line).</summary>
    public static AreaSeries Band(string? title, Func<double, (double Low, double High)> f, double x0, double x1, int n = 60)
    {
        var a = new AreaSeries { Title = title, Fill = PlotStyle.Band, Color = OxyColors.Transparent, Color2 = OxyColors.Transparent, StrokeThickness = 0 };
        for (var i = 0; i <= n; i++)
        {
            var x = x0 + (x1 - x0) * i / n;
            var (lo, hi) = f(x);
            if (!double.IsFinite(lo) || !double.IsFinite(hi)) continue;
            a.Points.Add(new DataPoint(x, hi));
            a.Points2.Add(new DataPoint(x, lo));
        }
        return a;
    }

    public static void Legend(PlotModel m, OxyPlot.Legends.LegendPosition position = OxyPlot.Legends.LegendPosition.TopLeft) =>
        m.Legends.Add(new OxyPlot.Legends.Legend { LegendPosition = position });

    public static (double Min, double Max) Range(IEnumerable<double> xs)
    {
        var list = xs.Where(double.IsFinite).ToList();
        return list.Count == 0 ? (0, 1) : (list.Min(), list.Max());
    }
}
