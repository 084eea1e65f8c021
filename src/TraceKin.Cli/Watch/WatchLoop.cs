using System.Collections.Concurrent;
using Serilog;

namespace TraceKin.Cli.Watch;

/// <summary>
/// The watch loop: finds the series folders of the inbox, hears file events (and rescans the whole inbox at start,
/// periodically, and after the event queue overflowed), and runs passes of due series — several series at once,
/// never two passes of the same series. Stops, after the passes in flight, when cancelled; with
/// <see cref="WatchOptions.Once"/>, when no series has a file still being written (an unreadable file is rejected,
/// not waited for; a pass that failed is not tried again then: the failure is counted in <see cref="FailedSeries"/>).
/// </summary>
public sealed class WatchLoop(WatchOptions options, Ledger ledger, TimeProvider time, ILogger log, Action<string> status)
{
    private sealed class Entry(SeriesWatch watch)
    {
        public SeriesWatch Watch { get; } = watch;
        public bool Busy { get; set; }
        public DateTimeOffset? Due { get; set; }
    }

    private readonly Dictionary<string, Entry> _series = new(StringComparer.Ordinal);
    private readonly ConcurrentQueue<string> _changed = new();
    private readonly ConcurrentQueue<(string Name, SeriesPass? Pass)> _done = new();
    private readonly FileStability _stability = new(time, options.Settle);
    private TaskCompletionSource _wake = new(TaskCreationOptions.RunContinuationsAsynchronously);
    private volatile bool _rescanWanted = true;

    private static readonly TimeSpan RetryFloor = TimeSpan.FromSeconds(1);
    private readonly SortedSet<string> _failed = new(StringComparer.Ordinal);
    private readonly Dictionary<string, int> _rejected = new(StringComparer.Ordinal);

    /// <summary>Passes that analysed a series (for tests and the closing log line).</summary>
    public int Analyses { get; private set; }

    /// <summary>Series whose last pass failed (an error, or outputs that could not be written); read after <see cref="RunAsync"/>.</summary>
    public IReadOnlyCollection<string> FailedSeries => _failed;

    /// <summary>Inputs rejected or unreadable in the series' current states, over all series; read after <see cref="RunAsync"/>.</summary>
    public int RejectedInputs => _rejected.Values.Sum();

    public async Task RunAsync(CancellationToken cancel)
    {
        using var events = options.Once ? null : StartEvents();
        var running = new Dictionary<string, Task>(StringComparer.Ordinal);
        var nextRescan = time.GetUtcNow();
        while (true)
        {
            var wake = Volatile.Read(ref _wake).Task;
            if (cancel.IsCancellationRequested) break;
            var now = time.GetUtcNow();

            while (_done.TryDequeue(out var d))
            {
                running.Remove(d.Name);
                var entry = _series[d.Name];
                entry.Busy = false;
                if (d.Pass is null || d.Pass.Failed)
                {
                    // The pass failed: try again later (with --once, report it instead of trying for ever).
                    _failed.Add(d.Name);
                    // Not sooner than a second, so a lasting failure with a zero settle interval does not spin.
                    if (!options.Once) entry.Due = Earliest(entry.Due, now + (options.Settle > RetryFloor ? options.Settle : RetryFloor));
                }
                else if (d.Pass.Gone)
                {
                    _series.Remove(d.Name);
                    _failed.Remove(d.Name);
                    _rejected.Remove(d.Name);
                }
                else
                {
                    if (d.Pass.Analysed) Analyses++;
                    _failed.Remove(d.Name);
                    if (!d.Pass.Waiting) _rejected[d.Name] = d.Pass.Rejected;
                    // With --once a series is looked at again only while some file is still being written: a file that
                    // cannot be read is rejected, not waited for (it would keep a --once run going for ever).
                    if (d.Pass.RecheckAt is { } at && (!options.Once || d.Pass.Waiting || d.Pass.Settling)) entry.Due = Earliest(entry.Due, at);
                }
            }

            if (_rescanWanted || (!options.Once && now >= nextRescan))
            {
                _rescanWanted = false;
                Rescan(now);
                nextRescan = now + options.Rescan;
            }
            while (_changed.TryDequeue(out var path))
            {
                if (SeriesOf(path) is not { } name) continue;
                if (_series.TryGetValue(name, out var entry)) entry.Due = Earliest(entry.Due, now);
                else _rescanWanted = true; // a new folder, or plan.csv / series.toml just arrived
            }

            foreach (var entry in _series.Values.Where(e => !e.Busy && e.Due <= now).OrderBy(e => e.Due).ToList())
            {
                if (running.Count >= Math.Max(1, options.Jobs)) break;
                entry.Busy = true;
                entry.Due = null;
                running[entry.Watch.Name] = Task.Run(() => RunPass(entry.Watch), CancellationToken.None);
            }

            if (options.Once && running.Count == 0 && !_rescanWanted && _series.Values.All(e => e.Due is null)) break;

            var next = _series.Values.Where(e => !e.Busy && e.Due is not null).Select(e => e.Due!.Value).DefaultIfEmpty(DateTimeOffset.MaxValue).Min();
            if (!options.Once && nextRescan < next) next = nextRescan;
            if (_rescanWanted || _changed.IsEmpty == false) next = now;
            var delay = next == DateTimeOffset.MaxValue ? Timeout.InfiniteTimeSpan : next - now;
            if (delay != Timeout.InfiniteTimeSpan && delay < TimeSpan.Zero) delay = TimeSpan.Zero;
            if (delay == TimeSpan.Zero && _done.IsEmpty && running.Count >= Math.Max(1, options.Jobs))
                delay = Timeout.InfiniteTimeSpan; // everything due waits for a free slot: a finishing pass wakes us
            try
            {
                await Task.WhenAny(wake, Task.Delay(delay, time, cancel)).ConfigureAwait(false);
            }
            catch (OperationCanceledException) { }
        }
        // Finish the passes in flight: a series is never left half-done by a stop request.
        await Task.WhenAll(running.Values).ConfigureAwait(false);
    }

    private void RunPass(SeriesWatch watch)
    {
        SeriesPass? pass = null;
        try
        {
            pass = watch.Pass();
        }
        catch (Exception ex)
        {
            // A defect or an I/O failure in one series must not stop the others: log it, try that series again later.
            log.Error(ex, "{Series}: the pass failed and will be tried again: {Message}", watch.Name, ex.Message);
        }
        finally
        {
            _done.Enqueue((watch.Name, pass));
            Wake();
        }
    }

    private void Wake() => Interlocked.Exchange(ref _wake, new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously)).TrySetResult();

    private void Rescan(DateTimeOffset now)
    {
        IEnumerable<string> folders;
        try
        {
            folders = Directory.EnumerateDirectories(options.Inbox).Where(d => !Path.GetFileName(d).StartsWith('.')).ToList();
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            log.Error("cannot read the inbox {Inbox}: {Message}", options.Inbox, ex.Message);
            return;
        }
        foreach (var folder in folders)
        {
            var name = Path.GetFileName(folder);
            if (!_series.TryGetValue(name, out var entry))
            {
                if (!SeriesWatch.IsSeriesFolder(folder)) continue;
                entry = new Entry(new SeriesWatch(folder, options, _stability, ledger, time, log, status));
                _series[name] = entry;
                log.Information("watching series {Series}", name);
            }
            entry.Due = Earliest(entry.Due, now);
        }
    }

    private FileSystemWatcher? StartEvents()
    {
        try
        {
            var w = new FileSystemWatcher(options.Inbox)
            {
                IncludeSubdirectories = true,
                InternalBufferSize = 64 * 1024,
                NotifyFilter = NotifyFilters.FileName | NotifyFilters.DirectoryName | NotifyFilters.LastWrite | NotifyFilters.Size | NotifyFilters.CreationTime,
            };
            FileSystemEventHandler onChange = (_, e) => { _changed.Enqueue(e.FullPath); Wake(); };
            w.Created += onChange;
            w.Changed += onChange;
            w.Deleted += onChange;
            // A write-then-rename arrives only as Renamed: both names matter.
            w.Renamed += (_, e) => { _changed.Enqueue(e.OldFullPath); _changed.Enqueue(e.FullPath); Wake(); };
            w.Error += (_, e) =>
            {
                log.Warning("file events were lost ({Message}); rescanning the inbox", e.GetException().Message);
                _rescanWanted = true;
                Wake();
            };
            w.EnableRaisingEvents = true;
            return w;
        }
        catch (Exception ex) when (ex is IOException or ArgumentException or PlatformNotSupportedException)
        {
            log.Warning("file events are not available ({Message}); relying on rescans every {Seconds} s", ex.Message, options.Rescan.TotalSeconds);
            return null;
        }
    }

    /// <summary>The series folder name a changed path belongs to, or null when it is outside any.</summary>
    private string? SeriesOf(string path)
    {
        var rel = Path.GetRelativePath(options.Inbox, path);
        if (rel == "." || rel.StartsWith("..", StringComparison.Ordinal) || Path.IsPathRooted(rel)) return null;
        var first = rel.Split(Path.DirectorySeparatorChar, Path.AltDirectorySeparatorChar)[0];
        return first.StartsWith('.') ? null : first;
    }

    private static DateTimeOffset Earliest(DateTimeOffset? a, DateTimeOffset b) => a is { } x && x < b ? x : b;
}
