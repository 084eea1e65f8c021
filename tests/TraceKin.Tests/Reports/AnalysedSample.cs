using TraceKin.Tests.Support;
using TraceKin.Analysis;
using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

/// <summary>
/// The bundled sample series analysed once, the way `analyse` does it (run plots from the run sink, then every series
/// writer): once with plots into <see cref="OutDir"/>, once with --no-plots into <see cref="NoPlotsDir"/>.
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
        var result = SeriesRunner.Analyse(series, new AnalysisOptions { Workers = 2, RunSink = plots ? new RunPlot(outDir) : null });
        foreach (var w in ReportSet.SeriesWriters(plots)) w.Write(result, outDir);
        return result;
    }

    public void Dispose()
    {
        foreach (var d in new[] { OutDir, NoPlotsDir })
            try { Directory.Delete(d, recursive: true); } catch (IOException) { }
    }
}
