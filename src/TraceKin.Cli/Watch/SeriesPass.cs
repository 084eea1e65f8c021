namespace TraceKin.Cli.Watch;

/// <summary>
/// What one look at a series came to: whether the folder is still a series, whether it was (re)analysed, and when
/// to look again because a file was still settling (null: only when a file event or a rescan says so).
/// </summary>
public sealed record SeriesPass(bool Gone, bool Analysed, DateTimeOffset? RecheckAt, LedgerRecord? Committed)
{
    public static SeriesPass Vanished { get; } = new(true, false, null, null);
}
