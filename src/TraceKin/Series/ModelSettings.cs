using TraceKin.Setup;

namespace TraceKin.Series;

/// <summary>The [model] table of series.toml: which rate-law model(s) the series is tested against.</summary>
public sealed record ModelSettings
{
    /// <summary>Species whose orders are fitted; null = every species whose starting concentration varies.</summary>
    public string[]? Species { get; init; }

    public static ModelSettings Default { get; } = new();

    public static ModelSettings FromToml(TomlSection s) => new()
    {
        Species = s.Strings("species"),
    };
}
