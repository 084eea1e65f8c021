using System.Text;
using System.Text.Unicode;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// Turns an export's bytes into UTF-8 (the one form the readers scan), deciding the encoding from the byte-order mark,
/// strict UTF-8 validity, or the Windows-1252 fallback that older instrument software writes. A UTF-8 file is not
/// copied: the readers work on the bytes as read.
/// </summary>
internal static class TextDecoding
{
    public readonly record struct Decoded(ReadOnlyMemory<byte> Utf8, string Encoding);

    public static Decoded ToUtf8(ReadOnlyMemory<byte> memory, string file, string? forced)
    {
        var bytes = memory.Span;
        var hasUtf8Bom = bytes.Length >= 3 && bytes[0] == 0xEF && bytes[1] == 0xBB && bytes[2] == 0xBF;
        var hasLeBom = bytes.Length >= 2 && bytes[0] == 0xFF && bytes[1] == 0xFE;
        var hasBeBom = bytes.Length >= 2 && bytes[0] == 0xFE && bytes[1] == 0xFF;
        Decoded result = forced switch
        {
            "utf-8" => Utf8(memory, hasUtf8Bom ? 3 : 0, file, hasUtf8Bom ? "UTF-8 (BOM)" : "UTF-8", "set by ingest.encoding"),
            "utf-16le" => Utf16(bytes, hasLeBom ? 2 : 0, bigEndian: false, file, "UTF-16 LE (set by ingest.encoding)"),
            "utf-16be" => Utf16(bytes, hasBeBom ? 2 : 0, bigEndian: true, file, "UTF-16 BE (set by ingest.encoding)"),
            "windows-1252" => new(Windows1252(bytes, 0, latin1Only: false), "Windows-1252 (set by ingest.encoding)"),
            "latin-1" => new(Windows1252(bytes, 0, latin1Only: true), "Latin-1 (set by ingest.encoding)"),
            _ when hasUtf8Bom => Utf8(memory, 3, file, "UTF-8 (BOM)", null),
            _ when hasLeBom => Utf16(bytes, 2, bigEndian: false, file, "UTF-16 LE (BOM)"),
            _ when hasBeBom => Utf16(bytes, 2, bigEndian: true, file, "UTF-16 BE (BOM)"),
            _ when System.Text.Unicode.Utf8.IsValid(bytes) => new(memory, "UTF-8"),
            _ => new(Windows1252(bytes, 0, latin1Only: false), "Windows-1252 (not valid UTF-8)"),
        };
        var nul = result.Utf8.Span.IndexOf((byte)0);
        if (nul >= 0)
        {
            var (line, col) = LineColumn.Of(result.Utf8.Span, nul);
            throw Fail.At(file, line, col, "a NUL byte", "text", "this looks like a binary file or UTF-16 without a byte-order mark; export as text, or set ingest.encoding");
        }
        return result;
    }

    private static Decoded Utf8(ReadOnlyMemory<byte> bytes, int start, string file, string name, string? how)
    {
        var span = bytes.Span[start..];
        if (!System.Text.Unicode.Utf8.IsValid(span))
        {
            var bad = FirstInvalidUtf8(span);
            var (line, col) = LineColumn.Of(span, bad);
            throw Fail.At(file, line, col, $"the byte 0x{span[bad]:X2}, which is not UTF-8", "UTF-8 text" + (how is null ? " (the file starts with a UTF-8 byte-order mark)" : ""),
                "re-export as UTF-8, or set ingest.encoding = \"windows-1252\"");
        }
        return new(bytes[start..], how is null ? name : $"{name} ({how})");
    }

    private static int FirstInvalidUtf8(ReadOnlySpan<byte> span)
    {
        var i = 0;
        while (i < span.Length)
        {
            if (Rune.DecodeFromUtf8(span[i..], out _, out var consumed) != System.Buffers.OperationStatus.Done) return i;
            i += consumed;
        }
        return 0;
    }

    private static Decoded Utf16(ReadOnlySpan<byte> bytes, int start, bool bigEndian, string file, string name)
    {
        if ((bytes.Length - start) % 2 != 0)
            throw Fail.At(file, 1, 1, $"UTF-16 text of an odd number of bytes ({bytes.Length - start})", "whole 2-byte code units", "the file may be truncated");
        string text;
        try
        {
            text = new UnicodeEncoding(bigEndian, byteOrderMark: false, throwOnInvalidBytes: true).GetString(bytes[start..]);
        }
        catch (DecoderFallbackException)
        {
            throw Fail.At(file, 1, 1, "an unpaired UTF-16 surrogate", "valid UTF-16 text", "re-export the file as UTF-8");
        }
        return new(System.Text.Encoding.UTF8.GetBytes(text), name);
    }

    // Windows-1252 differs from ISO-8859-1 only in 0x80–0x9F. Mapping: Unicode Consortium, CP1252.TXT (from memory);
    // the five bytes it leaves undefined are kept as the C1 control of the same number, as ISO-8859-1 does.
    private static readonly char[] Cp1252High =
    [
        '\u20AC', '\u0081', '\u201A', '\u0192', '\u201E', '\u2026', '\u2020', '\u2021', '\u02C6', '\u2030', '\u0160', '\u2039', '\u0152', '\u008D', '\u017D', '\u008F',
        '\u0090', '\u2018', '\u2019', '\u201C', '\u201D', '\u2022', '\u2013', '\u2014', '\u02DC', '\u2122', '\u0161', '\u203A', '\u0153', '\u009D', '\u017E', '\u0178',
    ];

    private static byte[] Windows1252(ReadOnlySpan<byte> bytes, int start, bool latin1Only)
    {
        var chars = new char[bytes.Length - start];
        for (var i = start; i < bytes.Length; i++)
        {
            var b = bytes[i];
            chars[i - start] = !latin1Only && b is >= 0x80 and <= 0x9F ? Cp1252High[b - 0x80] : (char)b;
        }
        return System.Text.Encoding.UTF8.GetBytes(chars);
    }
}

/// <summary>1-based line and column numbers of a byte offset in UTF-8 text (columns count characters, not bytes).</summary>
internal static class LineColumn
{
    public static (int Line, int Column) Of(ReadOnlySpan<byte> text, int offset)
    {
        var line = 1;
        var lineStart = 0;
        for (var i = 0; i < offset && i < text.Length; i++)
        {
            if (text[i] == (byte)'\n' || (text[i] == (byte)'\r' && (i + 1 >= text.Length || text[i + 1] != (byte)'\n')))
            {
                line++;
                lineStart = i + 1;
            }
        }
        return (line, ColumnIn(text[lineStart..], offset - lineStart));
    }

    /// <summary>1-based column (in characters) of a byte offset within one line.</summary>
    public static int ColumnIn(ReadOnlySpan<byte> line, int byteOffset)
    {
        byteOffset = Math.Clamp(byteOffset, 0, line.Length);
        return System.Text.Encoding.UTF8.GetCharCount(line[..byteOffset]) + 1;
    }
}
