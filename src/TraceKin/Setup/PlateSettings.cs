using TraceKin.Traces;

namespace TraceKin.Setup;

/// <summary>
/// series.toml [plate]: the series' plan is built in memory from plate-map grids (<see cref="PlateMap"/>) instead of
/// being read from plan.csv. <c>maps</c>: the map files, read in order (default <c>["plate-map.csv"]</c>);
/// <c>export</c>: the plate export every mapped well reads (a "file" grid may name another per well);
/// <c>run_prefix</c>: text put before each well's name to make its run id (default none).
/// </summary>
public sealed record PlateSettings(IReadOnlyList<string> Maps, string? Export, string RunPrefix)
{
    public const string DefaultMap = "plate-map.csv";

    public static PlateSettings FromToml(TomlSection s)
    {
        var maps = s.Strings("maps") ?? [DefaultMap];
        if (maps.Length == 0) throw Fail.Setting(s.File, s.KeyName("maps"), "an empty list", "one or more plate-map files, e.g. [\"plate-map.csv\"]");
        for (var i = 0; i < maps.Length; i++)
            if (maps[i].Trim().Length == 0) throw Fail.Setting(s.File, $"{s.KeyName("maps")}[{i}]", "an empty file name", "a plate-map file in the series folder");
        var dup = maps.GroupBy(m => m, StringComparer.Ordinal).FirstOrDefault(g => g.Count() > 1);
        if (dup is not null) throw Fail.Setting(s.File, s.KeyName("maps"), $"{Fail.Quote(dup.Key)} twice", "each map file once");
        var export = s.String("export");
        if (export is { } e && e.Trim().Length == 0) throw Fail.Setting(s.File, s.KeyName("export"), "an empty file name", "the plate export's file name in the series folder");
        return new PlateSettings(maps, export, s.String("run_prefix", ""));
    }

    /// <summary>The plan's name in messages: "plate map (plate-map.csv)".</summary>
    public string Label() => $"plate map ({string.Join(", ", Maps)})";
}
