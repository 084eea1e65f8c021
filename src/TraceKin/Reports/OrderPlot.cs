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
        AtomicFile.WriteAllBytes(Path.Combine(outDir, "plots", FileName), PlotStyle.ToPng(Build(result)));
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
            var pts = new ScatterSeries { Title = $"{o.Species}: n = {o.Value:0.000} ± {o.StdError:0.000}", MarkerType = MarkerType.Circle, MarkerSize = 4, MarkerFill = color };
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
            m.Series.Add(pts);
            var line = new LineSeries { Color = color, StrokeThickness = 1.5 };
            line.Points.Add(new DataPoint(xmin, lnk + o.Value * xmin));
            line.Points.Add(new DataPoint(xmax, lnk + o.Value * xmax));
            m.Series.Add(line);
        }
        m.Legends.Add(new OxyPlot.Legends.Legend { LegendPosition = OxyPlot.Legends.LegendPosition.TopLeft });
        return m;
    }
}
