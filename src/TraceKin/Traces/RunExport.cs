namespace TraceKin.Traces;

/// <summary>
/// One instrument export, read into the common trace model.
/// <see cref="Channels"/> are the signal traces (absorbance at a wavelength, gas volume, pressure, conductivity);
/// <see cref="Auxiliary"/> are non-signal columns kept alongside (temperature, pH).
/// <see cref="Metadata"/> holds the preamble's key/value lines as written (keys trimmed, case kept).
/// <see cref="Detected"/> lists each format decision in order (e.g. "delimiter" → "semicolon"), for `inspect` and the report.
/// </summary>
public sealed record RunExport(
    string File,
    IReadOnlyList<Trace> Channels,
    IReadOnlyList<Trace> Auxiliary,
    IReadOnlyDictionary<string, string> Metadata,
    IReadOnlyList<KeyValuePair<string, string>> Detected,
    IReadOnlyList<Warning> Warnings)
{
    /// <summary>1-based numbers of the first and last line holding data (0 when not known), to locate a problem with the whole trace.</summary>
    public (int First, int Last) DataLines { get; init; }

    /// <summary>The channel of that name, or null when the export has none (any case; a well with or without leading zeros).</summary>
    public Trace? FindChannel(string name)
    {
        foreach (var c in Channels)
            if (string.Equals(c.Name, name, StringComparison.OrdinalIgnoreCase)) return c;
        if (WellName.Normalise(name) is { } well)
            foreach (var c in Channels)
                if (WellName.Normalise(c.Name) == well) return c;
        return null;
    }

    /// <summary>The channel of that name (case-insensitive), or the only channel when name is null.</summary>
    public Trace Channel(string? name) => Channel(name, "signal.channel");

    /// <summary>The channel of that name (any case), else a problem at <paramref name="key"/> listing the channels the export has.</summary>
    public Trace Channel(string? name, string key)
    {
        if (name is null)
        {
            if (Channels.Count == 1) return Channels[0];
            throw Fail.Setting(File, "signal.channel", $"{Channels.Count} signal columns ({string.Join(", ", Channels.Select(c => c.Name))})",
                "one channel named in series.toml", "set signal.channel to one of the column names");
        }
        foreach (var c in Channels)
            if (string.Equals(c.Name, name, StringComparison.OrdinalIgnoreCase)) return c;
        // a well named with or without leading zeros ("A1" and "A01")
        if (WellName.Normalise(name) is { } well)
            foreach (var c in Channels)
                if (WellName.Normalise(c.Name) == well) return c;
        throw Fail.Setting(File, key, Fail.Quote(name), $"a channel of this export, one of: {string.Join(", ", Channels.Select(c => c.Name))}",
            "check the column header in the export");
    }
}
