using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>The outputs of `analyse`, in the order they are written.</summary>
public static class ReportSet
{
    /// <param name="csv">How the CSV tables separate cells and write decimals.</param>
    /// <param name="tables">The per-run tables when they were streamed as the runs finished (the same instance was
    /// the run sink); null writes them from the result.</param>
    public static IReadOnlyList<ISeriesReportWriter> SeriesWriters(bool plots, CsvStyle csv = CsvStyle.Standard, RunTables? tables = null)
    {
        ISeriesReportWriter[] numbers = [new SummaryJson(plots), new RunsCsv(csv), tables ?? new RunTables(csv)];
        ISeriesReportWriter[] pictures = plots ? [new OrderPlot(), new RateConcentrationPlot(), new RateConstantPlot(), new ArrheniusPlot(), new EyringPlot()] : [];
        return [.. numbers, .. pictures, new ReportHtml(images: plots)]; // the report last, so it embeds every plot written before it
    }

    /// <summary>True for the writers that draw a series plot into plots/ (the report embeds their files).</summary>
    public static bool DrawsPlot(ISeriesReportWriter writer) =>
        writer is OrderPlot or RateConcentrationPlot or RateConstantPlot or ArrheniusPlot or EyringPlot;
}
