using System.Text;

namespace TraceKin.Reports;

/// <summary>
/// A small HTML text builder: every piece of user text goes through <see cref="Escape"/> (the five characters that
/// HTML gives meaning to, WHATWG HTML "Serializing HTML fragments", escapingString), so file names, run ids and
/// messages cannot inject markup. It writes straight to a <see cref="TextWriter"/>, so a report with hundreds of embedded
/// plots streams to its file instead of being held whole in memory.
/// </summary>
internal sealed class Html
{
    private readonly TextWriter _w;

    /// <summary>Builds the page in memory (<see cref="ToString"/> returns it).</summary>
    public Html() : this(new StringWriter(System.Globalization.CultureInfo.InvariantCulture)) { }

    /// <summary>Writes the page to <paramref name="writer"/> as it is built.</summary>
    public Html(TextWriter writer) => _w = writer;

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
        _w.Write(markup);
        return this;
    }

    /// <summary>Appends user or computed text, escaped.</summary>
    public Html Text(string? text)
    {
        _w.Write(Escape(text));
        return this;
    }

    /// <summary>&lt;tag attrs&gt;escaped text&lt;/tag&gt; on one line.</summary>
    public Html Element(string tag, string? text, string attributes = "")
    {
        _w.Write('<');
        _w.Write(tag);
        if (attributes.Length > 0)
        {
            _w.Write(' ');
            _w.Write(attributes);
        }
        _w.Write('>');
        _w.Write(Escape(text));
        _w.Write("</");
        _w.Write(tag);
        _w.Write(">\n");
        return this;
    }

    /// <summary>An attribute with an escaped value: name="value".</summary>
    public static string Attr(string name, string value) => $"{name}=\"{Escape(value)}\"";

    /// <summary>The page built so far, when building in memory.</summary>
    public override string ToString() => _w is StringWriter sw ? sw.ToString() : base.ToString() ?? "";
}
