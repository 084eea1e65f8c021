using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>
/// pair-ratios.csv: every listed pair of runs that differ in one species only (at most
/// <see cref="Series.OrderAnalysis.MaxPairRatios"/>, in plan order), one row per pair with the order it gives,
/// n = ln(v_B/v_A)/ln([X]0,B/[X]0,A), and its standard error. Written like runs.csv (<see cref="CsvTable"/>); a series
/// without such pairs gets the header only. summary.json carries the total count, this file's name and the first
/// <see cref="SummaryJson.ListedPairRatios"/> pairs; report.html shows as many and links here.
/// </summary>
public sealed class PairRatiosCsv(CsvStyle style = CsvStyle.Standard) : ISeriesReportWriter
{
    public const string FileName = "pair-ratios.csv";

    public static readonly string[] Header = ["run A", "run B", "species", "concentration ratio", "rate ratio", "order", "std error"];

    public IReadOnlyList<string> Files => [FileName];

    public void Write(SeriesResult result, string outDir) =>
        AtomicFile.Write(Path.Combine(outDir, FileName), s => WriteTo(result, s, style), root: outDir);

    public static void WriteTo(SeriesResult r, Stream stream, CsvStyle style = CsvStyle.Standard)
    {
        using var csv = new CsvTable(stream, style, leaveOpen: true);
        csv.Header(Header);
        foreach (var p in r.Findings?.PairRatios ?? [])
        {
            csv.Text(p.RunA).Text(p.RunB).Text(p.Species).Number(p.ConcentrationRatio).Number(p.RateRatio).Number(p.Order).Number(p.StdError);
            csv.EndRow();
        }
    }
}
