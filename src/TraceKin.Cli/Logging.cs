using Serilog;
using Serilog.Events;

namespace TraceKin.Cli;

/// <summary>Serilog set-up: everything to stderr (stdout stays clean for data) and, when given, to a log file.</summary>
public static class Logging
{
    public static ILogger Create(string? logFile, bool verbose = false)
    {
        var config = new LoggerConfiguration()
            .MinimumLevel.Is(verbose ? LogEventLevel.Debug : LogEventLevel.Information)
            .WriteTo.Console(standardErrorFromLevel: LogEventLevel.Verbose, outputTemplate: "{Message:lj}{NewLine}{Exception}");
        if (logFile is not null)
            config = config.WriteTo.File(logFile, outputTemplate: "{Timestamp:yyyy-MM-dd HH:mm:ss.fff zzz} [{Level:u3}] {Message:lj}{NewLine}{Exception}");
        return config.CreateLogger();
    }
}
