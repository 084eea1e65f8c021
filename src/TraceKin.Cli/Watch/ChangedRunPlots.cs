using Serilog;
using TraceKin.Analysis;
using TraceKin.Reports;

namespace TraceKin.Cli.Watch;

/// <summary>
/// Draws a run's plot only when something it depends on changed since the series' last committed analysis (the
/// export's content, plan.csv or series.toml) or the picture is missing, so re-analysing a series after one new
/// export redraws one plot, not all. A plot that cannot be written is logged and counted, never thrown.
/// </summary>
public sealed class ChangedRunPlots(string outDir, LedgerRecord? committed, IReadOnlyDictionary<string, string> inputs, ILogger log) : IRunSink
{
    private readonly RunPlot _plot = new(outDir);
    private int _failures;

    public int Failures => Volatile.Read(ref _failures);

    public void Accept(RunResult run)
    {
        var png = Path.Combine(outDir, "plots", RunPlot.FileNameFor(run.Id));
        if (Unchanged(run) && File.Exists(png)) return;
        try
        {
            _plot.Accept(run);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            Interlocked.Increment(ref _failures);
            log.Error("could not write the plot of run {Run}: {Message}", run.Id, ex.Message);
        }
    }

    private bool Unchanged(RunResult run)
    {
        if (committed is not { Setup: LedgerRecord.SetupOk }) return false;
        foreach (var setup in new[] { SeriesRunner.PlanFile, SeriesRunner.ConfigFile })
            if (committed.Input(setup)?.Sha256 != inputs.GetValueOrDefault(setup)) return false;
        return committed.Input(run.File) is { Status: LedgerInput.Analysed } before && before.Sha256 == run.InputSha256;
    }
}
