using TraceKin.Traces;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;
using OxyPlot.Series;
using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>
/// The per-run picture: the concentration trace with the early window shaded, the window fit and the initial-rate
/// tangent on top; the window fit's residuals below. As a run sink it draws on the worker thread (one reusable
/// renderer per worker). The PNG is written before <see cref="Accept"/> returns, unless an <see cref="OutputQueue"/>
/// is given: then the worker hands the bytes over and goes on, and the queue's owner calls
/// <see cref="OutputQueue.Complete"/> before treating the plots as written. With <see cref="Keep"/> set, the bytes also
/// go to the report (<see cref="ReportPlots.AddRun"/>, which holds only as many as the report embeds).
/// </summary>
public sealed class RunPlot : IRunSink, IDisposable
{
    private readonly string _plotDir;
    // One pixel buffer and render context per worker thread, reused for every run that worker draws.
    private readonly ThreadLocal<PngRenderer> _renderers = new(() => new PngRenderer(), trackAllValues: true);
    private readonly string _outDir;
    private readonly OutputQueue? _files;
    private RunFileNames? _names;
    private bool _disposed;

    public RunPlot(string outDir, OutputQueue? writeQueue = null)
    {
        _outDir = outDir;
        _plotDir = Path.Combine(outDir, "plots");
        _files = writeQueue;
        OutputPaths.EnsureFolder(outDir, _plotDir);
    }

    /// <summary>Takes the run file names from the plan (<see cref="RunFileNames"/>), unique across the series.</summary>
    public void Begin(TraceKin.Setup.Plan plan) => _names = RunFileNames.For(plan);

    /// <summary>The file name (in plots/) of a run's picture: from the plan when <see cref="Begin"/> was called.</summary>
    public string FileNameOf(string runId) => _names?.PlotFile(runId) ?? $"run-{RunFileNames.Stem(runId)}.png";

    /// <summary>Where the drawn pictures go for the report to embed (null: nowhere, the file only).</summary>
    public ReportPlots? Keep { get; init; }

    public void Accept(RunResult run)
    {
        var name = FileNameOf(run.Id);
        var path = Path.Combine(_plotDir, name);
        var png = _renderers.Value!.Render(Build(run));
        if (_files is null) AtomicFile.WriteAllBytes(path, png, _outDir);
        else _files.Enqueue(path, png, _outDir);
        Keep?.AddRun(name, png);
    }

    public static byte[] Render(RunResult run) => PlotStyle.ToPng(Build(run));

    public void Dispose()
    {
        if (_disposed) return;
        _disposed = true;
        foreach (var r in _renderers.Values) r.Dispose();
        _renderers.Dispose();
    }

    public static PlotModel Build(RunResult run)
    {
        var c = run.Converted.Concentration;
        var h = run.Rates.Headline;
        var scale = ConcentrationScale(c.Values);
        var m = PlotStyle.NewModel($"{run.Id} — {run.File}");
        m.Axes.Add(new LinearAxis { Position = AxisPosition.Bottom, Title = "time (s)", MajorGridlineStyle = LineStyle.Solid, MajorGridlineColor = PlotStyle.Grid });
        m.Axes.Add(new LinearAxis { Key = "c", Position = AxisPosition.Left, Title = $"[{run.Converted.Species}] ({scale.Unit})", StartPosition = 0.32, EndPosition = 1, MajorGridlineStyle = LineStyle.Solid, MajorGridlineColor = PlotStyle.Grid });
        m.Axes.Add(new LinearAxis { Key = "r", Position = AxisPosition.Left, Title = $"residual ({scale.Unit})", StartPosition = 0, EndPosition = 0.25, MajorGridlineStyle = LineStyle.Solid, MajorGridlineColor = PlotStyle.Grid });

        var dense = c.Count > 400;
        if (c.Count > 4 * PlotStyle.Width)
        {
            // Several samples per pixel column: the trace drawn as what the pixels show, each column from its lowest
            // to its highest value, in one draw call (an envelope line through them covers the same pixels).
            var (bx, lo, hi) = Decimation.Band(c.Times, c.Values, PlotStyle.Width);
            for (var k = 0; k < bx.Length; k++) { lo[k] *= scale.Factor; hi[k] *= scale.Factor; }
            m.Series.Add(new ColumnBandSeries { Title = "data", YAxisKey = "c", Color = PlotStyle.Data, X = bx, Low = lo, High = hi });
        }
        else if (dense)
        {
            var (xs, ys) = Decimation.Envelope(c.Times, c.Values, PlotStyle.Width);
            var line = new LineSeries { Title = "data", YAxisKey = "c", Color = PlotStyle.Data, StrokeThickness = 1 };
            for (var i = 0; i < xs.Length; i++) line.Points.Add(new DataPoint(xs[i], ys[i] * scale.Factor));
            m.Series.Add(line);
        }
        else
        {
            var pts = new ScatterSeries { Title = "data", YAxisKey = "c", MarkerType = MarkerType.Circle, MarkerSize = 2.5, MarkerFill = PlotStyle.Data };
            for (var i = 0; i < c.Count; i++) pts.Points.Add(new ScatterPoint(c.Times[i], c.Values[i] * scale.Factor));
            m.Series.Add(pts);
        }
        m.Annotations.Add(new RectangleAnnotation { MinimumX = h.WindowStart, MaximumX = h.WindowEnd, Fill = PlotStyle.Window, YAxisKey = "c", Layer = AnnotationLayer.BelowSeries });

        var fit = new LineSeries { Title = h.Method, YAxisKey = "c", Color = PlotStyle.Fit, StrokeThickness = 2 };
        // Dense fits and residuals are drawn from their min/max envelope per pixel column, like the data.
        var fitTimes = c.Times.AsSpan(0, h.Fitted.Length);
        foreach (var i in Visible(fitTimes, h.Fitted)) fit.Points.Add(new DataPoint(c.Times[i], h.Fitted[i] * scale.Factor));
        m.Series.Add(fit);

        // The tangent stops where it leaves the range of the data, so a long window does not stretch the axis.
        var tEnd = Math.Min(c.Times[^1], 2 * h.WindowEnd);
        double yLo = double.PositiveInfinity, yHi = double.NegativeInfinity;
        foreach (var v in c.Values) if (double.IsFinite(v)) { yLo = Math.Min(yLo, v); yHi = Math.Max(yHi, v); }
        if (h.Slope != 0 && double.IsFinite(yLo))
        {
            var bound = h.Slope < 0 ? yLo : yHi;
            var tCross = (bound - h.ConcentrationAtZero) / h.Slope;
            if (tCross > 0) tEnd = Math.Min(tEnd, tCross);
        }
        var tangent = new LineSeries { Title = "initial-rate tangent", YAxisKey = "c", Color = PlotStyle.Tangent, LineStyle = LineStyle.Dash, StrokeThickness = 1.5 };
        tangent.Points.Add(new DataPoint(0, h.ConcentrationAtZero * scale.Factor));
        tangent.Points.Add(new DataPoint(tEnd, (h.ConcentrationAtZero + h.Slope * tEnd) * scale.Factor));
        m.Series.Add(tangent);

        var fittedCount = h.Fitted.Length;
        if (dense && fittedCount > 4 * PlotStyle.Width)
        {
            // Thousands of residual dots draw as a solid band between the lowest and highest residual of each pixel
            // column; it is drawn as that: one vertical hairline per column, in one draw call, a fraction of the dots.
            // The residuals are formed column by column, never as an array as long as the trace.
            var (bx, lo, hi) = Decimation.BandOfDifference(fitTimes, c.Values.AsSpan(0, fittedCount), h.Fitted, PlotStyle.Width);
            for (var k = 0; k < bx.Length; k++) { lo[k] *= scale.Factor; hi[k] *= scale.Factor; }
            var band = new ColumnBandSeries { Title = "", YAxisKey = "r", Color = PlotStyle.Fit, X = bx, Low = lo, High = hi };
            m.Series.Add(band);
        }
        else
        {
            var residuals = new double[fittedCount];
            for (var i = 0; i < residuals.Length; i++) residuals[i] = c.Values[i] - h.Fitted[i];
            var res = new ScatterSeries { Title = "", YAxisKey = "r", MarkerType = MarkerType.Circle, MarkerSize = 2, MarkerFill = PlotStyle.Fit };
            foreach (var i in Visible(fitTimes, residuals)) res.Points.Add(new ScatterPoint(c.Times[i], residuals[i] * scale.Factor));
            m.Series.Add(res);
        }
        m.Annotations.Add(new LineAnnotation { Type = LineAnnotationType.Horizontal, Y = 0, YAxisKey = "r", Color = PlotStyle.Tangent, StrokeThickness = 1 });
        m.Legends.Add(new OxyPlot.Legends.Legend { LegendPosition = OxyPlot.Legends.LegendPosition.TopRight, LegendBackground = OxyColor.FromAColor(220, OxyColors.White) });
        m.Subtitle = $"v0 = {ReportNumber.Measured(h.Value, h.StdError)} {h.Unit} ({h.Method}, window {ReportNumber.Plain(h.WindowStart, 3)}–{ReportNumber.Plain(h.WindowEnd, 3)} s)";
        return m;
    }

    /// <summary>Indices of the points worth drawing: the envelope over the plot's pixel columns, or every point when few.</summary>
    private static IEnumerable<int> Visible(ReadOnlySpan<double> x, ReadOnlySpan<double> y) =>
        (IEnumerable<int>?)Decimation.EnvelopeIndices(x, y, PlotStyle.Width) ?? Enumerable.Range(0, x.Length);

    /// <summary>A display unit for concentrations so that axis numbers stay readable.</summary>
    public static (double Factor, string Unit) ConcentrationScale(ReadOnlySpan<double> values)
    {
        var max = 0.0;
        foreach (var v in values) if (double.IsFinite(v)) max = Math.Max(max, Math.Abs(v));
        return max switch
        {
            >= 0.1 => (1, "mol/L"),
            >= 1e-4 => (1e3, "mmol/L"),
            _ => (1e6, "µmol/L"),
        };
    }
}
