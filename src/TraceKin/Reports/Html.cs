using System.Text;

namespace TraceKin.Reports;

/// <summary>
/// A small HTML text builder: every piece of user text goes through <see cref="Escape"/> (the five characters that
/// HTML gives meaning to, WHATWG HTML "Serializing HTML fragments", escapingString), so file names, run ids and
/// messages cannot inject markup.
/// </summary>
public sealed class Html
{
    private readonly StringBuilder _sb = new();

    public static string Escape(string? text)
    {
        if (string.IsNullOrEmpty(text)) return "";
        var sb = new StringBuilder(text.Length + 16);
        foreach (var ch in text)
        {
            switch (ch)
            {
                case '&': sb.Append("&amp;"); break;
                case '<': sb.Append("&lt;"); break;
                case '>': sb.Append("&gt;"); break;
                case '"': sb.Append("&quot;"); break;
                case '\'': sb.Append("&#39;"); break;
                default:
                    // Control characters other than tab/newline have no place in a report.
                    if (char.IsControl(ch) && ch is not '\t' and not '\n' and not '\r') sb.Append('\uFFFD');
                    else sb.Append(ch);
                    break;
            }
        }
        return sb.ToString();
    }

    /// <summary>Appends trusted markup as is.</summary>
    public Html Raw(string markup)
    {
        _sb.Append(markup);
        return this;
    }

    /// <summary>Appends user or computed text, escaped.</summary>
    public Html Text(string? text)
    {
        _sb.Append(Escape(text));
        return this;
    }

    /// <summary>&lt;tag attrs&gt;escaped text&lt;/tag&gt; on one line.</summary>
    public Html Element(string tag, string? text, string attributes = "")
    {
        _sb.Append('<').Append(tag);
        if (attributes.Length > 0) _sb.Append(' ').Append(attributes);
        _sb.Append('>').Append(Escape(text)).Append("</").Append(tag).Append(">\n");
        return this;
    }

    /// <summary>An attribute with an escaped value: name="value".</summary>
    public static string Attr(string name, string value) => $"{name}=\"{Escape(value)}\"";

    public override string ToString() => _sb.ToString();
}
