using System.Globalization;
using Serilog;
using Serilog.Core;
using Serilog.Events;
using TraceKin.Traces;

namespace TraceKin.Cli;

/// <summary>
/// Serilog set-up: messages to stderr (stdout stays clean for data) and, when given, to a log file. The file also
/// gets the per-run detail (Debug level), through a buffer flushed every second and when the logger is disposed, so
/// a batch of a thousand runs does not pay a write to disk per run. Every text value put into a message (run ids,
/// file names, cells) is escaped by <see cref="EscapeInputText"/>, and every number is rendered in the invariant culture
/// (the machine's culture never changes a log line); so a control character from an input file never
/// reaches the terminal or the log as itself.
/// </summary>
public static class Logging
{
    public static ILogger Create(string? logFile, bool verbose = false)
    {
        var config = new LoggerConfiguration()
            .Enrich.With<EscapeInputText>()
            .MinimumLevel.Is(logFile is not null || verbose ? LogEventLevel.Debug : LogEventLevel.Information)
            .WriteTo.Console(restrictedToMinimumLevel: verbose ? LogEventLevel.Debug : LogEventLevel.Information,
                standardErrorFromLevel: LogEventLevel.Verbose, outputTemplate: "{Message:lj}{NewLine}{Exception}", formatProvider: CultureInfo.InvariantCulture);
        if (logFile is not null)
            config = config.WriteTo.File(logFile, outputTemplate: "{Timestamp:yyyy-MM-dd HH:mm:ss.fff zzz} [{Level:u3}] {Message:lj}{NewLine}{Exception}",
                buffered: true, flushToDiskInterval: TimeSpan.FromSeconds(1), formatProvider: CultureInfo.InvariantCulture);
        return config.CreateLogger();
    }
}

/// <summary>Replaces every text property of a log event by its <see cref="PrintableText.Escape"/> form (message templates are ours and stay as written).</summary>
public sealed class EscapeInputText : ILogEventEnricher
{
    public void Enrich(LogEvent logEvent, ILogEventPropertyFactory propertyFactory)
    {
        List<LogEventProperty>? changed = null;
        foreach (var (name, value) in logEvent.Properties)
            if (value is ScalarValue { Value: string text } && PrintableText.Escape(text) is var safe && !ReferenceEquals(safe, text))
                (changed ??= []).Add(new LogEventProperty(name, new ScalarValue(safe)));
        if (changed is null) return;
        foreach (var p in changed) logEvent.AddOrUpdateProperty(p);
    }
}
