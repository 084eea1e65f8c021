using Tomlyn;
using Tomlyn.Model;
using TraceKin.Ingest;
using TraceKin.Rates;
using TraceKin.Series;
using TraceKin.Signal;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Analysis;

/// <summary>
/// series.toml: series-wide settings. Top-level keys `name` and `description`; tables [ingest], [signal], [rates], [model],
/// each read by its own stage. Unknown keys are errors (a misspelt key must not silently fall back to a default).
/// </summary>
public sealed record SeriesConfig(
    string File,
    string Name,
    string Description,
    IngestSettings Ingest,
    SignalSettings Signal,
    RateSettings Rates,
    ModelSettings Model)
{
    /// <summary>[plate]: the plan is built from plate maps instead of plan.csv (null when the table is absent).</summary>
    public PlateSettings? Plate { get; init; }

    /// <summary>The text the settings were read from, to locate a settings problem found later (see <see cref="TomlKeyLocation"/>).</summary>
    public string? Text { get; init; }

    /// <summary>The parsed document the settings were read from (null for settings made in code): the report reads which
    /// keys were written from it instead of parsing the text again.</summary>
    internal TomlTable? Table { get; init; }

    /// <summary>A problem named by a series.toml key (this file's, or an export's conflict with a key) located at that key.</summary>
    public Problem Locate(Problem p)
    {
        if (p.Key is null || p.Line > 0 || Text is null) return p;
        var (line, column) = TomlKeyLocation.Find(Text, p.Key);
        return p.File == File
            ? p with { Line = line, Column = column }
            : p with { File = File, Line = line, Column = column, Found = $"{Fail.Quote(p.File)}: {p.Found}", Input = p.Input ?? p.File };
    }

    public static SeriesConfig FromFile(string path) =>
        FromText(System.IO.File.ReadAllText(path), System.IO.Path.GetFileName(path));

    public static SeriesConfig FromText(string text, string file)
    {
        TomlTable table;
        try
        {
            table = TomlSerializer.Deserialize<TomlTable>(text) ?? new TomlTable();
        }
        catch (Exception ex) when (ex is not InputException)
        {
            var (line, col) = LocationOf(ex.Message);
            throw Fail.At(file, Math.Max(1, line), Math.Max(1, col), "text that is not valid TOML (" + FirstLine(ex.Message) + ")", "TOML key = value lines and [tables]", "see docs/formats.md");
        }
        try
        {
            var root = new TomlSection(file, "", table);
            var name = root.String("name", "");
            var description = root.String("description", "");
            var sections = new List<TomlSection>();
            TomlSection Sec(string key) { var s = root.Section(key); sections.Add(s); return s; }
            var config = new SeriesConfig(file, name, description,
                IngestSettings.FromToml(Sec("ingest")),
                SignalSettings.FromToml(Sec("signal")),
                RateSettings.FromToml(Sec("rates")),
                ModelSettings.FromToml(Sec("model")))
            {
                Plate = root.Has("plate") ? PlateSettings.FromToml(Sec("plate")) : null,
            };
            foreach (var s in sections.Prepend(root))
                foreach (var k in s.UnreadKeys)
                    throw Fail.Setting(file, s.KeyName(k), "a key TraceKin does not know", "one of the keys listed in docs/formats.md", "check the spelling");
            return config with { Text = text, Table = table };
        }
        catch (InputException ex) when (ex.Problem.Key is not null && ex.Problem.Line == 0)
        {
            throw new InputException(TomlKeyLocation.Locate(ex.Problem, text));
        }
    }

    private static (int Line, int Col) LocationOf(string message)
    {
        var m = System.Text.RegularExpressions.Regex.Match(message, @"\((\d+),\s*(\d+)\)");
        return m.Success ? (int.Parse(m.Groups[1].Value), int.Parse(m.Groups[2].Value)) : (0, 0);
    }

    private static string FirstLine(string s) => s.Split('\n')[0].Trim();
}
