namespace TraceKin.Analysis;

/// <summary>Called once per run as soon as it is analysed (from worker threads), e.g. to draw its plot.</summary>
public interface IRunSink
{
    void Accept(RunResult run);
}

/// <summary>How a series is analysed. Results never depend on <see cref="Workers"/>.</summary>
public sealed record AnalysisOptions
{
    public int Workers { get; init; } = Environment.ProcessorCount;
    public IRunSink? RunSink { get; init; }
    /// <summary>Called after each run (analysed or rejected) with the run id and a one-line status.</summary>
    public Action<string, string>? Progress { get; init; }
}
