using System.Globalization;

namespace TraceKin.Reports;

/// <summary>
/// The one way TraceKin prints a number for a person to read: the report, the console and log lines, and the plot
/// titles and legends. The standard error keeps two significant digits and the value is rounded to the same decimal
/// place (JCGM 100:2008, "Guide to the expression of uncertainty in measurement", 7.2.6: at most two significant
/// digits for an uncertainty). Numbers whose size (the larger of |value| and its error) lies between 0.001 and
/// 100 000 are written in fixed notation, others as (a ± b) × 10ⁿ with that size's exponent. Always the invariant
/// culture (a point for decimals, no group separator) and U+2212 for minus, whatever the machine's culture. The full
/// precision stays in summary.json and the CSV tables. Tests apply the same rule to summary.json's numbers and compare
/// the text, so the report and the JSON cannot drift apart.
/// </summary>
public static class ReportNumber
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>
    /// "0.975 ± 0.015" or "(7.24 ± 0.62) × 10⁻⁶"; a standard error of exactly zero prints as "± 0" and one that is
    /// missing or not finite as "± n/a", each with the value to four significant digits.
    /// </summary>
    public static string Measured(double value, double stdError)
    {
        if (!double.IsFinite(value)) return "not available";
        var (exp, decimals) = Layout(value, stdError);
        var scale = Math.Pow(10, exp);
        var v = Fixed(value / scale, decimals);
        var se = HasError(stdError) ? Fixed(stdError / scale, decimals) : stdError == 0 ? "0" : "n/a";
        // An error below the last digit a double can show is printed on its own rather than as a row of zeros.
        if (HasError(stdError) && se.Trim('0', '.').Length == 0) se = Plain(stdError, 2);
        return exp == 0 ? $"{v} ± {se}" : $"({v} ± {se}) × 10{Superscript(exp)}";
    }

    /// <summary>A 95 % interval printed at the same exponent and decimal place as <see cref="Measured"/> prints the value.</summary>
    public static string Interval(double value, double stdError, double low, double high)
    {
        if (!double.IsFinite(value) || !double.IsFinite(low) || !double.IsFinite(high)) return "not available";
        var (exp, decimals) = Layout(value, stdError);
        var scale = Math.Pow(10, exp);
        var body = $"{Fixed(low / scale, decimals)} to {Fixed(high / scale, decimals)}";
        return exp == 0 ? body : $"({body}) × 10{Superscript(exp)}";
    }

    /// <summary>"value ± SE unit (95 % CI low to high)": one estimate in a line of text (console, log, plot legend).</summary>
    public static string Estimate(double value, double stdError, string? unit, double low, double high)
    {
        var text = Measured(value, stdError) + (string.IsNullOrEmpty(unit) ? "" : " " + unit);
        return double.IsFinite(low) && double.IsFinite(high) ? $"{text} (95 % CI {Interval(value, stdError, low, high)})" : text;
    }

    /// <summary>
    /// Whether an estimate of a quantity that is a size (k, Ea, Vmax, Km, A) is a result at all: its 95 % interval is
    /// finite and no wider than the value itself. Wider, and the data do not fix even the value's size; the report says
    /// "not determined" instead of printing it as a result. (A rule of our own, not from a standard.)
    /// </summary>
    public static bool Determined(double value, double low, double high) =>
        double.IsFinite(value) && double.IsFinite(low) && double.IsFinite(high) && high - low <= Math.Abs(value);

    /// <summary>"name = value ± SE unit (95 % CI …)", or "name not determined (95 % CI … unit)" when <see cref="Determined"/> says no.</summary>
    public static string Result(string name, double value, double stdError, string? unit, double low, double high) =>
        Determined(value, low, high) ? $"{name} = {Estimate(value, stdError, unit, low, high)}"
        : double.IsFinite(value) && double.IsFinite(low) && double.IsFinite(high)
            ? $"{name} not determined (95 % CI {Interval(value, stdError, low, high)}{(string.IsNullOrEmpty(unit) ? "" : " " + unit)})"
            : $"{name} not determined (no 95 % interval)";

    /// <summary>A plain number to four significant digits (conditions, window limits), in the same fixed/power style.</summary>
    public static string Plain(double? value, int significant = 4)
    {
        if (value is not { } v || !double.IsFinite(v)) return "—";
        if (v == 0) return "0";
        var exp = FixedRange(v) ? 0 : (int)Math.Floor(Math.Log10(Math.Abs(v)));
        var scaled = v / Math.Pow(10, exp);
        var mag = (int)Math.Floor(Math.Log10(Math.Abs(scaled)));
        var decimals = Math.Clamp(significant - 1 - mag, 0, 9);
        var text = Fixed(scaled, decimals);
        return exp == 0 ? text : $"{text} × 10{Superscript(exp)}";
    }

    private static bool HasError(double se) => double.IsFinite(se) && se > 0;

    private static bool FixedRange(double v) => Math.Abs(v) is >= 1e-3 and < 1e5 || v == 0;

    /// <summary>
    /// The power of ten the pair is written with and the decimal place (negative: tens, hundreds…) both are rounded to.
    /// The size that sets the exponent is the larger of |value| and the error, so 0 ± 2×10⁻⁹ keeps its digits.
    /// </summary>
    private static (int Exp, int Decimals) Layout(double value, double stdError)
    {
        var size = Math.Max(Math.Abs(value), HasError(stdError) ? stdError : 0);
        var exp = FixedRange(size) ? 0 : (int)Math.Floor(Math.Log10(size));
        var scale = Math.Pow(10, exp);
        var valueMag = value == 0 ? 0 : (int)Math.Floor(Math.Log10(Math.Abs(value / scale)));
        var decimals = HasError(stdError) ? 1 - (int)Math.Floor(Math.Log10(stdError / scale)) : 3 - valueMag;
        // No more than 15 significant digits of the value (a double holds about 16), and no more than 15 decimals.
        return (exp, Math.Clamp(decimals, -15, Math.Clamp(14 - valueMag, 0, 15)));
    }

    private static string Fixed(double v, int decimals)
    {
        string s;
        if (decimals >= 0)
            s = Math.Round(v, decimals, MidpointRounding.AwayFromZero).ToString("F" + decimals.ToString(Inv), Inv);
        else
        {
            // Rounded to tens, hundreds…: 12 345 ± 678 prints as 12 350 ± 680 (without the space).
            var unit = Math.Pow(10, -decimals);
            s = (Math.Round(v / unit, MidpointRounding.AwayFromZero) * unit).ToString("F0", Inv);
        }
        // "-0.00" reads as a sign that is not there.
        if (s.StartsWith('-') && s.Trim('-', '0', '.').Length == 0) s = s[1..];
        return s.Replace('-', '−');
    }

    private static string Superscript(int exp)
    {
        const string digits = "⁰¹²³⁴⁵⁶⁷⁸⁹";
        var s = Math.Abs(exp).ToString(Inv);
        var chars = s.Select(ch => digits[ch - '0']);
        return (exp < 0 ? "⁻" : "") + new string(chars.ToArray());
    }
}
