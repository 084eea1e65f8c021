using TraceKin.Traces;
using OxyPlot;
using OxyPlot.Axes;
using TraceKin.Analysis;
using TraceKin.Series;

namespace TraceKin.Reports;

/// <summary>
/// The Arrhenius plot: ln k per temperature group against 1/T with ±se(k)/k error bars and the fitted Arrhenius curve
/// (fitted on k, drawn in these coordinates), with its 95 % confidence band from the k_ref/Ea covariance (delta method).
/// Written as plots/arrhenius.png.
/// </summary>
internal sealed class ArrheniusPlot : ISeriesPlot
{
    public const string FileName = "arrhenius.png";

    string ISeriesPlot.FileName => FileName;

    public byte[]? Draw(SeriesResult result)
    {
        if (result.Findings?.Temperature is not { Arrhenius: not null } t) return null;
        return PlotStyle.ToPng(Build(t));
    }

    public static PlotModel Build(TemperatureFindings t)
    {
        var a = t.Arrhenius!;
        var m = PlotStyle.NewModel($"Arrhenius: Ea = {ReportNumber.Measured(a.ActivationEnergy.Value, a.ActivationEnergy.StdError)} kJ/mol");
        m.Axes.Add(SeriesPlotParts.Axis(AxisPosition.Bottom, "1000 K / T"));
        m.Axes.Add(SeriesPlotParts.Axis(AxisPosition.Left, $"ln(k / ({t.Groups[0].RateConstant.Unit}))"));
        var pts = SeriesPlotParts.Points("k per temperature", PlotStyle.Data);
        foreach (var g in t.Groups)
            pts.Points.Add(new OxyPlot.Series.ScatterErrorPoint(1000 / g.TemperatureK, Math.Log(g.RateConstant.Value), 0, g.RateConstant.StdError / g.RateConstant.Value));
        var (x0, x1) = SeriesPlotParts.Range(t.Groups.Select(g => 1000 / g.TemperatureK));
        var pad = 0.05 * (x1 - x0);
        double kRef = a.RateConstantAtReference.Value, ea = a.ActivationEnergy.Value * 1000, tRef = a.ReferenceTemperatureK;
        var cov = a.Fit.Covariance!;
        var tq = a.Fit.T95;
        m.Series.Add(SeriesPlotParts.Band("95 % confidence band", x =>
        {
            // ln k(T) = ln k_ref − (Ea/R)·u, u = 1/T − 1/T_ref; var = var(k_ref)/k_ref² + u²·var(Ea)/R² − 2u·cov/(k_ref·R).
            var u = x / 1000 - 1 / tRef;
            const double R = PhysicalConstants.GasConstant;
            var y = Math.Log(kRef) - ea / R * u;
            var v = cov[0, 0] / (kRef * kRef) + u * u * cov[1, 1] / (R * R) - 2 * u * cov[0, 1] / (kRef * R);
            var h = tq * Math.Sqrt(Math.Max(v, 0));
            return (y - h, y + h);
        }, x0 - pad, x1 + pad));
        m.Series.Add(SeriesPlotParts.Curve("Arrhenius fit (on k)", PlotStyle.Fit, x => Math.Log(Arrhenius.RateConstant(kRef, ea, tRef, 1000 / x)), x0 - pad, x1 + pad));
        m.Series.Add(pts);
        SeriesPlotParts.Legend(m, OxyPlot.Legends.LegendPosition.TopRight);
        return m;
    }
}
