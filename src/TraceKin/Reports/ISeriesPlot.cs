using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>
/// One series plot: drawn in memory as PNG bytes, which <see cref="SeriesOutputs"/> writes into plots/ and hands to the
/// report to embed, so a picture is rendered once and never read back from disk.
/// </summary>
public interface ISeriesPlot
{
    /// <summary>The file name in plots/ (e.g. orders.png).</summary>
    string FileName { get; }

    /// <summary>The picture of <paramref name="result"/>, or null when the series has nothing for this plot to show.</summary>
    byte[]? Draw(SeriesResult result);
}
