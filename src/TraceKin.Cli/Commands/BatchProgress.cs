using System.Diagnostics;
using Serilog;

namespace TraceKin.Cli.Commands;

/// <summary>
/// Progress of a batch: each run's result goes to the log file (Debug level); the console gets a count at most every
/// two seconds, so progress costs nothing measurable however many runs there are. Called from worker threads.
/// </summary>
internal sealed class BatchProgress(ILogger log)
{
    private static readonly long Interval = 2 * Stopwatch.Frequency;
    private readonly long _start = Stopwatch.GetTimestamp();
    private long _lastShown;
    private int _done;

    public void Report(string run, string status)
    {
        log.Debug("  {Run}: {Status}", run, status);
        var done = Interlocked.Increment(ref _done);
        var now = Stopwatch.GetTimestamp();
        var last = Interlocked.Read(ref _lastShown);
        if (now - Math.Max(last, _start) < Interval) return;
        if (Interlocked.CompareExchange(ref _lastShown, now, last) != last) return;
        log.Information("  {Done} run(s) done", done);
    }
}
