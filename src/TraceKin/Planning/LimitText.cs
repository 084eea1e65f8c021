using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Planning;

/// <summary>
/// Reads the planner's limits and guesses as typed on the command line: "SPECIES=LOW..HIGH [UNIT]" (a concentration
/// range; the unit defaults to the series plan's column or mmol/L), "LOW..HIGH" (a temperature range in °C, or K with
/// a trailing K), "NAME=VALUE [UNIT]" (a guess; Km takes a concentration unit, default mol/L). Numbers use a decimal
/// point (the invariant culture), never a decimal comma. Errors name the option.
/// </summary>
public static class LimitText
{
    public static ConcentrationRange Range(string text, Func<string, UnitInfo> defaultUnit)
    {
        const string option = "--range";
        var eq = text.IndexOf('=');
        if (eq <= 0) throw Bad(option, text, "SPECIES=LOW..HIGH with an optional unit, e.g. A=0.1..2 mmol/L");
        var sp = text[..eq].Trim();
        var (lo, hi, unitText) = Span(text[(eq + 1)..], option, text);
        var unit = unitText.Length == 0 ? defaultUnit(sp) : Units.Find(unitText) ?? throw Bad($"--range {sp}", unitText, $"a concentration unit ({string.Join(", ", Units.Examples(Quantity.Concentration))})");
        if (unit.Quantity != Quantity.Concentration) throw Bad($"--range {sp}", unitText, $"a concentration unit ({string.Join(", ", Units.Examples(Quantity.Concentration))})");
        return new ConcentrationRange(sp, unit.ToInternal(lo), unit.ToInternal(hi));
    }

    /// <summary>(low, high) in K.</summary>
    public static (double Low, double High) TemperatureRange(string text)
    {
        const string option = "--temperature-range";
        var (lo, hi, unitText) = Span(text, option, text);
        var unit = unitText.Length == 0 ? Units.Find("°C")! : Units.Find(unitText) ?? throw Bad(option, unitText, "°C or K");
        if (unit.Quantity != Quantity.Temperature) throw Bad(option, unitText, "°C or K");
        return (unit.ToInternal(lo), unit.ToInternal(hi));
    }

    public static (string Name, double Value) Guess(string text)
    {
        const string option = "--guess";
        var eq = text.IndexOf('=');
        if (eq <= 0) throw Bad(option, text, "NAME=VALUE, e.g. Km=2 mmol/L, n(A)=1, Ea=60 (kJ/mol)");
        var name = text[..eq].Trim();
        var rest = text[(eq + 1)..].Trim();
        var (num, unitText) = Number(rest);
        if (!double.TryParse(num, NumberStyles.Float, CultureInfo.InvariantCulture, out var v))
            throw Bad($"--guess {name}", rest, "a number with a decimal point");
        if (unitText.Length > 0)
        {
            if (name != "Km") throw Bad($"--guess {name}", unitText, name == "Ea" ? "no unit (Ea is in kJ/mol)" : "no unit (internal units: mol/L, s)");
            var unit = Units.Find(unitText);
            if (unit is not { Quantity: Quantity.Concentration }) throw Bad("--guess Km", unitText, $"a concentration unit ({string.Join(", ", Units.Examples(Quantity.Concentration))})");
            v = unit.ToInternal(v);
        }
        return (name, v);
    }

    private static (double Low, double High, string Unit) Span(string text, string option, string whole)
    {
        var dots = text.IndexOf("..", StringComparison.Ordinal);
        if (dots < 0) throw Bad(option, whole, "LOW..HIGH, e.g. 0.1..2");
        var loText = text[..dots].Trim();
        var (hiText, unit) = Number(text[(dots + 2)..].Trim());
        if (!double.TryParse(loText, NumberStyles.Float, CultureInfo.InvariantCulture, out var lo) ||
            !double.TryParse(hiText, NumberStyles.Float, CultureInfo.InvariantCulture, out var hi))
            throw Bad(option, whole, "LOW..HIGH with numbers using a decimal point, e.g. 0.1..2");
        return (lo, hi, unit);
    }

    /// <summary>Splits "2.5e-3 mmol/L" into its leading number and the rest.</summary>
    private static (string Number, string Tail) Number(string s)
    {
        var i = 0;
        while (i < s.Length && (char.IsDigit(s[i]) || s[i] is '.' or '-' or '+' || (s[i] is 'e' or 'E' && i > 0 && i + 1 < s.Length && (char.IsDigit(s[i + 1]) || s[i + 1] is '-' or '+')))) i++;
        return (s[..i], s[i..].Trim());
    }

    private static InputException Bad(string option, string found, string expected) =>
        Fail.Setting(PlanningSetup.CommandLine, option, Fail.Quote(found), expected);
}
