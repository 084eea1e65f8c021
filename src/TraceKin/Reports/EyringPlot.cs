using OxyPlot;
using OxyPlot.Axes;
using TraceKin.Analysis;
using TraceKin.Series;

namespace TraceKin.Reports;

/// <summary>The Eyring plot: ln(k/T) against 1/T with the fitted Eyring curve. Written as plots/eyring.png.</summary>
internal sealed class EyringPlot : ISeriesPlot
{
    public const string FileName = "eyring.png";

    string ISeriesPlot.FileName => FileName;

    public byte[]? Draw(SeriesResult result)
    {
        if (result.Findings?.Temperature is not { Eyring: not null } t) return null;
        return PlotStyle.ToPng(Build(t));
    }

    public static PlotModel Build(TemperatureFindings t)
    {
        var e = t.Eyring!;
        var m = PlotStyle.NewModel($"Eyring: ΔH‡ = {ReportNumber.Measured(e.EnthalpyOfActivation.Value, e.EnthalpyOfActivation.StdError)} kJ/mol, ΔS‡ = {ReportNumber.Measured(e.EntropyOfActivation.Value, e.EntropyOfActivation.StdError)} J/(mol·K)");
        m.Axes.Add(SeriesPlotParts.Axis(AxisPosition.Bottom, "1000 K / T"));
        // The quantity and its unit on the axis: k's own unit (the same in every temperature group) over kelvin.
        var kUnit = t.Groups.FirstOrDefault()?.RateConstant.Unit ?? "";
        m.Axes.Add(SeriesPlotParts.Axis(AxisPosition.Left, kUnit.Length == 0 ? "ln((k / T) / K⁻¹)" : $"ln((k / T) / (({kUnit})/K))"));
        var pts = SeriesPlotParts.Points("k per temperature", PlotStyle.Data);
        foreach (var g in t.Groups)
            pts.Points.Add(new OxyPlot.Series.ScatterErrorPoint(1000 / g.TemperatureK, Math.Log(g.RateConstant.Value / g.TemperatureK), 0, g.RateConstant.StdError / g.RateConstant.Value));
        var (x0, x1) = SeriesPlotParts.Range(t.Groups.Select(g => 1000 / g.TemperatureK));
        var pad = 0.05 * (x1 - x0);
        double dH = e.EnthalpyOfActivation.Value * 1000, dS = e.EntropyOfActivation.Value;
        m.Series.Add(SeriesPlotParts.Curve("Eyring fit (on k)", PlotStyle.Fit, x => Math.Log(Eyring.RateConstant(dH, dS, 1000 / x) / (1000 / x)), x0 - pad, x1 + pad));
        m.Series.Add(pts);
        SeriesPlotParts.Legend(m, OxyPlot.Legends.LegendPosition.TopRight);
        return m;
    }
}
