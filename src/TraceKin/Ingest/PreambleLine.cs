namespace TraceKin.Ingest;

/// <summary>
/// A metadata line before the header (or after the data): "key: value", "key = value", "key,value" (any delimiter),
/// or behind a comment mark "# key: value" / "# key = value". The earliest separator on the line splits it.
/// </summary>
internal static class PreambleLine
{
    public static bool TryRead(string line, out string key, out string value)
    {
        var text = line.Trim();
        // behind a comment mark only "key: value" and "key = value" count; "# made by X; seed 7" is prose
        var comment = text.Length > 0 && text[0] is '#' or ';';
        if (comment) text = text.TrimStart('#', ';').Trim();
        key = value = "";
        var cut = -1;
        for (var i = 0; i < text.Length; i++)
        {
            if (text[i] is ':' or '=' || (!comment && text[i] is ',' or ';' or '\t'))
            {
                cut = i;
                break;
            }
        }
        if (cut <= 0) return false;
        key = Unquote(text[..cut]);
        value = Unquote(text[(cut + 1)..]);
        // "key,value,," from a spreadsheet: drop trailing empty cells
        value = value.TrimEnd(',', ';', '\t', ' ');
        return key.Length > 0;
    }

    private static string Unquote(string s)
    {
        s = s.Trim();
        return s.Length >= 2 && s[0] == '"' && s[^1] == '"' ? s[1..^1].Replace("\"\"", "\"").Trim() : s;
    }
}
