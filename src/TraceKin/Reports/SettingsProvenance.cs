using TraceKin.Analysis;
using System.Collections;
using System.Globalization;
using System.Reflection;
using System.Text;
using Tomlyn.Model;
using TraceKin.Setup;

namespace TraceKin.Reports;

/// <summary>One setting as the analysis used it, and where its value came from ("series.toml" or "default").</summary>
public sealed record SettingUse(string Key, string Value, string Source);

/// <summary>
/// Lists the series settings the analysis used with their source. The effective values come from the parsed
/// <see cref="SeriesConfig"/> (every section record, found by reflection so new settings appear without changes here);
/// whether a key was written is seen in the text the settings were parsed from (<see cref="SeriesConfig.Text"/>; the
/// file is not read again). Keys written in the file that map to no single setting (e.g. a unit key) are listed as written.
/// </summary>
internal static class SettingsProvenance
{
    private static readonly Dictionary<string, string> UnitOf = new(StringComparer.Ordinal)
    {
        ["PathLength"] = "cm",
        ["MolarAbsorptivity"] = "L/(mol·cm)",
        ["WindowEnd"] = "s",
    };

    public static IReadOnlyList<SettingUse> Rows(SeriesConfig config)
    {
        // The document series.toml was parsed into, once, when it was read; settings made in code have none: their values
        // are still known, only their source is not.
        var raw = config.Table;

        var rows = new List<SettingUse>
        {
            new("name", config.Name.Length > 0 ? config.Name : "(folder name)", Source(raw, null, "name")),
        };
        if (config.Description.Length > 0) rows.Add(new("description", config.Description, Source(raw, null, "description")));
        foreach (var section in typeof(SeriesConfig).GetProperties(BindingFlags.Public | BindingFlags.Instance))
        {
            var type = section.PropertyType;
            if (type == typeof(string) || type.IsValueType || type.Namespace?.StartsWith("TraceKin", StringComparison.Ordinal) != true) continue;
            var value = section.GetValue(config);
            if (value is null) continue;
            var sectionKey = Snake(section.Name);
            var table = raw is not null && raw.TryGetValue(sectionKey, out var t) ? t as TomlTable : null;
            var matched = new HashSet<string>(StringComparer.Ordinal);
            var props = type.GetProperties(BindingFlags.Public | BindingFlags.Instance).Where(p => p.GetIndexParameters().Length == 0).ToList();
            var propKeys = props.Select(p => Snake(p.Name)).ToHashSet(StringComparer.Ordinal);
            foreach (var p in props)
            {
                var key = Snake(p.Name);
                // A file key names this property exactly, or is a shorter spelling of it (decimal → decimal_separator)
                // that names no other property (so molar_absorptivity does not claim molar_absorptivity_u).
                var fileKey = table?.Keys.FirstOrDefault(k => k == key)
                    ?? table?.Keys.FirstOrDefault(k => !propKeys.Contains(k) && key.StartsWith(k + "_", StringComparison.Ordinal));
                if (fileKey is not null) matched.Add(fileKey);
                var setting = p.GetValue(value);
                if (setting is null && p.IsDefined(typeof(ShownOnlyWhenSetAttribute), inherit: false)) continue;
                var text = Describe(setting);
                if (UnitOf.TryGetValue(p.Name, out var unit) && text != "not set") text += " " + unit;
                var source = raw is null ? "unknown" : fileKey is not null ? "series.toml" : "default";
                rows.Add(new SettingUse($"{sectionKey}.{key}", text, source));
            }
            if (table is null) continue;
            foreach (var k in table.Keys.Where(k => !matched.Contains(k) && table[k] is not TomlTable).Order(StringComparer.Ordinal))
                rows.Add(new SettingUse($"{sectionKey}.{k}", Describe(table[k]), "series.toml"));
        }
        return rows;
    }

    private static string Source(TomlTable? raw, string? section, string key)
    {
        if (raw is null) return "unknown";
        var table = section is null ? raw : raw.TryGetValue(section, out var t) ? t as TomlTable : null;
        return table?.ContainsKey(key) == true ? "series.toml" : "default";
    }

    private static string Describe(object? v) => v switch
    {
        null => "not set",
        string s => s,
        bool b => b ? "true" : "false",
        double d => d.ToString("G6", CultureInfo.InvariantCulture),
        float f => f.ToString("G6", CultureInfo.InvariantCulture),
        long l => l.ToString(CultureInfo.InvariantCulture),
        int i => i.ToString(CultureInfo.InvariantCulture),
        IFormattable f => f.ToString(null, CultureInfo.InvariantCulture),
        IEnumerable e => "[" + string.Join(", ", e.Cast<object?>().Select(Describe)) + "]",
        _ => v.ToString() ?? "",
    };

    /// <summary>PascalCase property name → the snake_case key series.toml uses (MolarAbsorptivity → molar_absorptivity).</summary>
    public static string Snake(string name)
    {
        var sb = new StringBuilder();
        for (var i = 0; i < name.Length; i++)
        {
            if (char.IsUpper(name[i]) && i > 0) sb.Append('_');
            sb.Append(char.ToLowerInvariant(name[i]));
        }
        return sb.ToString();
    }
}
