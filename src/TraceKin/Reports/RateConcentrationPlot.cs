using OxyPlot;
using OxyPlot.Axes;
using TraceKin.Analysis;
using TraceKin.Series;

namespace TraceKin.Reports;

/// <summary>
/// Initial rate against the starting concentration of the saturation substrate (or of the only varied species), on
/// untransformed axes, with the power-law and saturation fits (the chosen law drawn solid, the other dashed). With
/// varied co-reactants the rates are divided by their fitted power terms first. Written as plots/rate-concentration.png.
/// </summary>
internal sealed class RateConcentrationPlot : ISeriesPlot
{
    public const string FileName = "rate-concentration.png";

    string ISeriesPlot.FileName => FileName;

    public byte[]? Draw(SeriesResult result)
    {
        if (result.Findings is not { } f || Species(f) is null || f.Temperature is not null) return null;
        var points = result.Runs.Select(r => new RunPoint(r.Id, r.Rates.Headline.Value, r.Rates.Headline.StdError, r.Plan.InitialConcentrations, r.Plan.TemperatureK)).ToList();
        return PlotStyle.ToPng(Build(f, points));
    }

    /// <summary>The species on the x axis, or null when there is nothing to draw (no saturation fit and several orders).</summary>
    public static string? Species(SeriesFindings f) =>
        f.Saturation?.Substrate ?? (f.Orders.Count == 1 && f.PowerLawFit is { Converged: true } ? f.Orders[0].Species : null);

    public static PlotModel Build(SeriesFindings f, IReadOnlyList<RunPoint> runs)
    {
        var s = Species(f)!;
        var sat = f.Saturation;
        var m = PlotStyle.NewModel($"Initial rate against [{s}]0 (chosen law: {f.ChosenLaw})");
        m.Axes.Add(SeriesPlotParts.Axis(AxisPosition.Bottom, $"[{s}]0 (mmol/L)"));
        m.Axes.Add(SeriesPlotParts.Axis(AxisPosition.Left, "v0 (µmol/(L·s))" + (sat?.CoReactantOrders.Count > 0 ? " / Π[Y]0^n" : "")));
        var byId = runs.ToDictionary(r => r.RunId);
        var co = sat?.CoReactantOrders ?? [];
        var pts = SeriesPlotParts.Points("runs (±1 se)", PlotStyle.Data);
        var xs = new List<double>();
        foreach (var id in f.RunsUsed)
        {
            if (!byId.TryGetValue(id, out var run)) continue;
            var c = run.InitialConcentrations;
            var adj = co.Aggregate(1.0, (acc, o) => acc * Math.Pow(c[o.Species], o.Value));
            pts.Points.Add(new OxyPlot.Series.ScatterErrorPoint(c[s] * 1e3, run.Rate / adj * 1e6, 0, run.RateStdError / adj * 1e6));
            xs.Add(c[s]);
        }
        var (_, x1) = SeriesPlotParts.Range(xs);
        var top = x1 * 1.1;
        var chosenSat = f.ChosenLaw == ModelSettings.Saturation;
        if (sat is not null)
        {
            double vmax = sat.Vmax.Value, km = sat.Km.Value;
            m.Series.Add(SeriesPlotParts.Curve($"saturation: Vmax·[{s}]/(Km + [{s}]), AICc {ReportNumber.Plain(sat.AiccSaturation, 4)}", PlotStyle.Fit,
                x => vmax * (x / 1e3) / (km + x / 1e3) * 1e6, 0, top * 1e3, style: chosenSat ? LineStyle.Solid : LineStyle.Dash));
        }
        // The power law in this species (co-reactants, if any, divided out as for the points).
        if (f.PowerLawFit is { Converged: true } pf && f.Orders.FirstOrDefault(o => o.Species == s) is { } order)
        {
            var k = pf.Parameters[0].Value;
            var n = order.Value;
            m.Series.Add(SeriesPlotParts.Curve($"power law: k·[{s}]^{ReportNumber.Plain(n, 3)}" + (sat is null ? "" : $", AICc {ReportNumber.Plain(sat.AiccPowerLaw, 4)}"), PlotStyle.Laws[1],
                x => k * Math.Pow(x / 1e3, n) * 1e6, top * 1e3 / 400, top * 1e3, style: chosenSat ? LineStyle.Dash : LineStyle.Solid));
        }
        m.Series.Add(pts);
        SeriesPlotParts.Legend(m, OxyPlot.Legends.LegendPosition.BottomRight);
        return m;
    }
}
