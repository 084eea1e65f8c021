using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// Reads one instrument export into a <see cref="RunExport"/>. The format is sniffed from the content, never from the
/// file name (<see cref="ExportFormats"/>, in order): an .xlsx workbook by its bytes, then, on the decoded text, a
/// JCAMP-DX labelled record ("##TITLE=") to <see cref="JcampReader"/>, a grid of wells to <see cref="GridReader"/>,
/// anything else to the delimited-text reader. Bad content throws <see cref="InputException"/> with file, line and column.
/// </summary>
public static class ExportReader
{
    /// <summary>Largest export read (a time course of millions of rows is far below this).</summary>
    public const long MaxBytes = 1L << 30;

    public static RunExport FromFile(string path, IngestSettings settings)
    {
        using var bytes = ExportBytes.Read(path);
        return FromBytes(bytes.Memory, Path.GetFileName(path), settings);
    }

    public static RunExport FromBytes(byte[] bytes, string file, IngestSettings settings) => FromBytes(bytes, file, settings, fastRows: true);

    /// <summary>Reads an export from bytes the caller owns (e.g. <see cref="ExportBytes.Memory"/>); the result holds no reference to them.</summary>
    public static RunExport FromBytes(ReadOnlyMemory<byte> bytes, string file, IngestSettings settings) => FromBytes(bytes, file, settings, fastRows: true);

    /// <param name="fastRows">False reads every delimited row by the general path (for tests that compare the two paths).</param>
    internal static RunExport FromBytes(ReadOnlyMemory<byte> bytes, string file, IngestSettings settings, bool fastRows)
    {
        if (bytes.Length == 0) throw Fail.At(file, 1, 1, "an empty file", "a header line and data rows", "was the export saved completely?");
        foreach (var format in ExportFormats.Binary)
            if (format.Looks(bytes)) return format.Read(bytes, file, settings, fastRows);
        var decoded = TextDecoding.ToUtf8(bytes, file, settings.Encoding);
        return Read(decoded.Utf8, decoded.Encoding, file, settings, fastRows);
    }

    public static RunExport FromText(string text, string file, IngestSettings settings)
    {
        if (text.Length > 0 && text[0] == '\uFEFF') text = text[1..];
        if (text.Length == 0) throw Fail.At(file, 1, 1, "an empty file", "a header line and data rows", "was the export saved completely?");
        var bytes = System.Text.Encoding.UTF8.GetBytes(text);
        var nul = Array.IndexOf(bytes, (byte)0);
        if (nul >= 0)
        {
            var (line, col) = LineColumn.Of(bytes, nul);
            throw Fail.At(file, line, col, "a NUL character", "text", "this looks like a binary file, not a text export");
        }
        return Read(bytes, "text (decoded before reading)", file, settings, fastRows: true);
    }

    /// <summary>UTF-8 text already decoded (a spreadsheet's sheet laid out as text), read by the text layouts.</summary>
    internal static RunExport ReadText(ReadOnlyMemory<byte> utf8, string encoding, string file, IngestSettings settings, bool fastRows) =>
        Read(utf8, encoding, file, settings, fastRows);

    /// <summary>The format ingest.layout forces, else the first in <see cref="ExportFormats.Text"/> whose content test passes.</summary>
    private static RunExport Read(ReadOnlyMemory<byte> utf8, string encoding, string file, IngestSettings settings, bool fastRows)
    {
        var formats = ExportFormats.Text;
        var format = formats.FirstOrDefault(f => f.Layout is not null && f.Layout == settings.Layout);
        if (format is null)
        {
            var span = utf8.Span;
            format = formats[^1];
            for (var i = 0; i < formats.Count - 1; i++)
                if (formats[i].Looks(span)) { format = formats[i]; break; }
        }
        return format.Read(utf8, file, encoding, settings, fastRows);
    }
}
