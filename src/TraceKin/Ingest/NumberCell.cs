using System.Globalization;

namespace TraceKin.Ingest;

internal enum NumberStatus
{
    Ok,
    Empty,
    NotANumber,
    NonFinite,
    /// <summary>The cell is a number written with the other decimal separator (a decimal comma in a decimal-point file or the reverse).</summary>
    OtherSeparator,
}

/// <summary>
/// Parses one numeric cell straight from UTF-8 bytes with an explicit decimal separator; never accepts group
/// separators, so "0,02" in a decimal-point file is an error and never 2.
/// Grammar: [sign] digits [sep digits] [(e|E) [sign] digits], the grammar of NumberStyles.Float.
/// Short numbers take Clinger's exact fast path (W. D. Clinger, "How to read floating point numbers accurately",
/// PLDI 1990): a mantissa below 2^53 times or divided by an exactly representable power of ten (≤ 10^22) is
/// correctly rounded by one IEEE operation. Everything else goes to double.Parse under the invariant culture.
/// </summary>
internal static class NumberCell
{
    private static readonly double[] Pow10 =
    [
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
    ];

    public static NumberStatus TryParse(ReadOnlySpan<byte> s, byte separator, out double value)
    {
        value = 0;
        if (s.IsEmpty) return NumberStatus.Empty;
        var i = 0;
        var negative = false;
        if (s[0] is (byte)'+' or (byte)'-')
        {
            negative = s[0] == (byte)'-';
            i = 1;
        }
        ulong mantissa = 0;
        var significant = 0;
        var digits = 0;
        var exponent = 0;
        while (i < s.Length && (uint)(s[i] - '0') <= 9)
        {
            Accumulate(s[i], ref mantissa, ref significant, ref exponent, fraction: false);
            digits++;
            i++;
        }
        if (i < s.Length && s[i] == separator)
        {
            i++;
            while (i < s.Length && (uint)(s[i] - '0') <= 9)
            {
                Accumulate(s[i], ref mantissa, ref significant, ref exponent, fraction: true);
                digits++;
                i++;
            }
        }
        if (digits == 0) return Classify(s, separator);
        if (i < s.Length && (s[i] | 0x20) == (byte)'e')
        {
            i++;
            var expNegative = false;
            if (i < s.Length && s[i] is (byte)'+' or (byte)'-')
            {
                expNegative = s[i] == (byte)'-';
                i++;
            }
            var expDigits = 0;
            var e = 0;
            while (i < s.Length && (uint)(s[i] - '0') <= 9)
            {
                if (e < 100000) e = e * 10 + (s[i] - '0');
                expDigits++;
                i++;
            }
            if (expDigits == 0) return Classify(s, separator);
            exponent += expNegative ? -e : e;
        }
        if (i != s.Length) return Classify(s, separator);

        if (significant <= 15 && exponent is >= -22 and <= 22)
        {
            double m = mantissa;
            value = exponent >= 0 ? m * Pow10[exponent] : m / Pow10[-exponent];
            if (negative) value = -value;
            return NumberStatus.Ok;
        }
        return Slow(s, separator, out value);
    }

    // Leading zeros carry no information; digits beyond the 19th only scale (they make the slow path run anyway).
    private static void Accumulate(byte digit, ref ulong mantissa, ref int significant, ref int exponent, bool fraction)
    {
        if (mantissa == 0 && digit == (byte)'0')
        {
            if (fraction) exponent--;
            return;
        }
        if (significant < 19)
        {
            mantissa = mantissa * 10 + (ulong)(digit - '0');
            significant++;
            if (fraction) exponent--;
        }
        else
        {
            significant++;
            if (!fraction) exponent++;
        }
    }

    private static NumberStatus Slow(ReadOnlySpan<byte> s, byte separator, out double value)
    {
        Span<char> chars = s.Length <= 256 ? stackalloc char[s.Length] : new char[s.Length];
        for (var k = 0; k < s.Length; k++) chars[k] = s[k] == separator ? '.' : (char)s[k];
        if (!double.TryParse(chars, NumberStyles.Float, CultureInfo.InvariantCulture, out value)) return NumberStatus.NotANumber;
        return double.IsFinite(value) ? NumberStatus.Ok : NumberStatus.NonFinite;
    }

    private static NumberStatus Classify(ReadOnlySpan<byte> s, byte separator)
    {
        var body = s[0] is (byte)'+' or (byte)'-' ? s[1..] : s;
        if (body.Length <= 8)
        {
            Span<char> lower = stackalloc char[body.Length];
            for (var k = 0; k < body.Length; k++) lower[k] = (char)(body[k] | 0x20);
            if (lower is "nan" or "inf" or "infinity" or "1.#inf" or "1.#ind" or "1.#qnan") return NumberStatus.NonFinite;
        }
        var other = separator == (byte)'.' ? (byte)',' : (byte)'.';
        if (s.Contains(other))
        {
            // Would the cell be a number with the other separator?
            Span<byte> copy = s.Length <= 256 ? stackalloc byte[s.Length] : new byte[s.Length];
            s.CopyTo(copy);
            if (copy.Count(other) == 1 && copy.IndexOf(separator) < 0)
            {
                copy[copy.IndexOf(other)] = separator;
                if (TryParse(copy, separator, out _) == NumberStatus.Ok) return NumberStatus.OtherSeparator;
            }
        }
        return NumberStatus.NotANumber;
    }
}
