using OxyPlot.Axes;
using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

/// <summary>Series plots name every axis with its quantity and unit, and clip no error bar (presentation; no source).</summary>
public sealed class SeriesPlotAxesTests
{
    private static readonly SeriesResult Amber = SeriesRunner.Analyse(RepoPaths.Sample("amber-ester-warmth"), new AnalysisOptions { Workers = 2 });

    [Fact]
    public void The_Eyring_axis_names_the_unit_of_k_over_kelvin()
    {
        var m = EyringPlot.Build(Amber.Findings!.Temperature!);
        var left = m.Axes.Single(a => a.Position == AxisPosition.Left);
        Assert.DoesNotContain("k-unit", left.Title);
        Assert.Contains("(1/s)/K", left.Title);
    }

    [Fact]
    public void The_k_per_run_axis_spans_every_error_bar_and_the_series_interval()
    {
        var m = RateConstantPlot.Build(Amber);
        var left = (LinearAxis)m.Axes.Single(a => a.Position == AxisPosition.Left);
        foreach (var p in Amber.Findings!.PerRunK)
        {
            Assert.True(left.Minimum <= p.Value - p.StdError, $"{p.RunId}: lower error bar below the axis");
            Assert.True(left.Maximum >= p.Value + p.StdError, $"{p.RunId}: upper error bar above the axis");
        }
        Assert.Contains("1/s", left.Title);
    }
}

/// <summary>The orders plot centres each species on its geometric mean, so species decades apart share the axes.</summary>
public sealed class OrderPlotCentringTests
{
    [Fact]
    public void Species_decades_apart_share_the_axes_and_their_lines_pass_through_the_origin()
    {
        // The violet demo: [complex]0 0.2–0.8 mmol/L, [H+]0 50–250 mmol/L (two and a half decades apart).
        var r = SeriesRunner.Analyse(RepoPaths.Sample("violet-complex-acid"), new AnalysisOptions { Workers = 2 });
        var m = OrderPlot.Build(r);
        var lines = m.Series.OfType<OxyPlot.Series.LineSeries>().Where(l => l is not OxyPlot.Series.AreaSeries).ToList();
        Assert.Equal(2, lines.Count);
        foreach (var line in lines)
        {
            var (a, b) = (line.Points[0], line.Points[1]);
            var atZero = a.Y + (b.Y - a.Y) * (0 - a.X) / (b.X - a.X); // the line's height at x = 0 (the geometric mean)
            Assert.InRange(atZero, -1e-9, 1e-9);
            Assert.True(a.X < 0 && b.X > 0, "each species' span straddles its geometric mean");
            Assert.InRange(Math.Abs(a.X), 0.1, 2.0); // ln of a ratio, not ln of a concentration (≈ −8 or −2)
        }
    }
}
