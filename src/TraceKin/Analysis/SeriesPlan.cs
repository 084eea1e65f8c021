using TraceKin.Ingest;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Analysis;

/// <summary>
/// Where a series' runs are described: plan.csv, or — when series.toml has a [plate] table — plate-map grids in the
/// series folder, turned into the same plan in memory (<see cref="PlateMap.ToPlan"/>, the code `tracekin plate-plan`
/// writes plan.csv with). Never both: a folder with a [plate] table and a plan.csv is refused at the table, so what
/// is analysed never depends on which of two descriptions wins.
/// </summary>
public static class SeriesPlan
{
    /// <summary>
    /// The plan and the problems met on the way: with a plan, those of wells left out (the others are analysed);
    /// without one, why the series cannot be planned. <paramref name="config"/> null: series.toml was rejected, and
    /// plan.csv is read if it is there (so its own problems are reported too).
    /// </summary>
    /// <param name="hashes">When given, receives the SHA-256 of plan.csv (or why there is none) as it is read.</param>
    public static (Plan? Plan, IReadOnlyList<Problem> Problems) Read(string folder, SeriesConfig? config, AnalysisOptions options,
        Dictionary<string, string>? hashes = null)
    {
        if (config?.Plate is { } plate) return FromMaps(folder, config, plate, options, hashes);
        var planExists = SeriesInputs.Check(folder, SeriesRunner.PlanFile, true, long.MaxValue, out _) is not { Missing: true };
        // series.toml was rejected: a folder planned by maps only is not also told that plan.csv is missing
        if (config is null && !planExists && File.Exists(Path.Combine(folder, PlateSettings.DefaultMap))) return (null, []);
        try { return (Plan.FromText(SeriesRunner.ReadSetup(folder, SeriesRunner.PlanFile, options, hashes), SeriesRunner.PlanFile), []); }
        catch (InputException ex) { return (null, [PointAtMap(ex.Problem)]); }
        catch (IOException ex) { return (null, [PointAtMap(SeriesRunner.Missing(SeriesRunner.PlanFile, ex))]); }

        // no plan.csv, but a plate map by its usual name: say how to use it
        Problem PointAtMap(Problem p) => planExists || !File.Exists(Path.Combine(folder, PlateSettings.DefaultMap)) ? p : p with
        {
            Hint = $"{PlateSettings.DefaultMap} is here: add a [plate] table to series.toml (export = \"the plate export\") to build the plan from it, or write plan.csv from it with `tracekin plate-plan`",
        };
    }

    /// <summary>True when the series is planned by plate maps: series.toml text with a [plate] table (also when the rest of it is invalid).</summary>
    public static bool DeclaresPlate(string configText)
    {
        try
        {
            return Tomlyn.TomlSerializer.Deserialize<Tomlyn.Model.TomlTable>(configText) is { } t && t.ContainsKey("plate");
        }
        catch (Exception)
        {
            // unreadable TOML: the line scan is enough to know where the plan comes from
            return configText.Replace("\r\n", "\n").Split('\n').Any(l => l.Trim().StartsWith("[plate]", StringComparison.Ordinal));
        }
    }

    private static (Plan? Plan, IReadOnlyList<Problem> Problems) FromMaps(string folder, SeriesConfig config, PlateSettings plate, AnalysisOptions options,
        Dictionary<string, string>? hashes)
    {
        Problem AtKey(string key, string found, string expected, string hint) =>
            config.Locate(new Problem(config.File, 0, 0, found, expected, hint, key));
        if (SeriesInputs.Check(folder, SeriesRunner.PlanFile, true, long.MaxValue, out _) is not { Missing: true })
            return (null, [AtKey("plate", "a [plate] table, and plan.csv in the series folder as well",
                "one description of the runs: plan.csv, or the plate maps that [plate] names",
                "remove plan.csv to build the plan from the maps (`tracekin plate-plan` writes it from them when a file is wanted), or remove the [plate] table to use plan.csv")]);
        var texts = new List<(string File, string Text)>();
        for (var i = 0; i < plate.Maps.Count; i++)
        {
            var name = plate.Maps[i];
            var key = plate.Maps.Count == 1 ? "plate.maps" : $"plate.maps[{i}]";
            if (SeriesInputs.Check(folder, name, options.AllowOutsideFiles, ExportReader.MaxBytes, out var path) is { } refusal)
                return (null, [AtKey(key, refusal.Found, refusal.Expected, refusal.Hint)]);
            try
            {
                // Hashed from the bytes it is parsed from (the report lists each map with its SHA-256).
                var bytes = File.ReadAllBytes(path);
                if (hashes is not null) hashes[name] = Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(bytes));
                using var reader = new StreamReader(new MemoryStream(bytes, writable: false), System.Text.Encoding.UTF8, detectEncodingFromByteOrderMarks: true);
                texts.Add((name, reader.ReadToEnd()));
            }
            catch (IOException ex) { return (null, [AtKey(key, $"{Fail.Quote(name)}, a file that cannot be read ({ex.Message})", "a plate-map file", "")]); }
        }
        try
        {
            var map = PlateMap.Read(texts);
            if (plate.Export is null && !map.Columns.Contains("file", StringComparer.OrdinalIgnoreCase))
                return (null, [AtKey("plate.export", "nothing", "the plate export every mapped well is read from (its file name in the series folder), or a \"file\" grid in the map", "")]);
            var exportCell = plate.Export is null ? null : At(config, "plate.export");
            var (plan, problems) = map.ToPlan(plate.Export, plate.RunPrefix, plate.Label(), exportCell);
            return (plan, problems);
        }
        catch (InputException ex) { return (null, [ex.Problem]); }
    }

    private static MapCell At(SeriesConfig config, string key)
    {
        var (line, column) = TomlKeyLocation.Find(config.Text ?? "", key);
        return new MapCell(config.File, line, column);
    }
}
