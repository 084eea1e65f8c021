using System.Collections.Concurrent;
using TraceKin.Analysis;
using TraceKin.Traces;

namespace TraceKin.Reports;

/// <summary>One output that could not be written: its path relative to the output folder and why.</summary>
public sealed record OutputFailure(string Output, string Error)
{
    /// <summary>The code of the problem the report lists for it.</summary>
    public const string Code = "output-not-written";

    public Warning AsWarning() => new(Code, Output, $"this output could not be written ({Error}); it is missing from the results folder");
}

/// <summary>
/// Every output of one series, written one way for `analyse` and `watch`: the run sinks (run plots, streamed per-run
/// tables) during the analysis, then <see cref="Write"/>: summary.json, runs.csv and the tables in the background, the
/// series plots side by side (each drawn once in memory, written from those bytes and embedded in the report from the
/// same bytes), the run-plot queue drained, and report.html last. Each output is contained: any exception in one
/// writer (not only a file error) is caught and returned as an <see cref="OutputFailure"/>, every other output is
/// still written, and the report lists what is missing among its problems. Use one instance per analysis.
/// </summary>
public sealed class SeriesOutputs : IDisposable
{
    public const string PlotFolder = "plots";

    private readonly string _outDir;
    private readonly bool _plots;
    private readonly CsvStyle _csv;
    private readonly OutputQueue? _queue;
    private readonly IReadOnlyList<ISeriesPlot> _seriesPlots;
    private readonly IReadOnlyList<ISeriesReportWriter> _moreWriters;
    private readonly ConcurrentQueue<OutputFailure> _failures = new();
    private bool _disposed;

    /// <param name="outDir">The series' results folder (the caller has checked it is a real folder).</param>
    /// <param name="plots">Draw the run and series plots (false: numbers and report only, analyse --no-plots).</param>
    /// <param name="root">The output folder the streamed tables must stay inside (see <see cref="AtomicFile"/>); default <paramref name="outDir"/>.</param>
    /// <param name="queueRunPlots">Hand run plots to background writers (analyse) instead of writing each before the
    /// sink returns (watch, which writes a plot's key file after its picture).</param>
    /// <param name="seriesPlots">The series plots to draw; default <see cref="ReportSet.SeriesPlots"/>.</param>
    /// <param name="moreWriters">Further outputs written beside the numbers (each contained like the others).</param>
    public SeriesOutputs(string outDir, bool plots, CsvStyle csv = CsvStyle.Standard, string? root = null, bool queueRunPlots = true,
        IReadOnlyList<ISeriesPlot>? seriesPlots = null, IReadOnlyList<ISeriesReportWriter>? moreWriters = null)
    {
        _outDir = outDir;
        _plots = plots;
        _csv = csv;
        _seriesPlots = plots ? seriesPlots ?? ReportSet.SeriesPlots() : [];
        _moreWriters = moreWriters ?? [];
        Tables = new RunTables(outDir, csv, root);
        if (plots)
        {
            Images = new ReportPlots(Path.Combine(outDir, PlotFolder));
            // plots/ is checked (a real folder, no link on the way) before the queue's threads start, so a refusal leaves none behind.
            OutputPaths.EnsureFolder(outDir, Images.PlotDir);
            // Plot files are flushed to disk by background writers, so the workers go straight on to the next run.
            _queue = queueRunPlots ? new OutputQueue() : null;
            RunPlots = new RunPlot(outDir, _queue) { Keep = Images };
        }
    }

    /// <summary>The run sink that draws each run's plot (null without plots); `watch` wraps it to redraw changed runs only.</summary>
    public RunPlot? RunPlots { get; }

    /// <summary>The run sink that streams the per-run tables as the runs finish; <see cref="Write"/> renames them into place.</summary>
    public RunTables Tables { get; }

    /// <summary>The pictures the report embeds (null without plots).</summary>
    public ReportPlots? Images { get; }

    /// <summary>Both run sinks, for <see cref="AnalysisOptions.RunSink"/>.</summary>
    public IRunSink RunSink => RunSinks.Combine(RunPlots, Tables)!;

    /// <summary>
    /// An output found not written by someone else (a run sink wrapping <see cref="RunPlots"/>): listed in the report
    /// and returned by <see cref="Write"/> with the others. Thread-safe.
    /// </summary>
    public void Failed(string output, Exception error) => Failed(output, Describe(error));

    public void Failed(string output, string error)
    {
        _failures.Enqueue(new OutputFailure(output, error));
        Images?.Failed(Path.GetFileName(output));
    }

    /// <summary>
    /// Writes every series output of <paramref name="result"/>, the report last; returns the outputs that could not be
    /// written (in file-name order), including those reported through <see cref="Failed(string, string)"/>. Never throws
    /// for a writer's failure.
    /// </summary>
    public IReadOnlyList<OutputFailure> Write(SeriesResult result)
    {
        var writers = ReportSet.Numbers(_plots, _csv, Tables).Concat(_moreWriters).ToList();
        // Numbers in the background; the series plots side by side meanwhile.
        var numbers = writers.Select(w => Task.Run(() => Contain(w.Files.Count == 1 ? w.Files[0] : string.Join(", ", w.Files), () => w.Write(result, _outDir)))).ToArray();
        Parallel.ForEach(_seriesPlots, plot => Contain($"{PlotFolder}/{plot.FileName}", () => Draw(plot, result)));
        if (_queue is not null)
            foreach (var (path, error) in _queue.Complete()) Failed(Relative(path), error);
        // The report last: it embeds the plots drawn above and lists every output that is missing. While the numbers
        // are still being written (a large summary.json) the page is streamed meanwhile into its temporary file (never
        // held whole in memory), renamed into place once they are done, and drawn again only if one of them then
        // fails, so the page can name it.
        var numbersDone = Task.WhenAll(numbers);
        PendingFile? page = null;
        var failedBefore = _failures.Count;
        if (!numbersDone.IsCompleted)
        {
            try
            {
                page = AtomicFile.Begin(Path.Combine(_outDir, ReportHtml.FileName), _outDir);
                ReportHtml.WriteTo(Shown(result), Images, page.Stream);
            }
            catch (Exception ex) when (ex is not OperationCanceledException)
            {
                page?.Dispose(); // drawn again below, and recorded there if it fails again
                page = null;
            }
        }
        numbersDone.Wait();
        using (page)
        {
            if (page is not null && _failures.Count == failedBefore)
                Contain(ReportHtml.FileName, page.Commit);
            else
            {
                page?.Dispose();
                Contain(ReportHtml.FileName, () => ReportHtml.Write(Shown(result), _outDir, Images));
            }
        }
        return Sorted();
    }

    /// <summary>The result as the report shows it: every output not written so far listed among the series' problems.</summary>
    private SeriesResult Shown(SeriesResult result)
    {
        var missing = Sorted();
        return missing.Count == 0 ? result : result with { Warnings = [.. result.Warnings, .. missing.Select(f => f.AsWarning())] };
    }

    /// <summary>Draws one series plot, writes it, and keeps the bytes for the report; a plot with nothing to show this time leaves no old picture behind.</summary>
    private void Draw(ISeriesPlot plot, SeriesResult result)
    {
        var path = Path.Combine(_outDir, PlotFolder, plot.FileName);
        if (plot.Draw(result) is not { } png)
        {
            // (a watch pass after the temperatures stopped varying, say); a link there is not ours and is left alone.
            var old = new FileInfo(path);
            if (old.Exists && old.LinkTarget is null) old.Delete();
            return;
        }
        AtomicFile.WriteAllBytes(path, png, root: _outDir);
        Images?.AddSeries(plot.FileName, png);
    }

    private void Contain(string output, Action write)
    {
        try { write(); }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            Failed(output, ex);
        }
    }

    private List<OutputFailure> Sorted() => _failures.OrderBy(f => f.Output, StringComparer.Ordinal).ThenBy(f => f.Error, StringComparer.Ordinal).ToList();

    private string Relative(string path) => Path.GetRelativePath(_outDir, path).Replace('\\', '/');

    /// <summary>A file error is said as it is; anything else is a defect of ours and names its type.</summary>
    private static string Describe(Exception ex) =>
        ex is IOException or UnauthorizedAccessException ? ex.Message : $"{ex.GetType().Name}: {ex.Message}";

    public void Dispose()
    {
        if (_disposed) return;
        _disposed = true;
        _queue?.Dispose();
        RunPlots?.Dispose();
        Tables.Dispose();
    }
}
