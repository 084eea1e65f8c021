using System.Collections.Concurrent;

namespace TraceKin.Reports;

/// <summary>
/// The pictures report.html shows, as the very bytes written into plots/: the series plots drawn for this report and
/// the run plots drawn in the same pass. Only as many run plots are held as the report embeds
/// (<see cref="ReportHtml.MaxEmbeddedRunPlots"/>): beyond that the report links every run plot from plots/, and none is
/// kept in memory. The folder is read only for a run plot that was not drawn in this pass (a watch pass redraws the
/// runs whose inputs changed) and looked at (metadata only) for the links of a large series. Thread-safe: run plots
/// arrive from the analysis workers.
/// </summary>
public sealed class ReportPlots
{
    private readonly ConcurrentDictionary<string, byte[]> _series = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, byte[]> _runs = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, bool> _failed = new(StringComparer.Ordinal);
    private int _runCount;
    private volatile bool _tooManyRuns;

    /// <param name="plotDir">The plots/ folder the pictures are written into (and the report's links point to).</param>
    public ReportPlots(string plotDir) => PlotDir = plotDir;

    public string PlotDir { get; }

    /// <summary>The series plots are those of the folder (e.g. a report rendered again from finished outputs): read once, here.</summary>
    public static ReportPlots FromFolder(string plotDir)
    {
        var plots = new ReportPlots(plotDir);
        if (!Directory.Exists(plotDir)) return plots;
        foreach (var path in Directory.EnumerateFiles(plotDir, "*.png"))
        {
            var file = Path.GetFileName(path);
            if (file.StartsWith("run-", StringComparison.Ordinal) || file.StartsWith('.') || new FileInfo(path).LinkTarget is not null) continue;
            try { plots.AddSeries(file, File.ReadAllBytes(path)); }
            catch (IOException) { }
        }
        return plots;
    }

    /// <summary>A series plot drawn for this report (file name in plots/).</summary>
    public void AddSeries(string file, byte[] png) => _series[file] = png;

    /// <summary>
    /// A run plot drawn in this pass. Kept while at most <see cref="ReportHtml.MaxEmbeddedRunPlots"/> have arrived; past
    /// that every kept one is let go (the report then embeds no run plot), so a large batch holds no pictures.
    /// </summary>
    public void AddRun(string file, byte[] png)
    {
        if (_tooManyRuns) return;
        if (Interlocked.Increment(ref _runCount) > ReportHtml.MaxEmbeddedRunPlots)
        {
            _tooManyRuns = true;
            _runs.Clear();
            return;
        }
        _runs[file] = png;
        if (_tooManyRuns) _runs.Clear(); // another worker passed the limit meanwhile
    }

    /// <summary>A plot whose file could not be written: neither embedded nor linked, as it is not in plots/.</summary>
    public void Failed(string file)
    {
        _failed[file] = true;
        _series.TryRemove(file, out _);
        _runs.TryRemove(file, out _);
    }

    /// <summary>The series plots in file-name order.</summary>
    internal IReadOnlyList<string> SeriesFiles => _series.Keys.Order(StringComparer.Ordinal).ToList();

    /// <summary>
    /// The bytes to embed: as drawn in this pass, else (a run plot this pass did not redraw) from plots/, if the file
    /// there is a regular file; null when there is no picture.
    /// </summary>
    internal byte[]? Embed(string file)
    {
        if (_series.TryGetValue(file, out var png) || _runs.TryGetValue(file, out png)) return png;
        if (_failed.ContainsKey(file) || !OnDisk(file)) return null;
        try { return File.ReadAllBytes(Path.Combine(PlotDir, file)); }
        catch (IOException) { return null; }
    }

    /// <summary>Whether the picture is in plots/ as a regular file (a link there is not ours: never embedded nor linked).</summary>
    internal bool OnDisk(string file)
    {
        if (_failed.ContainsKey(file)) return false;
        var path = Path.Combine(PlotDir, file);
        return File.Exists(path) && new FileInfo(path).LinkTarget is null;
    }
}
