namespace TraceKin.Cli.Watch;

/// <summary>How `watch` runs. Intervals are measured on the injected <see cref="TimeProvider"/>.</summary>
public sealed record WatchOptions
{
    public required string Inbox { get; init; }
    public required string Out { get; init; }
    /// <summary>How long a file's size and last-write time must stay unchanged before it is taken.</summary>
    public TimeSpan Settle { get; init; } = TimeSpan.FromSeconds(2);
    /// <summary>How often the whole inbox is looked at again, in case a file event was missed.</summary>
    public TimeSpan Rescan { get; init; } = TimeSpan.FromSeconds(30);
    /// <summary>Series analysed at once (one analysis of any one series at a time).</summary>
    public int Jobs { get; init; } = 2;
    /// <summary>Runs of one series analysed at once.</summary>
    public int Workers { get; init; } = Environment.ProcessorCount;
    public bool Plots { get; init; } = true;
    /// <summary>How the CSV tables separate cells and write decimals.</summary>
    public TraceKin.Reports.CsvStyle Csv { get; init; } = TraceKin.Reports.CsvStyle.Standard;
    /// <summary>Process what is in the inbox, then stop.</summary>
    public bool Once { get; init; }
    /// <summary>The series plots to draw (null: <see cref="TraceKin.Reports.ReportSet.SeriesPlots"/>; tests put a failing one here).</summary>
    internal IReadOnlyList<TraceKin.Reports.ISeriesPlot>? SeriesPlots { get; init; }
}
