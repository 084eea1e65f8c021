using System.Buffers;
using System.Globalization;
using System.Text;
using System.Text.Encodings.Web;

namespace TraceKin.Reports;

/// <summary>
/// How summary.json escapes text: only what JSON requires (RFC 8259 §7: the quotation mark, the reverse solidus and the
/// control characters), plus the characters a reader would not see. Everything else is written as itself in UTF-8, so
/// "H+" reads "H+" and "±", "·", "ν" read as themselves.
/// <para>
/// Why this is safe here: summary.json is a file of its own, served to no browser and never pasted into HTML or a
/// script, so the characters the default encoder escapes for HTML (&lt; &gt; &amp; ' ` +) have no meaning in it; every
/// JSON parser reads them raw. It starts from <see cref="JavaScriptEncoder.UnsafeRelaxedJsonEscaping"/> (which still
/// escapes control characters, U+2028/U+2029, unassigned code points and characters outside the Basic Multilingual
/// Plane) and in addition escapes every format character (Unicode category Cf: soft hyphen, zero-width characters,
/// the bidirectional embeddings, overrides and isolates U+202A–U+202E, U+2066–U+2069, the byte order mark), so a
/// file name or a cell quoted from an input can neither hide text nor reorder what an editor shows.
/// </para>
/// </summary>
internal sealed class SummaryTextEncoder : JavaScriptEncoder
{
    public static SummaryTextEncoder Instance { get; } = new();

    private static readonly JavaScriptEncoder Relaxed = UnsafeRelaxedJsonEscaping;

    private SummaryTextEncoder() { }

    private static bool Invisible(int codePoint) =>
        CharUnicodeInfo.GetUnicodeCategory(codePoint) == UnicodeCategory.Format;

    public override int MaxOutputCharactersPerInputCharacter => Math.Max(Relaxed.MaxOutputCharactersPerInputCharacter, 6);

    public override bool WillEncode(int unicodeScalar) => Invisible(unicodeScalar) || Relaxed.WillEncode(unicodeScalar);

    // Both searches let the relaxed encoder find its first character (it is vectorised), then look for a format
    // character among the non-ASCII characters before it. The relaxed encoder escapes every character outside the
    // Basic Multilingual Plane, so the characters before its index are single UTF-16 units.
    public override unsafe int FindFirstCharacterToEncode(char* text, int textLength)
    {
        var relaxed = Relaxed.FindFirstCharacterToEncode(text, textLength);
        var span = new ReadOnlySpan<char>(text, relaxed < 0 ? textLength : relaxed);
        for (var i = span.IndexOfAnyExceptInRange('\0', '\u007F'); i >= 0 && i < span.Length; i++)
            if (span[i] > '\u007F' && Invisible(span[i])) return i;
        return relaxed;
    }

    public override int FindFirstCharacterToEncodeUtf8(ReadOnlySpan<byte> utf8Text)
    {
        var relaxed = Relaxed.FindFirstCharacterToEncodeUtf8(utf8Text);
        var span = utf8Text[..(relaxed < 0 ? utf8Text.Length : relaxed)];
        var i = span.IndexOfAnyExceptInRange((byte)0, (byte)0x7F);
        while (i >= 0 && i < span.Length)
        {
            if (span[i] <= 0x7F) { i++; continue; }
            if (Rune.DecodeFromUtf8(span[i..], out var rune, out var length) != OperationStatus.Done || Invisible(rune.Value)) return i;
            i += length;
        }
        return relaxed;
    }

    public override unsafe bool TryEncodeUnicodeScalar(int unicodeScalar, char* buffer, int bufferLength, out int numberOfCharactersWritten)
    {
        if (unicodeScalar <= 0xFFFF && Invisible(unicodeScalar))
        {
            // The same form the writer uses for every other escape: \u and four upper-case hex digits.
            if (bufferLength < 6) { numberOfCharactersWritten = 0; return false; }
            var hex = unicodeScalar.ToString("X4", CultureInfo.InvariantCulture);
            buffer[0] = '\\';
            buffer[1] = 'u';
            for (var i = 0; i < 4; i++) buffer[2 + i] = hex[i];
            numberOfCharactersWritten = 6;
            return true;
        }
        return Relaxed.TryEncodeUnicodeScalar(unicodeScalar, buffer, bufferLength, out numberOfCharactersWritten);
    }
}
