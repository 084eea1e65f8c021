using TraceKin.Setup;

namespace TraceKin.Ingest;

/// <summary>
/// The [ingest] table of series.toml: format decisions a user may force when a file is ambiguous.
/// Null means "detect".
/// </summary>
public sealed record IngestSettings
{
    /// <summary>"comma", "semicolon", "tab" or "whitespace".</summary>
    public string? Delimiter { get; init; }
    /// <summary>"point" or "comma".</summary>
    public string? DecimalSeparator { get; init; }
    /// <summary>Header of the time column, when the first column is not it.</summary>
    public string? TimeColumn { get; init; }

    public static IngestSettings Default { get; } = new();

    public static IngestSettings FromToml(TomlSection s) => new()
    {
        Delimiter = s.Has("delimiter") ? s.Choice("delimiter", "comma", "comma", "semicolon", "tab", "whitespace") : null,
        DecimalSeparator = s.Has("decimal") ? s.Choice("decimal", "point", "point", "comma") : null,
        TimeColumn = s.String("time_column"),
    };
}
