using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>Which number forms a JCAMP-DX data line used.</summary>
[Flags]
internal enum AsdfForms
{
    None = 0,
    Affn = 1,
    Pac = 2,
    Sqz = 4,
    Dif = 8,
    Dup = 16,
}

/// <summary>
/// Decodes one line of JCAMP-DX ASDF ("ASCII squeezed difference form") ordinates, as laid down in
/// McDonald &amp; Wilks (1988), Appl. Spectrosc. 42, 151, "Data table compression":
/// AFFN — free-format numbers separated by blanks or commas; PAC — a '+' or '-' sign starts the next number;
/// SQZ — the leading digit and sign in one letter: '@'=0, 'A'–'I' = +1…+9, 'a'–'i' = −1…−9;
/// DIF — the difference from the previous ordinate: '%'=0, 'J'–'R' = +1…+9, 'j'–'r' = −1…−9;
/// DUP — 'S'–'Z' = 1…8, 's' = 9: the previous token occurs that many times in all (a DIF token is applied again).
/// </summary>
internal static class JcampAsdf
{
    /// <summary>
    /// Appends the numbers of <paramref name="line"/> to <paramref name="values"/>. Returns the forms seen and whether
    /// the line ended on a DIF token (then the next line starts with a Y check value).
    /// </summary>
    public static (AsdfForms Forms, bool EndsInDif) Decode(string line, List<double> values, string file, int lineNumber, int columnOffset)
    {
        var forms = AsdfForms.None;
        var i = 0;
        double? last = null;
        double lastDif = 0;
        var lastWasDif = false;
        while (i < line.Length)
        {
            var ch = line[i];
            if (ch is ' ' or ',' or '\t' or ';')
            {
                i++;
                continue;
            }
            if (ch == '$' && i + 1 < line.Length && line[i + 1] == '$') break; // comment to end of line
            var start = i;
            if (ch is >= '0' and <= '9' or '.' or '+' or '-')
            {
                if (ch is '+' or '-') forms |= AsdfForms.Pac;
                var (v, next) = Digits(line, i, ch == '-' ? -1 : 1, skipSign: ch is '+' or '-', file, lineNumber, columnOffset);
                if (!(ch is '+' or '-')) forms |= AsdfForms.Affn;
                values.Add(v);
                last = v;
                lastWasDif = false;
                i = next;
                continue;
            }
            if (Sqz(ch) is { } sqz)
            {
                forms |= AsdfForms.Sqz;
                var (v, next) = Digits(line, i + 1, Math.Sign(sqz) == 0 ? 1 : Math.Sign(sqz), skipSign: false, file, lineNumber, columnOffset, leading: Math.Abs(sqz));
                values.Add(v);
                last = v;
                lastWasDif = false;
                i = next;
                continue;
            }
            if (Dif(ch) is { } dif)
            {
                forms |= AsdfForms.Dif;
                if (last is null)
                    throw Fail.At(file, lineNumber, columnOffset + start + 1, $"a DIF character '{ch}' with no ordinate before it",
                        "an absolute (SQZ or AFFN) ordinate first (McDonald & Wilks 1988, DIF form)");
                var (d, next) = Digits(line, i + 1, Math.Sign(dif) == 0 ? 1 : Math.Sign(dif), skipSign: false, file, lineNumber, columnOffset, leading: Math.Abs(dif));
                var v = last.Value + d;
                values.Add(v);
                last = v;
                lastDif = d;
                lastWasDif = true;
                i = next;
                continue;
            }
            if (Dup(ch) is { } dup)
            {
                forms |= AsdfForms.Dup;
                if (last is null)
                    throw Fail.At(file, lineNumber, columnOffset + start + 1, $"a DUP character '{ch}' with nothing to repeat", "an ordinate before it");
                var (countValue, next) = Digits(line, i + 1, 1, skipSign: false, file, lineNumber, columnOffset, leading: dup);
                var count = (long)countValue;
                if (count < 1 || count > 10_000_000)
                    throw Fail.At(file, lineNumber, columnOffset + start + 1, $"a repeat count of {count}", "a DUP count from 1 to 10,000,000");
                for (var k = 1; k < count; k++)
                {
                    var v = lastWasDif ? last!.Value + lastDif : last!.Value;
                    values.Add(v);
                    last = v;
                }
                i = next;
                continue;
            }
            throw Fail.At(file, lineNumber, columnOffset + start + 1, $"the character {Fail.Quote(ch.ToString())}",
                "an AFFN number or an ASDF character (SQZ @A–Ia–i, DIF %J–Rj–r, DUP S–Zs)", "McDonald & Wilks (1988), Appl. Spectrosc. 42, 151");
        }
        return (forms, lastWasDif);
    }

    // Reads digits (and, for AFFN, a decimal point and an E exponent) after an optional leading digit from a SQZ/DIF/DUP letter.
    private static (double Value, int Next) Digits(string line, int i, int sign, bool skipSign, string file, int lineNumber, int columnOffset, int leading = -1)
    {
        var start = i;
        if (skipSign) i++;
        var sb = new System.Text.StringBuilder();
        if (leading >= 0) sb.Append((char)('0' + leading));
        while (i < line.Length && (char.IsAsciiDigit(line[i]) || line[i] == '.')) sb.Append(line[i++]);
        // AFFN exponent: E or e followed by a sign and a digit (a bare E is the SQZ digit +5)
        if (i + 2 < line.Length && line[i] is 'E' or 'e' && line[i + 1] is '+' or '-' && char.IsAsciiDigit(line[i + 2]))
        {
            sb.Append('E').Append(line[i + 1]);
            i += 2;
            while (i < line.Length && char.IsAsciiDigit(line[i])) sb.Append(line[i++]);
        }
        if (sb.Length == 0 || !double.TryParse(sb.ToString(), NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v))
            throw Fail.At(file, lineNumber, columnOffset + start + 1, Fail.Quote(line.AsSpan(start, Math.Max(1, Math.Min(line.Length - start, i - start)))),
                "a number", "McDonald & Wilks (1988), Appl. Spectrosc. 42, 151, AFFN/ASDF forms");
        return (sign * v, i);
    }

    private static int? Sqz(char c) => c switch
    {
        '@' => 0,
        >= 'A' and <= 'I' => c - 'A' + 1,
        >= 'a' and <= 'i' => -(c - 'a' + 1),
        _ => null,
    };

    private static int? Dif(char c) => c switch
    {
        '%' => 0,
        >= 'J' and <= 'R' => c - 'J' + 1,
        >= 'j' and <= 'r' => -(c - 'j' + 1),
        _ => null,
    };

    private static int? Dup(char c) => c switch
    {
        >= 'S' and <= 'Z' => c - 'S' + 1,
        's' => 9,
        _ => null,
    };

    public static string Describe(AsdfForms f)
    {
        var names = new List<string>();
        if (f.HasFlag(AsdfForms.Affn)) names.Add("AFFN");
        if (f.HasFlag(AsdfForms.Pac)) names.Add("PAC");
        if (f.HasFlag(AsdfForms.Sqz)) names.Add("SQZ");
        if (f.HasFlag(AsdfForms.Dif)) names.Add("DIF");
        if (f.HasFlag(AsdfForms.Dup)) names.Add("DUP");
        return names.Count == 0 ? "none" : string.Join(", ", names);
    }
}
