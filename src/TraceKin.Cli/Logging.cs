using Serilog;
using Serilog.Events;

namespace TraceKin.Cli;

/// <summary>
/// Serilog set-up: messages to stderr (stdout stays clean for data) and, when given, to a log file. The file also
/// gets the per-run detail (Debug level), through a buffer flushed every second and when the logger is disposed, so
/// a batch of a thousand runs does not pay a write to disk per run.
/// </summary>
public static class Logging
{
    public static ILogger Create(string? logFile, bool verbose = false)
    {
        var config = new LoggerConfiguration()
            .MinimumLevel.Is(logFile is not null || verbose ? LogEventLevel.Debug : LogEventLevel.Information)
            .WriteTo.Console(restrictedToMinimumLevel: verbose ? LogEventLevel.Debug : LogEventLevel.Information,
                standardErrorFromLevel: LogEventLevel.Verbose, outputTemplate: "{Message:lj}{NewLine}{Exception}");
        if (logFile is not null)
            config = config.WriteTo.File(logFile, outputTemplate: "{Timestamp:yyyy-MM-dd HH:mm:ss.fff zzz} [{Level:u3}] {Message:lj}{NewLine}{Exception}",
                buffered: true, flushToDiskInterval: TimeSpan.FromSeconds(1));
        return config.CreateLogger();
    }
}
