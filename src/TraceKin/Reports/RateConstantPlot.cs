using OxyPlot;
using OxyPlot.Axes;
using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>
/// k per run (v0/Π[X]0^n at the orders used, ±1 se) in plan order, with the series' k and its 95 % interval as a band:
/// a run that stands apart shows at a glance. Written as plots/k-per-run.png.
/// </summary>
internal sealed class RateConstantPlot : ISeriesPlot
{
    public const string FileName = "k-per-run.png";

    string ISeriesPlot.FileName => FileName;

    public byte[]? Draw(SeriesResult result)
    {
        if (result.Findings is not { PerRunK.Count: > 0 }) return null;
        return PlotStyle.ToPng(Build(result));
    }

    public static PlotModel Build(SeriesResult r)
    {
        var f = r.Findings!;
        var unit = f.RateConstant?.Unit ?? f.Temperature?.Groups.FirstOrDefault()?.RateConstant.Unit ?? "";
        var m = PlotStyle.NewModel("Rate constant per run");
        var labels = new CategoryAxis { Position = AxisPosition.Bottom, Title = "run", MajorGridlineStyle = LineStyle.None };
        m.Axes.Add(labels);
        // The axis spans every error bar and the series' interval, so nothing is clipped.
        var axis = SeriesPlotParts.Axis(AxisPosition.Left, $"k ({unit})");
        var lows = f.PerRunK.Select(p => p.Value - p.StdError).Where(double.IsFinite).ToList();
        var highs = f.PerRunK.Select(p => p.Value + p.StdError).Where(double.IsFinite).ToList();
        if (f.RateConstant is { } band && double.IsFinite(band.Ci95Low) && double.IsFinite(band.Ci95High)) { lows.Add(band.Ci95Low); highs.Add(band.Ci95High); }
        if (lows.Count > 0 && highs.Count > 0)
        {
            var (lo, hi) = (lows.Min(), highs.Max());
            var pad = 0.08 * Math.Max(hi - lo, 1e-12 * Math.Max(Math.Abs(hi), Math.Abs(lo)));
            axis.Minimum = lo - pad;
            axis.Maximum = hi + pad;
        }
        m.Axes.Add(axis);
        var pts = SeriesPlotParts.Points("k per run (±1 se)", PlotStyle.Data);
        for (var i = 0; i < f.PerRunK.Count; i++)
        {
            labels.Labels.Add(f.PerRunK[i].RunId);
            pts.Points.Add(new OxyPlot.Series.ScatterErrorPoint(i, f.PerRunK[i].Value, 0, f.PerRunK[i].StdError));
        }
        if (f.RateConstant is { } k && double.IsFinite(k.Ci95Low))
        {
            m.Series.Add(SeriesPlotParts.Band($"series k, 95 % interval ({ReportNumber.Interval(k.Value, k.StdError, k.Ci95Low, k.Ci95High)})", _ => (k.Ci95Low, k.Ci95High), -0.5, f.PerRunK.Count - 0.5, 2));
            m.Series.Add(SeriesPlotParts.Curve($"series k = {ReportNumber.Measured(k.Value, k.StdError)}", PlotStyle.Fit, _ => k.Value, -0.5, f.PerRunK.Count - 0.5, 2));
        }
        m.Series.Add(pts);
        SeriesPlotParts.Legend(m, OxyPlot.Legends.LegendPosition.TopRight);
        return m;
    }
}
