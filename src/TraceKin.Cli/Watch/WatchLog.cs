using Serilog;
using Serilog.Events;

namespace TraceKin.Cli.Watch;

/// <summary>
/// The watcher's log: everything to a file in the output folder that starts afresh each day
/// (tracekin-watch-YYYYMMDD.log); only errors also to stderr, which otherwise carries one status line per file.
/// </summary>
public static class WatchLog
{
    public const string FilePattern = "tracekin-watch-.log";

    /// <summary>Today's log file name (the file sink puts the date before the extension).</summary>
    public static string TodayFile() => $"tracekin-watch-{DateTime.Now:yyyyMMdd}.log";

    public static Serilog.Core.Logger Create(string outDir, bool verbose = false) =>
        new LoggerConfiguration()
            .Enrich.With<EscapeInputText>()
            .MinimumLevel.Is(verbose ? LogEventLevel.Debug : LogEventLevel.Information)
            .WriteTo.Console(restrictedToMinimumLevel: LogEventLevel.Error, standardErrorFromLevel: LogEventLevel.Verbose,
                outputTemplate: "tracekin watch: {Message:lj}{NewLine}")
            .WriteTo.File(Path.Combine(outDir, FilePattern), rollingInterval: RollingInterval.Day,
                outputTemplate: "{Timestamp:yyyy-MM-dd HH:mm:ss.fff zzz} [{Level:u3}] {Message:lj}{NewLine}{Exception}")
            .CreateLogger();
}
