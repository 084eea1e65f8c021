using System.Globalization;
using Tomlyn.Model;
using TraceKin.Traces;

namespace TraceKin.Setup;

/// <summary>
/// Read access to one table of series.toml with errors that name the dotted key. Every key read is recorded,
/// so SeriesConfig (Analysis) can reject misspelt keys instead of silently ignoring them.
/// </summary>
public sealed class TomlSection
{
    private readonly TomlTable _table;
    private readonly HashSet<string> _read = new(StringComparer.Ordinal);

    public TomlSection(string file, string prefix, TomlTable table)
    {
        File = file;
        Prefix = prefix;
        _table = table;
    }

    public string File { get; }
    /// <summary>The section's dotted name ("signal"), or "" for the top level.</summary>
    public string Prefix { get; }

    public string KeyName(string key) => Prefix.Length == 0 ? key : $"{Prefix}.{key}";

    public bool Has(string key) => _table.ContainsKey(key);

    public IEnumerable<string> Keys => _table.Keys;

    /// <summary>Keys present in the file that no reader asked for (likely misspellings).</summary>
    public IEnumerable<string> UnreadKeys => _table.Keys.Where(k => !_read.Contains(k) && _table[k] is not TomlTable);

    private object? Get(string key)
    {
        _read.Add(key);
        return _table.TryGetValue(key, out var v) ? v : null;
    }

    public string? String(string key)
    {
        var v = Get(key);
        return v switch
        {
            null => null,
            string s => s,
            _ => throw Fail.Setting(File, KeyName(key), Describe(v), "a quoted string"),
        };
    }

    public string String(string key, string fallback) => String(key) ?? fallback;

    /// <summary>One of <paramref name="allowed"/> (case-insensitive), returned in its canonical spelling.</summary>
    public string Choice(string key, string fallback, params string[] allowed)
    {
        var s = String(key);
        if (s is null) return fallback;
        foreach (var a in allowed)
            if (string.Equals(a, s, StringComparison.OrdinalIgnoreCase)) return a;
        throw Fail.Setting(File, KeyName(key), Fail.Quote(s), $"one of: {string.Join(", ", allowed)}");
    }

    public double? Double(string key)
    {
        var v = Get(key);
        return v switch
        {
            null => null,
            double d when double.IsFinite(d) => d,
            long l => l,
            int i => i,
            _ => throw Fail.Setting(File, KeyName(key), Describe(v), "a finite number"),
        };
    }

    public double Double(string key, double fallback) => Double(key) ?? fallback;

    /// <summary>A number that must be strictly positive when present.</summary>
    public double? Positive(string key)
    {
        var d = Double(key);
        if (d is { } x && !(x > 0)) throw Fail.Setting(File, KeyName(key), x.ToString(CultureInfo.InvariantCulture), "a number greater than zero");
        return d;
    }

    public int? Int(string key)
    {
        var v = Get(key);
        return v switch
        {
            null => null,
            long l when l is >= int.MinValue and <= int.MaxValue => (int)l,
            _ => throw Fail.Setting(File, KeyName(key), Describe(v), "a whole number"),
        };
    }

    public bool? Bool(string key)
    {
        var v = Get(key);
        return v switch
        {
            null => null,
            bool b => b,
            _ => throw Fail.Setting(File, KeyName(key), Describe(v), "true or false"),
        };
    }

    public double[]? Doubles(string key)
    {
        var v = Get(key);
        if (v is null) return null;
        if (v is not TomlArray arr) throw Fail.Setting(File, KeyName(key), Describe(v), "an array of numbers, e.g. [0.1, 0.2]");
        var result = new double[arr.Count];
        for (var i = 0; i < arr.Count; i++)
            result[i] = arr[i] switch
            {
                double d when double.IsFinite(d) => d,
                long l => l,
                var o => throw Fail.Setting(File, $"{KeyName(key)}[{i}]", Describe(o), "a finite number"),
            };
        return result;
    }

    public string[]? Strings(string key)
    {
        var v = Get(key);
        if (v is null) return null;
        if (v is string one) return [one];
        if (v is not TomlArray arr) throw Fail.Setting(File, KeyName(key), Describe(v), "a string or an array of strings");
        return arr.Select((o, i) => o as string ?? throw Fail.Setting(File, $"{KeyName(key)}[{i}]", Describe(o), "a quoted string")).ToArray();
    }

    /// <summary>
    /// An array of strings, strictly (a bare string is not taken for a one-element array), or null when absent. Every
    /// error names the key itself, with the element's position in what was found, so it is located at the key's line and
    /// column; <paramref name="expected"/> says what the key takes.
    /// </summary>
    internal string[]? StringArray(string key, string expected)
    {
        var v = Get(key);
        if (v is null) return null;
        if (v is string one)
            throw Fail.Setting(File, KeyName(key), Describe(v) + " (not an array)", expected, $"write {key} = [{Fail.Quote(one)}]");
        if (v is not TomlArray arr) throw Fail.Setting(File, KeyName(key), Describe(v), expected);
        var result = new string[arr.Count];
        for (var i = 0; i < arr.Count; i++)
            result[i] = arr[i] as string ?? throw Fail.Setting(File, KeyName(key), $"{Describe(arr[i])} as element {i + 1}", expected);
        return result;
    }

    /// <summary>A sub-table, or an empty section when absent.</summary>
    public TomlSection Section(string key)
    {
        var v = Get(key);
        return v switch
        {
            null => new TomlSection(File, KeyName(key), new TomlTable()),
            TomlTable t => new TomlSection(File, KeyName(key), t),
            _ => throw Fail.Setting(File, KeyName(key), Describe(v), $"a table [{KeyName(key)}]"),
        };
    }

    /// <summary>An array of tables ([[key]]), or empty when absent.</summary>
    public IReadOnlyList<TomlSection> Sections(string key)
    {
        var v = Get(key);
        return v switch
        {
            null => [],
            TomlTableArray a => a.Select((t, i) => new TomlSection(File, $"{KeyName(key)}[{i}]", t)).ToArray(),
            _ => throw Fail.Setting(File, KeyName(key), Describe(v), $"an array of tables [[{KeyName(key)}]]"),
        };
    }

    private static string Describe(object? v) => v switch
    {
        null => "nothing",
        string s => $"the text {Fail.Quote(s)}",
        bool b => b ? "true" : "false",
        double d => d.ToString("R", CultureInfo.InvariantCulture),
        long l => l.ToString(CultureInfo.InvariantCulture),
        TomlTable => "a table",
        TomlArray => "an array",
        _ => v.GetType().Name,
    };
}
