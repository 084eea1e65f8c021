namespace TraceKin.Traces;

/// <summary>
/// Microplate well names: one or two row letters and a column number ("A1", "a01", "B12", "AF48"). Leading zeros
/// and letter case do not matter, so "A1", "a1" and "A01" name the same well; the normal form is upper-case letters
/// and the number without zeros ("A1"). Rows run A, B, … Z, AA, AB, … (the usual letter order on plates with more than
/// 26 rows; common practice, no source).
/// </summary>
internal static class WellName
{
    /// <summary>Largest column number accepted (a 1536-well plate has 48 columns).</summary>
    public const int MaxColumn = 48;

    /// <summary>The normal form of a well name, or null when the text is not one.</summary>
    public static string? Normalise(string? text)
    {
        if (text is null) return null;
        var t = text.AsSpan().Trim();
        var letters = 0;
        while (letters < t.Length && char.IsAsciiLetter(t[letters])) letters++;
        if (letters is < 1 or > 2 || letters == t.Length || t.Length - letters > 3) return null;
        var number = 0;
        for (var i = letters; i < t.Length; i++)
        {
            if (!char.IsAsciiDigit(t[i])) return null;
            number = number * 10 + (t[i] - '0');
        }
        if (number is < 1 or > MaxColumn) return null;
        return string.Concat(t[..letters].ToString().ToUpperInvariant(), number.ToString(System.Globalization.CultureInfo.InvariantCulture));
    }

    /// <summary>Row letters of a 0-based row index: 0 → "A", 25 → "Z", 26 → "AA".</summary>
    public static string RowLetters(int index) =>
        index < 26 ? ((char)('A' + index)).ToString() : string.Concat((char)('A' + index / 26 - 1), (char)('A' + index % 26));

    /// <summary>0-based row index of row letters ("A" → 0, "AA" → 26), or -1.</summary>
    public static int RowIndex(string letters)
    {
        var t = letters.Trim().ToUpperInvariant();
        if (t.Length == 1 && t[0] is >= 'A' and <= 'Z') return t[0] - 'A';
        if (t.Length == 2 && t[0] is >= 'A' and <= 'Z' && t[1] is >= 'A' and <= 'Z') return 26 * (t[0] - 'A' + 1) + (t[1] - 'A');
        return -1;
    }

    /// <summary>True when two channel names are the same: equal ignoring case, or the same well ("A1" and "A01").</summary>
    public static bool SameChannel(string a, string b)
    {
        if (string.Equals(a.Trim(), b.Trim(), StringComparison.OrdinalIgnoreCase)) return true;
        var wa = Normalise(a);
        return wa is not null && wa == Normalise(b);
    }
}
