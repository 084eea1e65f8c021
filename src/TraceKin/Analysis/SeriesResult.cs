using TraceKin.Rates;
using TraceKin.Series;
using TraceKin.Setup;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Analysis;

/// <summary>One analysed run: where it came from, its concentration trace, its rates and warnings.</summary>
public sealed record RunResult(
    PlanRow Plan,
    string InputSha256,
    RunExport Export,
    ConvertedRun Converted,
    RunRates Rates,
    IReadOnlyList<Warning> Warnings)
{
    public string Id => Plan.Run;
    public string File => Plan.File;

    /// <summary>
    /// True when the per-point arrays are a display copy (<see cref="TraceRetention.Display"/>: fine for drawing,
    /// not for computing) or empty (<see cref="TraceRetention.None"/>). Every reported number was computed before.
    /// </summary>
    public bool TracesThinned { get; init; }
}

/// <summary>
/// Everything `analyse` learned about one series folder. <see cref="Config"/> and <see cref="Plan"/> are null when
/// those files were rejected (the problem is then in <see cref="Rejected"/>).
/// </summary>
public sealed record SeriesResult(
    string Folder,
    SeriesConfig? Config,
    Plan? Plan,
    IReadOnlyList<RunResult> Runs,
    IReadOnlyList<Problem> Rejected,
    SeriesFindings? Findings,
    IReadOnlyList<Warning> Warnings,
    string ToolVersion)
{
    /// <summary>Runs planned with the same conditions and the spread of their rates (sample runs only; blanks are not grouped).</summary>
    public IReadOnlyList<ReplicateGroup> Replicates { get; init; } = [];

    /// <summary>
    /// The SHA-256 (lower-case hex) of series.toml and plan.csv, keyed by file name, taken from the very bytes the
    /// analysis parsed (so the reports never read or hash them again); for a file that was not read, why:
    /// <see cref="SetupMissing"/>, <see cref="SetupUnreadable"/> or <see cref="SetupNotRead"/>.
    /// </summary>
    public IReadOnlyDictionary<string, string> SetupHashes { get; init; } = new Dictionary<string, string>();

    public const string SetupMissing = "missing";
    public const string SetupUnreadable = "unreadable";
    /// <summary>Refused before it was opened (a link out of the series folder, a pipe, a folder, too large).</summary>
    public const string SetupNotRead = "not read";

    public string Name => Config is { Name.Length: > 0 } c ? c.Name : Path.GetFileName(Path.TrimEndingDirectorySeparator(Folder));

    /// <summary>Wall time of the per-run stages (all workers) and of the series stage; for the log, never in numeric outputs.</summary>
    public TimeSpan RunsTime { get; init; }
    public TimeSpan SeriesStageTime { get; init; }
}
