namespace TraceKin.Cli.Watch;

/// <summary>
/// What one look at a series came to: whether the folder is still a series, whether it was (re)analysed, and when
/// to look again because a file was still settling (null: only when a file event or a rescan says so).
/// </summary>
public sealed record SeriesPass(bool Gone, bool Analysed, DateTimeOffset? RecheckAt, LedgerRecord? Committed)
{
    public static SeriesPass Vanished { get; } = new(true, false, null, null);

    /// <summary>The pass stopped early to wait for files that are still settling (it looks again at <see cref="RecheckAt"/>).</summary>
    public bool Waiting { get; init; }

    /// <summary>The series was analysed but its outputs could not all be written: nothing was committed.</summary>
    public bool Failed { get; init; }

    /// <summary>Some planned export was still being written (changing, not merely unreadable) and is looked at again.</summary>
    public bool Settling { get; init; }

    /// <summary>Inputs of the series' current state that were rejected or could not be read.</summary>
    public int Rejected { get; init; }
}
