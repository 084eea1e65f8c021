using TraceKin.Traces;

namespace TraceKin.Setup;

/// <summary>
/// Where a dotted key (<c>signal.path_length</c>) is written in series.toml, so a settings problem names its line and
/// column like every other problem. A light line scan, enough for the forms series.toml uses: <c>[table]</c> headers,
/// <c>key = value</c> lines (also dotted keys and quoted keys) and one-line inline tables
/// (<c>calibration = { file = "std.csv" }</c>). A key that is not written is placed at its table's header (where it
/// belongs), else at line 1, column 1.
/// </summary>
internal static class TomlKeyLocation
{
    public static (int Line, int Column) Find(string text, string dottedKey)
    {
        var wanted = dottedKey.Split('.');
        var lines = text.Replace("\r\n", "\n").Split('\n');
        var table = Array.Empty<string>();
        (int Line, int Column)? best = null;
        var bestDepth = 0;
        for (var i = 0; i < lines.Length; i++)
        {
            var raw = lines[i];
            var start = raw.Length - raw.TrimStart().Length;
            var line = StripComment(raw).Trim();
            if (line.Length == 0) continue;
            if (line.StartsWith('['))
            {
                var name = line.TrimStart('[').Split(']')[0];
                table = Parts(name);
                // the deepest table header on the key's path is where a key that is not written belongs
                if (table.Length > bestDepth && IsPrefix(table, wanted))
                {
                    best = (i + 1, start + 1);
                    bestDepth = table.Length;
                }
                continue;
            }
            var eq = line.IndexOf('=');
            if (eq <= 0) continue;
            var key = table.Concat(Parts(line[..eq])).ToArray();
            if (key.SequenceEqual(wanted, StringComparer.Ordinal)) return (i + 1, start + 1);
            if (key.Length < wanted.Length && IsPrefix(key, wanted) && line[(eq + 1)..].TrimStart().StartsWith('{'))
            {
                // an inline table on this line: find the next part of the key inside it
                var inner = wanted[key.Length];
                var at = raw.IndexOf(inner, raw.IndexOf('{'), StringComparison.Ordinal);
                return (i + 1, at >= 0 ? at + 1 : start + 1);
            }
        }
        return best ?? (1, 1);
    }

    /// <summary>The problem with its line and column filled in from the text, when it names a key and has no line yet.</summary>
    public static Problem Locate(Problem p, string text)
    {
        if (p.Key is null || p.Line > 0) return p;
        var (line, column) = Find(text, p.Key);
        return p with { Line = line, Column = column };
    }

    private static bool IsPrefix(string[] prefix, string[] key) =>
        prefix.Length <= key.Length && prefix.AsSpan().SequenceEqual(key.AsSpan(0, prefix.Length));

    private static string[] Parts(string dotted) =>
        dotted.Split('.').Select(p => p.Trim().Trim('"', '\'')).ToArray();

    private static string StripComment(string line)
    {
        var quoted = '\0';
        for (var i = 0; i < line.Length; i++)
        {
            var ch = line[i];
            if (quoted != '\0')
            {
                if (ch == quoted) quoted = '\0';
                else if (ch == '\\' && quoted == '"') i++;
            }
            else if (ch is '"' or '\'') quoted = ch;
            else if (ch == '#') return line[..i];
        }
        return line;
    }
}
