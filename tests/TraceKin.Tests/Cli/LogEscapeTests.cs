using Serilog;
using Serilog.Core;
using Serilog.Events;
using TraceKin.Cli;
using TraceKin.Cli.Commands;
using TraceKin.Tests.Analysis;

namespace TraceKin.Tests.Cli;

// Text from inputs (run ids, file names) reaches the console and tracekin.log only with its control characters
// escaped, so an export or a plan cannot move the cursor, clear the screen, ring the bell or forge a log line.
public sealed class LogEscapeTests : IDisposable
{
    private const string Esc = "\u001B";
    private readonly ProbeSeries _s = new();

    public void Dispose() => _s.Dispose();

    private sealed class Capture : ILogEventSink
    {
        public List<string> Lines { get; } = [];
        public void Emit(LogEvent e) => Lines.Add(e.RenderMessage());
    }

    [Fact]
    public void Every_text_value_in_a_message_is_escaped_and_the_template_is_kept()
    {
        var sink = new Capture();
        using (var log = new LoggerConfiguration().Enrich.With<EscapeInputText>().WriteTo.Sink(sink).CreateLogger())
            log.Information("run {Run} in {File}: {Count} point(s)", $"R1{Esc}[2J\u0007", "r1\n[ERR] forged.csv", 3);
        // RenderMessage quotes text values (the sinks' "lj" format does not); the escapes are the same either way
        Assert.Equal(@"run ""R1\x1B[2J\x07"" in ""r1\x0A[ERR] forged.csv"": 3 point(s)", Assert.Single(sink.Lines));
    }

    [Fact]
    public void Run_ids_with_control_characters_are_escaped_in_tracekin_log_and_the_runs_are_analysed()
    {
        // A run id carrying a terminal colour sequence, a bell, a NUL and a C1 control (CSI), and a file name with ESC.
        _s.PlanRows(($"R005{Esc}[31m\u0007\u0000\u009B", "r002.csv"), ("R006", $"gone{Esc}[2J.csv"));
        var outDir = Path.Combine(_s.Root, "out");
        var code = AnalyseCommand.Run(new DirectoryInfo(_s.Folder), new DirectoryInfo(outDir), plots: false, workers: 1);
        Assert.Equal(2, code); // one run rejected (its file is missing), the others analysed
        var log = File.ReadAllText(Path.Combine(outDir, "tracekin.log"));
        Assert.DoesNotContain(Esc, log, StringComparison.Ordinal);
        Assert.DoesNotContain("\u0007", log, StringComparison.Ordinal);
        Assert.DoesNotContain("\u0000", log, StringComparison.Ordinal);
        Assert.DoesNotContain("\u009B", log, StringComparison.Ordinal);
        Assert.Contains(@"R005\x1B[31m\x07\x00\x9B: ", log, StringComparison.Ordinal); // the run's progress line
        Assert.Contains(@"gone\x1B[2J.csv", log, StringComparison.Ordinal);         // the rejected file's message
        Assert.Contains($"{ProbeSeries.GoodRuns + 1} run(s) analysed, 1 rejected", log, StringComparison.Ordinal);
    }
}
