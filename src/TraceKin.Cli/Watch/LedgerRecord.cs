using System.Text.Json.Serialization;

namespace TraceKin.Cli.Watch;

/// <summary>
/// One line of the watch ledger: one completed analysis of one series — which input content (by SHA-256) produced
/// which outputs. Written only after every output is on disk. Field names are documented in docs/formats.md.
/// </summary>
public sealed record LedgerRecord
{
    [JsonPropertyName("v")] public int Version { get; init; } = 1;
    [JsonPropertyName("seq")] public long Sequence { get; init; }
    [JsonPropertyName("series")] public required string Series { get; init; }
    [JsonPropertyName("at")] public DateTimeOffset At { get; init; }
    /// <summary>"ok" when plan.csv and series.toml were read; "rejected" when either was bad.</summary>
    [JsonPropertyName("setup")] public required string Setup { get; init; }
    [JsonPropertyName("inputs")] public required IReadOnlyList<LedgerInput> Inputs { get; init; }
    /// <summary>Exports named in plan.csv that were missing or still being written.</summary>
    [JsonPropertyName("pending")] public required IReadOnlyList<string> Pending { get; init; }
    [JsonPropertyName("outputs")] public required IReadOnlyList<LedgerOutput> Outputs { get; init; }

    public const string SetupOk = "ok";
    public const string SetupRejected = "rejected";

    public LedgerInput? Input(string file) => Inputs.FirstOrDefault(i => i.File == file);
}

/// <summary>
/// One input file of a ledger record. <see cref="New"/> is true when this content version differs from the one in the
/// series' previous record (or the file is new), so each (file, sha256) version is marked new exactly once.
/// </summary>
public sealed record LedgerInput(
    [property: JsonPropertyName("file")] string File,
    [property: JsonPropertyName("sha256")] string Sha256,
    [property: JsonPropertyName("status")] string Status,
    [property: JsonPropertyName("new")] bool New,
    [property: JsonPropertyName("message")][property: JsonIgnore(Condition = JsonIgnoreCondition.WhenWritingNull)] string? Message = null)
{
    public const string Setup = "setup";
    public const string Analysed = "analysed";
    public const string Rejected = "rejected";
}

/// <summary>One output file (path relative to the series' output folder) and the SHA-256 of what was written.</summary>
public sealed record LedgerOutput(
    [property: JsonPropertyName("file")] string File,
    [property: JsonPropertyName("sha256")] string Sha256);
