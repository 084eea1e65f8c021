namespace TraceKin.Analysis;

/// <summary>What <see cref="SeriesRunner"/> keeps of each run's per-point data once the run's sink has seen it.</summary>
public enum TraceRetention
{
    /// <summary>Every point of every trace, fitted curve and residual is kept (memory grows with the batch).</summary>
    Full,

    /// <summary>
    /// A display copy: every per-point array is thinned to the same samples, the min/max envelope of the
    /// concentration trace over <see cref="AnalysisOptions.RetainedColumns"/> columns (see <see cref="RunThinning"/>).
    /// Every number computed from the full traces (rates, fits, statistics) is kept as it was; only the arrays shrink,
    /// so memory stays bounded for batches of thousands of runs. Work that needs every point must be done in an
    /// <see cref="IRunSink"/>, which always sees the full run.
    /// </summary>
    Display,

    /// <summary>
    /// No per-point arrays at all once the sink has seen the run (every trace, fitted curve and residual array is
    /// emptied; names, units and every number stay). For runs whose plots are drawn by the sink and whose results are
    /// written from numbers only (the command line): memory then grows with the batch by a few kilobytes per run.
    /// </summary>
    None,
}
