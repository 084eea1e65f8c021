using System.Runtime.CompilerServices;

namespace TraceKin.Ingest;

/// <summary>
/// The exact fast path for a plain decimal number read from UTF-8 bytes: [sign] digits [separator digits]
/// [(e|E) [sign] digits], at most 19 digits in all, no blanks, no group separators. The digits form an integer
/// mantissa m and the number is m·10^q. When m ≤ 2^53 and |q| ≤ 22, both m and 10^|q| are exactly representable
/// doubles, so one IEEE 754 multiplication or division gives the correctly rounded value (W. D. Clinger, "How to read
/// floating point numbers accurately", PLDI 1990, the "fast path"; IEEE 754 requires correctly
/// rounded conversion and arithmetic) — the same double that double.Parse returns, bit for bit. Anything else makes
/// <see cref="TryRead"/> return false, and the caller uses the general path (<see cref="NumberCell"/>).
/// </summary>
internal static class PlainNumber
{
    /// <summary>2^53: every integer up to it is exactly a double.</summary>
    private const ulong ExactLimit = 1UL << 53;

    private static readonly double[] Pow10 =
    [
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
    ];

    /// <summary>
    /// Reads a plain number that starts at <paramref name="i"/> and ends at the first byte that cannot continue it
    /// (left in <paramref name="i"/>; the caller checks that it is a delimiter or the end). False when there is no number
    /// there or it is outside the fast path; <paramref name="i"/> is then meaningless.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool TryRead(ReadOnlySpan<byte> text, ref int i, byte separator, out double value)
    {
        value = 0;
        var p = i;
        var len = text.Length;
        var negative = false;
        if (p < len && text[p] is (byte)'-' or (byte)'+')
        {
            negative = text[p] == (byte)'-';
            p++;
        }
        ulong mantissa = 0;
        var start = p;
        uint d;
        while (p < len && (d = (uint)(text[p] - '0')) <= 9)
        {
            mantissa = mantissa * 10 + d;
            p++;
        }
        var digits = p - start;
        var exponent = 0;
        if (p < len && text[p] == separator)
        {
            var fraction = ++p;
            while (p < len && (d = (uint)(text[p] - '0')) <= 9)
            {
                mantissa = mantissa * 10 + d;
                p++;
            }
            exponent = fraction - p;
            digits += p - fraction;
        }
        // 19 digits cannot overflow 64 bits (10^19 − 1 < 2^64); an empty number is no number
        if (digits is 0 or > 19) return false;
        if (p < len && (text[p] | 0x20) == (byte)'e')
        {
            p++;
            var expNegative = false;
            if (p < len && text[p] is (byte)'-' or (byte)'+')
            {
                expNegative = text[p] == (byte)'-';
                p++;
            }
            var e = 0;
            var expStart = p;
            while (p < len && (d = (uint)(text[p] - '0')) <= 9 && p - expStart < 4)
            {
                e = e * 10 + (int)d;
                p++;
            }
            if (p == expStart || (p < len && (uint)(text[p] - '0') <= 9)) return false;
            exponent += expNegative ? -e : e;
        }
        if (mantissa > ExactLimit || exponent is < -22 or > 22) return false;
        double m = mantissa;
        value = exponent >= 0 ? m * Pow10[exponent] : m / Pow10[-exponent];
        if (negative) value = -value;
        i = p;
        return true;
    }
}
