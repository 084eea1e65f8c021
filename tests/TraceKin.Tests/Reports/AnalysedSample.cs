using TraceKin.Tests.Support;
using TraceKin.Analysis;
using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

/// <summary>
/// The bundled sample series analysed once, the way `analyse` does it (<see cref="SeriesOutputs"/>: run plots and tables
/// from the run sinks, then every series output): once with plots into <see cref="OutDir"/>, once with --no-plots into <see cref="NoPlotsDir"/>.
/// </summary>
public sealed class AnalysedSample : IDisposable
{
    public AnalysedSample()
    {
        OutDir = RepoPaths.NewTempDir("tracekin-report");
        NoPlotsDir = RepoPaths.NewTempDir("tracekin-report-noplots");
        Result = Analyse(RepoPaths.Sample("violet-complex-acid"), OutDir, plots: true);
        Analyse(RepoPaths.Sample("violet-complex-acid"), NoPlotsDir, plots: false);
    }

    public string OutDir { get; }
    public string NoPlotsDir { get; }
    public SeriesResult Result { get; }
    public string ReportPath => Path.Combine(OutDir, ReportHtml.FileName);
    public string SummaryPath => Path.Combine(OutDir, SummaryJson.FileName);

    public static SeriesResult Analyse(string series, string outDir, bool plots)
    {
        using var outputs = new SeriesOutputs(outDir, plots);
        var result = SeriesRunner.Analyse(series, new AnalysisOptions { Workers = 2, RunSink = outputs.RunSink });
        Assert.Empty(outputs.Write(result));
        return result;
    }

    public void Dispose()
    {
        foreach (var d in new[] { OutDir, NoPlotsDir })
            try { Directory.Delete(d, recursive: true); } catch (IOException) { }
    }
}
