namespace TraceKin.Reports;

/// <summary>What <see cref="SeriesOutputs"/> writes for a series besides the run sinks' files and report.html.</summary>
public static class ReportSet
{
    /// <summary>The numeric outputs: summary.json, runs.csv, pair-ratios.csv and the per-run tables.</summary>
    /// <param name="csv">How the CSV tables separate cells and write decimals.</param>
    /// <param name="tables">The per-run tables when they were streamed as the runs finished (the same instance was
    /// the run sink); null writes them from the result.</param>
    public static IReadOnlyList<ISeriesReportWriter> Numbers(bool plots, CsvStyle csv = CsvStyle.Standard, RunTables? tables = null) =>
        [new SummaryJson(plots), new RunsCsv(csv), new PairRatiosCsv(csv), tables ?? new RunTables(csv)];

    /// <summary>The series plots, drawn into plots/ (in memory first: the report embeds the same bytes).</summary>
    public static IReadOnlyList<ISeriesPlot> SeriesPlots() =>
        [new OrderPlot(), new RateConcentrationPlot(), new RateConstantPlot(), new ArrheniusPlot(), new EyringPlot()];
}
