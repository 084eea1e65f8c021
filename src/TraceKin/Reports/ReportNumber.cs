using System.Globalization;

namespace TraceKin.Reports;

/// <summary>
/// How the HTML report prints an estimate with its standard error. The standard error keeps two significant digits and
/// the value is rounded to the same decimal place (JCGM 100:2008, "Guide to the expression of uncertainty in
/// measurement", 7.2.6: at most two significant digits for an uncertainty). Values between 0.001 and 100 000 are written
/// in fixed notation, others as (a ± b) × 10ⁿ with the value's exponent. Tests apply the same rule to summary.json's
/// numbers and compare the text, so the report and the JSON cannot drift apart.
/// </summary>
public static class ReportNumber
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>"0.975 ± 0.015" or "(7.24 ± 0.62) × 10⁻⁶"; without a usable standard error, four significant digits and "± n/a".</summary>
    public static string Measured(double value, double stdError)
    {
        if (!double.IsFinite(value)) return "not available";
        var (exp, decimals) = Layout(value, stdError);
        var scale = Math.Pow(10, exp);
        var v = Fixed(value / scale, decimals);
        var se = double.IsFinite(stdError) && stdError > 0 ? Fixed(stdError / scale, decimals) : "n/a";
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

    private static bool FixedRange(double v) => Math.Abs(v) is >= 1e-3 and < 1e5 || v == 0;

    private static (int Exp, int Decimals) Layout(double value, double stdError)
    {
        var exp = FixedRange(value) ? 0 : (int)Math.Floor(Math.Log10(Math.Abs(value)));
        var scale = Math.Pow(10, exp);
        int decimals;
        if (double.IsFinite(stdError) && stdError > 0)
            decimals = 1 - (int)Math.Floor(Math.Log10(stdError / scale));
        else
        {
            var mag = value == 0 ? 0 : (int)Math.Floor(Math.Log10(Math.Abs(value / scale)));
            decimals = 3 - mag;
        }
        return (exp, Math.Clamp(decimals, 0, 9));
    }

    private static string Fixed(double v, int decimals)
    {
        var s = Math.Round(v, decimals, MidpointRounding.AwayFromZero).ToString("F" + decimals.ToString(Inv), Inv);
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
