using OxyPlot;
using OxyPlot.Axes;
using OxyPlot.Series;
using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>
/// The order plot: ln v0 against ln[X]0 for each species with an order, the other species' contributions removed at the
/// fitted orders, with the fitted line. Written as plots/orders.png.
/// </summary>
public sealed class OrderPlot : ISeriesReportWriter
{
    public const string FileName = "orders.png";

    public void Write(SeriesResult result, string outDir)
    {
        if (result.Findings is not { Orders.Count: > 0, RateConstant: not null }) return;
        AtomicFile.WriteAllBytes(Path.Combine(outDir, "plots", FileName), PlotStyle.ToPng(Build(result)), root: outDir);
    }

    public static PlotModel Build(SeriesResult r)
    {
        var f = r.Findings!;
        var m = PlotStyle.NewModel("Orders: ln v0 against ln [X]0");
        m.Axes.Add(new LinearAxis { Position = AxisPosition.Bottom, Title = "ln([X]0 / (mol/L))", MajorGridlineStyle = LineStyle.Solid, MajorGridlineColor = PlotStyle.Grid });
        m.Axes.Add(new LinearAxis { Position = AxisPosition.Left, Title = "ln(v0 / (mol/(L·s))) − Σ other n·ln[Y]0", MajorGridlineStyle = LineStyle.Solid, MajorGridlineColor = PlotStyle.Grid });
        var lnk = Math.Log(f.RateConstant!.Value);
        var byId = r.Runs.ToDictionary(x => x.Id);
        for (var s = 0; s < f.Orders.Count; s++)
        {
            var o = f.Orders[s];
            var color = PlotStyle.Laws[s % PlotStyle.Laws.Length];
            var pts = new ScatterSeries { Title = $"{o.Species}: n = {ReportNumber.Measured(o.Value, o.StdError)}", MarkerType = MarkerType.Circle, MarkerSize = 4, MarkerFill = color };
            double xmin = double.MaxValue, xmax = double.MinValue;
            foreach (var id in f.RunsUsed)
            {
                var run = byId[id];
                var x = Math.Log(run.Plan.InitialConcentrations[o.Species]);
                var others = f.Orders.Where(q => q.Species != o.Species).Sum(q => q.Value * Math.Log(run.Plan.InitialConcentrations[q.Species]));
                pts.Points.Add(new ScatterPoint(x, Math.Log(run.Rates.Headline.Value) - others));
                xmin = Math.Min(xmin, x);
                xmax = Math.Max(xmax, x);
            }
            if (Band(f, s, xmin, xmax) is { } band) m.Series.Add(band);
            m.Series.Add(pts);
            var line = new LineSeries { Color = color, StrokeThickness = 1.5 };
            line.Points.Add(new DataPoint(xmin, lnk + o.Value * xmin));
            line.Points.Add(new DataPoint(xmax, lnk + o.Value * xmax));
            m.Series.Add(line);
        }
        m.Legends.Add(new OxyPlot.Legends.Legend { LegendPosition = OxyPlot.Legends.LegendPosition.TopLeft });
        return m;
    }

    /// <summary>
    /// 95 % confidence band of the fitted line ln k + n·x from the nonlinear fit's covariance (delta method:
    /// var = var(k)/k² + x²·var(n) + 2x·cov(k, n)/k), for a single-temperature series.
    /// </summary>
    private static AreaSeries? Band(Series.SeriesFindings f, int s, double xmin, double xmax)
    {
        if (f.PowerLawFit is not { Converged: true, Covariance: { } cov } pf || pf.Parameters.Count != f.Orders.Count + 1) return null;
        var k = pf.Parameters[0].Value;
        var j = s + 1;
        var t = pf.T95;
        return SeriesPlotParts.Band(s == 0 ? "95 % confidence band" : null, x =>
        {
            var y = Math.Log(k) + pf.Parameters[j].Value * x;
            var v = cov[0, 0] / (k * k) + x * x * cov[j, j] + 2 * x * cov[0, j] / k;
            var h = t * Math.Sqrt(Math.Max(v, 0));
            return (y - h, y + h);
        }, xmin, xmax);
    }
}
