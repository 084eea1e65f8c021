using System.Diagnostics;
using System.Globalization;
using Serilog;

namespace TraceKin.Cli.Commands;

/// <summary>
/// Progress of a batch: each run's result goes to the log file (Debug level); the console gets a line at most every
/// two seconds — runs done of the planned total, runs per second so far and the time left at that pace — so progress
/// costs nothing measurable however many runs there are. Called from worker threads. Plain lines, so it reads the same
/// whether stderr is a terminal or a file.
/// </summary>
internal sealed class BatchProgress(ILogger log)
{
    private static readonly long Interval = 2 * Stopwatch.Frequency;
    private readonly long _start = Stopwatch.GetTimestamp();
    private long _lastShown;
    private int _done;
    private int _total;

    /// <summary>The number of runs plan.csv plans (0 until known).</summary>
    public void Planned(int total) => Volatile.Write(ref _total, total);

    public void Report(string run, string status)
    {
        log.Debug("  {Run}: {Status}", run, status);
        var done = Interlocked.Increment(ref _done);
        var now = Stopwatch.GetTimestamp();
        var last = Interlocked.Read(ref _lastShown);
        if (now - Math.Max(last, _start) < Interval) return;
        if (Interlocked.CompareExchange(ref _lastShown, now, last) != last) return;
        log.Information("  {Progress}", Line(done, Volatile.Read(ref _total), (double)(now - _start) / Stopwatch.Frequency));
    }

    /// <summary>"120 of 400 run(s) done, 60 runs/s, about 5 s left" (total unknown: "120 run(s) done, 60 runs/s").</summary>
    internal static string Line(int done, int total, double seconds)
    {
        var ci = CultureInfo.InvariantCulture;
        var rate = seconds > 0 ? done / seconds : double.NaN;
        var pace = double.IsFinite(rate) ? string.Format(ci, ", {0} runs/s", rate >= 10 ? rate.ToString("F0", ci) : rate.ToString("0.0", ci)) : "";
        if (total <= 0) return string.Format(ci, "{0} run(s) done{1}", done, pace);
        var left = double.IsFinite(rate) && rate > 0 ? Math.Max(0, total - done) / rate : double.NaN;
        var eta = double.IsFinite(left) ? ", about " + Duration(left) + " left" : "";
        return string.Format(ci, "{0} of {1} run(s) done{2}{3}", done, total, pace, eta);
    }

    private static string Duration(double s) => s switch
    {
        < 60 => string.Format(CultureInfo.InvariantCulture, "{0:F0} s", Math.Ceiling(s)),
        < 3600 => string.Format(CultureInfo.InvariantCulture, "{0:F0} min {1:F0} s", Math.Floor(s / 60), Math.Ceiling(s % 60)),
        _ => string.Format(CultureInfo.InvariantCulture, "{0:F0} h {1:F0} min", Math.Floor(s / 3600), Math.Ceiling(s % 3600 / 60)),
    };
}
