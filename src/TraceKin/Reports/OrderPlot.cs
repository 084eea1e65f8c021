using OxyPlot;
using OxyPlot.Axes;
using OxyPlot.Series;
using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>
/// The order plot: ln v0 against ln[X]0 for each species with an order, the other species' contributions removed at the
/// fitted orders, each species centred on its geometric mean so that species decades apart share the axes, with the
/// fitted line and its 95 % band. Written as plots/orders.png.
/// </summary>
internal sealed class OrderPlot : ISeriesPlot
{
    public const string FileName = "orders.png";

    string ISeriesPlot.FileName => FileName;

    public byte[]? Draw(SeriesResult result)
    {
        if (result.Findings is not { Orders.Count: > 0, RateConstant: not null }) return null;
        return PlotStyle.ToPng(Build(result));
    }

    public static PlotModel Build(SeriesResult r)
    {
        var f = r.Findings!;
        // Species whose concentrations lie decades apart share one axis only when each is centred on its own geometric
        // mean: x = ln([X]0/[X]g), y = ln v0 − Σ other n·ln[Y]0 − (ln k + n·ln[X]g). Every species' line then passes
        // through the origin with its order as slope, and the points keep their scatter about it.
        var m = PlotStyle.NewModel("Orders: ln v0 against ln [X]0, each species about its geometric mean");
        m.Axes.Add(new LinearAxis { Position = AxisPosition.Bottom, Title = "ln([X]0 / [X]g), [X]g = geometric mean of the species' [X]0", MajorGridlineStyle = LineStyle.Solid, MajorGridlineColor = PlotStyle.Grid });
        m.Axes.Add(new LinearAxis { Position = AxisPosition.Left, Title = "ln(v0 / v0 fitted at [X]g), other species at their orders", MajorGridlineStyle = LineStyle.Solid, MajorGridlineColor = PlotStyle.Grid });
        // The line is drawn at the fitted orders, so with the k fitted beside them (not the k refitted at rounded orders).
        var lnk = Math.Log((f.RateConstantAtFittedOrders ?? f.RateConstant!).Value);
        var byId = r.Runs.ToDictionary(x => x.Id);
        for (var s = 0; s < f.Orders.Count; s++)
        {
            var o = f.Orders[s];
            var color = PlotStyle.Laws[s % PlotStyle.Laws.Length];
            var lnGeo = f.RunsUsed.Average(id => Math.Log(byId[id].Plan.InitialConcentrations[o.Species]));
            var yShift = lnk + o.Value * lnGeo;
            var pts = new ScatterSeries { Title = $"{o.Species}: n = {ReportNumber.Measured(o.Value, o.StdError)} ([{o.Species}]g = {ReportNumber.Plain(Math.Exp(lnGeo))} mol/L)", MarkerType = MarkerType.Circle, MarkerSize = 4, MarkerFill = color };
            double xmin = double.MaxValue, xmax = double.MinValue;
            foreach (var id in f.RunsUsed)
            {
                var run = byId[id];
                var x = Math.Log(run.Plan.InitialConcentrations[o.Species]);
                var others = f.Orders.Where(q => q.Species != o.Species).Sum(q => q.Value * Math.Log(run.Plan.InitialConcentrations[q.Species]));
                pts.Points.Add(new ScatterPoint(x - lnGeo, Math.Log(run.Rates.Headline.Value) - others - yShift));
                xmin = Math.Min(xmin, x);
                xmax = Math.Max(xmax, x);
            }
            if (Band(f, s, xmin, xmax, lnGeo, yShift) is { } band) m.Series.Add(band);
            m.Series.Add(pts);
            var line = new LineSeries { Color = color, StrokeThickness = 1.5 };
            line.Points.Add(new DataPoint(xmin - lnGeo, lnk + o.Value * xmin - yShift));
            line.Points.Add(new DataPoint(xmax - lnGeo, lnk + o.Value * xmax - yShift));
            m.Series.Add(line);
        }
        m.Legends.Add(new OxyPlot.Legends.Legend { LegendPosition = OxyPlot.Legends.LegendPosition.TopLeft });
        return m;
    }

    /// <summary>
    /// 95 % confidence band of the fitted line ln k + n·x from the nonlinear fit's covariance (delta method:
    /// var = var(k)/k² + x²·var(n) + 2x·cov(k, n)/k), for a single-temperature series.
    /// </summary>
    private static AreaSeries? Band(Series.SeriesFindings f, int s, double xmin, double xmax, double xShift, double yShift)
    {
        if (f.PowerLawFit is not { Converged: true, Covariance: { } cov } pf || pf.Parameters.Count != f.Orders.Count + 1) return null;
        var k = pf.Parameters[0].Value;
        var j = s + 1;
        var t = pf.T95;
        // Computed at the measured ln[X]0 and drawn shifted like the points.
        return SeriesPlotParts.Band(s == 0 ? "95 % confidence band" : null, xs =>
        {
            var x = xs + xShift;
            var y = Math.Log(k) + pf.Parameters[j].Value * x - yShift;
            var v = cov[0, 0] / (k * k) + x * x * cov[j, j] + 2 * x * cov[0, j] / k;
            var h = t * Math.Sqrt(Math.Max(v, 0));
            return (y - h, y + h);
        }, xmin - xShift, xmax - xShift);
    }
}
