using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>The outputs of `analyse`, in the order they are written.</summary>
public static class ReportSet
{
    public static IReadOnlyList<ISeriesReportWriter> SeriesWriters(bool plots) =>
        [.. plots ? [new SummaryJson(plots: true), new RunsCsv(), new OrderPlot(), new RateConcentrationPlot(), new RateConstantPlot(), new ArrheniusPlot(), new EyringPlot()]
                  : new ISeriesReportWriter[] { new SummaryJson(plots: false), new RunsCsv() },
         new ReportHtml(images: plots)]; // last, so it embeds every plot written before it

    /// <summary>True for the writers that draw a series plot into plots/ (the report embeds their files).</summary>
    public static bool DrawsPlot(ISeriesReportWriter writer) =>
        writer is OrderPlot or RateConcentrationPlot or RateConstantPlot or ArrheniusPlot or EyringPlot;
}
