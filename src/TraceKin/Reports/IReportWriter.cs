using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>Writes one output of a whole series into the output folder (run by <see cref="SeriesOutputs"/>).</summary>
public interface ISeriesReportWriter
{
    /// <summary>The files it writes, relative to the output folder (named in the report and the log when one fails).</summary>
    IReadOnlyList<string> Files { get; }

    void Write(SeriesResult result, string outDir);
}
