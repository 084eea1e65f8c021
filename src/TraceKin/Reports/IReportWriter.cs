using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>Writes one output of a whole series into the output folder.</summary>
public interface ISeriesReportWriter
{
    void Write(SeriesResult result, string outDir);
}
