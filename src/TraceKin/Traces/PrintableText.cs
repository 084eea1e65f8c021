using System.Text;

namespace TraceKin.Traces;

/// <summary>
/// Text from input files (run ids, file names, cells) made safe to show on a terminal or in a log: control characters
/// that a terminal would act on, or that would start a false log line, are shown as visible escapes instead.
/// </summary>
public static class PrintableText
{
    /// <summary>
    /// C0 controls (U+0000–U+001F, including tab, CR and LF), DEL and C1 controls (U+007F–U+009F) become <c>\xHH</c>
    /// (ESC is <c>\x1B</c>); the Unicode line and paragraph separators and the bidirectional embedding, override and
    /// isolate controls (which can make text read in another order) become <c>\uHHHH</c>. A backslash is left alone:
    /// paths and ids keep their look, so the escapes are for a human reader, not a reversible encoding.
    /// Returns the same string when nothing needs escaping.
    /// </summary>
    public static string Escape(string text)
    {
        var i = 0;
        while (i < text.Length && !NeedsEscape(text[i])) i++;
        if (i == text.Length) return text;
        var sb = new StringBuilder(text.Length + 8).Append(text, 0, i);
        for (; i < text.Length; i++)
        {
            var ch = text[i];
            if (!NeedsEscape(ch)) sb.Append(ch);
            else if (ch <= '\u009F') sb.Append(@"\x").Append(((int)ch).ToString("X2", System.Globalization.CultureInfo.InvariantCulture));
            else sb.Append(@"\u").Append(((int)ch).ToString("X4", System.Globalization.CultureInfo.InvariantCulture));
        }
        return sb.ToString();
    }

    private static bool NeedsEscape(char ch) =>
        ch < ' ' || ch is >= '\u007F' and <= '\u009F' || ch is '\u2028' or '\u2029' || ch is >= '\u202A' and <= '\u202E' || ch is >= '\u2066' and <= '\u2069';
}
