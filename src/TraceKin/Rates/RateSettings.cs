using TraceKin.Setup;

namespace TraceKin.Rates;

/// <summary>The [rates] table of series.toml: how each run's initial rate is extracted.</summary>
public sealed record RateSettings
{
    /// <summary>"auto", "line" (straight line over an early window) or "polynomial" (local cubic, or quadratic for few points, at t0).</summary>
    public string Method { get; init; } = "auto";
    /// <summary>The early window ends when this fraction of the tracked species has reacted.</summary>
    public double WindowConversion { get; init; } = 0.2;
    /// <summary>Alternatively, a fixed window end in seconds (overrides the conversion rule when set).</summary>
    public double? WindowEnd { get; init; }

    public static RateSettings Default { get; } = new();

    public static RateSettings FromToml(TomlSection s)
    {
        var d = Default;
        var conv = s.Double("window_conversion", d.WindowConversion);
        if (!(conv > 0 && conv <= 1))
            throw Traces.Fail.Setting(s.File, s.KeyName("window_conversion"), conv.ToString(System.Globalization.CultureInfo.InvariantCulture), "a fraction between 0 and 1, e.g. 0.2");
        return d with
        {
            Method = s.Choice("method", d.Method, "auto", "line", "polynomial"),
            WindowConversion = conv,
            WindowEnd = s.Positive("window_end"),
        };
    }
}
