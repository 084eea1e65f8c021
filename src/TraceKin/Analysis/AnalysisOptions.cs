using TraceKin.Setup;

namespace TraceKin.Analysis;

/// <summary>Called once per run as soon as it is analysed (from worker threads), e.g. to draw its plot.</summary>
public interface IRunSink
{
    /// <summary>Called once with the series' plan before any run is accepted (e.g. to name the per-run files).</summary>
    void Begin(Plan plan) { }

    void Accept(RunResult run);

    /// <summary>Called instead of <see cref="Accept"/> for a plan row whose run was rejected (so a sink that keeps
    /// plan order knows the row is done).</summary>
    void Rejected(PlanRow row) { }
}

/// <summary>How a series is analysed. Results never depend on <see cref="Workers"/>.</summary>
public sealed record AnalysisOptions
{
    public int Workers { get; init; } = Environment.ProcessorCount;
    /// <summary>Sees each run with all its points, on a worker thread, before the run is thinned (see <see cref="Retention"/>).</summary>
    public IRunSink? RunSink { get; init; }
    /// <summary>Called after each run (analysed or rejected) with the run id and a one-line status, from worker threads.</summary>
    public Action<string, string>? Progress { get; init; }

    /// <summary>Called once plan.csv is read, with the number of runs it plans (for progress with a total).</summary>
    public Action<int>? Planned { get; init; }
    /// <summary>What the result keeps of each run's traces; <see cref="TraceRetention.Display"/> bounds memory for big batches.</summary>
    public TraceRetention Retention { get; init; } = TraceRetention.Full;
    /// <summary>
    /// With <see cref="TraceRetention.None"/> and a run sink that writes every fit as the runs finish (the per-run
    /// tables), a series planned with more runs than this keeps of each run, once the sink has seen it, only the chosen
    /// law's fit and any that did not converge (without their runs tests) and only the headline initial-rate estimate,
    /// so memory stays flat however many runs there are. Default: keep all.
    /// </summary>
    public int KeepEveryFitUpTo { get; init; } = int.MaxValue;
    /// <summary>
    /// One blocking, compacting collection of the managed heap once the per-run stages are done, before the series
    /// stage, in aggressive mode (the freed memory is given back to the system at once): what the runs keep then lies
    /// packed rather than among the garbage of their full versions, which lowers
    /// the peak memory of a large batch (bench/README.md, "Batch speed"). For the command line; off by default.
    /// </summary>
    public bool CompactAfterRuns { get; init; }
    /// <summary>Pixel columns of the display copy kept under <see cref="TraceRetention.Display"/> (at most 4 points per column).</summary>
    public int RetainedColumns { get; init; } = 200;
    /// <summary>
    /// Read files that plan.csv or series.toml name even when they resolve (after symbolic links) outside the series
    /// folder. Off by default: every input must lie inside the folder (see <see cref="Setup.SeriesInputs"/>).
    /// </summary>
    public bool AllowOutsideFiles { get; init; }
    /// <summary>Results kept from the last analysis of this series: a run whose inputs did not change is not analysed again (see <see cref="RunStore"/>).</summary>
    public RunStore? Reuse { get; init; }
    /// <summary>Called each time an export is parsed, with its file name (once per file, however many runs read it).</summary>
    public Action<string>? ExportParsed { get; init; }
}
