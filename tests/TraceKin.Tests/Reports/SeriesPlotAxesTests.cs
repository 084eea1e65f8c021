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
