using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>Another species present in the standards that also contributes to the signal (multi-species calibration).</summary>
/// <param name="Species">Its name, as in plan.csv's [X]0 columns.</param>
/// <param name="Coefficient">Its stoichiometric coefficient ν in the reaction (negative for a reactant).</param>
/// <param name="Concentrations">Its concentration in each standard, mol/L.</param>
public sealed record CalibrationOther(string Species, double Coefficient, double[] Concentrations);

/// <summary>
/// A table of calibration standards: the signal read for each standard and the concentration of the followed
/// species (and of any other contributing species) in it, mol/L.
/// </summary>
public sealed record CalibrationStandards(double[] Signals, double[] Concentrations, IReadOnlyList<CalibrationOther> Others)
{
    /// <summary>The unit the standards' signals are written in (from a header such as <c>signal (mS/cm)</c> or the
    /// <c>signal_unit</c> key), or null when none was given: they are then read in the unit the export gives its
    /// channel. <see cref="Signals"/> stay in this unit; the run's signal is brought into it before the curve is read.</summary>
    public UnitInfo? SignalUnit { get; init; }

    /// <summary>
    /// Standards from CSV text: a column <c>signal</c> and one column <c>[X] (unit)</c> per species (the followed one
    /// and each of <paramref name="others"/>). Comma, semicolon or tab delimited; with semicolons a decimal comma is accepted.
    /// </summary>
    public static CalibrationStandards FromCsvText(string text, string file, string species, IReadOnlyList<(string Species, double Coefficient)> others)
    {
        var lines = text.Replace("\r\n", "\n").Replace('\r', '\n').Split('\n');
        var headerIndex = Array.FindIndex(lines, l => l.Trim().Length > 0 && !l.TrimStart().StartsWith('#'));
        if (headerIndex < 0)
            throw Fail.At(file, 1, 1, "an empty file", $"a header line such as: signal,[{species}] (mmol/L)");
        var headerLine = lines[headerIndex].TrimStart('\uFEFF');
        var delimiter = headerLine.Contains(';') ? ';' : headerLine.Contains('\t') ? '\t' : ',';
        var header = Setup.Plan.Split(headerLine, delimiter).Select(h => h.Trim()).ToArray();
        var signalCol = Array.FindIndex(header, h => h.StartsWith("signal", StringComparison.OrdinalIgnoreCase));
        if (signalCol < 0)
            throw Fail.At(file, headerIndex + 1, 1, Fail.Quote(headerLine), "a column whose header starts with \"signal\"");

        (int Col, UnitInfo Unit) Column(string sp)
        {
            for (var c = 0; c < header.Length; c++)
            {
                var h = header[c];
                if (!h.StartsWith($"[{sp}]", StringComparison.Ordinal)) continue;
                var rest = h[(sp.Length + 2)..].Trim();
                if (rest.StartsWith('0')) rest = rest[1..].Trim();
                var unitText = rest.Trim('(', ')', '[', ']', ' ');
                if (unitText.Length == 0)
                    throw Fail.At(file, headerIndex + 1, c + 1, Fail.Quote(h), $"a concentration unit in the header, e.g. \"[{sp}] (mmol/L)\"");
                return (c, Units.Require(unitText, Quantity.Concentration, file, headerIndex + 1, c + 1));
            }
            throw Fail.At(file, headerIndex + 1, 1, Fail.Quote(headerLine), $"a column \"[{sp}] (unit)\" with the concentration of {sp} in each standard");
        }

        // "signal (mS/cm)", "signal [AU]", "signal/mS/cm" or plain "signal".
        var signalHeader = header[signalCol];
        var signalUnitText = signalHeader[6..].Trim().TrimStart('/').Trim().Trim('(', ')', '[', ']', ' ');
        UnitInfo? signalUnit = null;
        if (signalUnitText.Length > 0)
            signalUnit = Units.Find(signalUnitText) ?? throw Fail.At(file, headerIndex + 1, signalCol + 1, Fail.Quote(signalHeader),
                "a known signal unit in the header, e.g. \"signal (mS/cm)\", \"signal (AU)\" or \"signal (kPa)\", or plain \"signal\" for the unit of the export's channel");
        var main = Column(species);
        var otherCols = others.Select(o => Column(o.Species)).ToArray();
        var culture = delimiter == ';' && lines.Skip(headerIndex + 1).Any(l => l.Contains(',')) ? CultureInfo.GetCultureInfo("de-DE") : CultureInfo.InvariantCulture;
        var signals = new List<double>();
        var conc = new List<double>();
        var otherConc = others.Select(_ => new List<double>()).ToArray();
        for (var i = headerIndex + 1; i < lines.Length; i++)
        {
            if (lines[i].Trim().Length == 0 || lines[i].TrimStart().StartsWith('#')) continue;
            var cells = Setup.Plan.Split(lines[i], delimiter);
            if (cells.Length != header.Length)
                throw Fail.At(file, i + 1, Math.Min(cells.Length, header.Length) + 1, $"{cells.Length} cells", $"{header.Length} cells, as in the header");
            signals.Add(Number(cells[signalCol], culture, file, i + 1, signalCol + 1));
            conc.Add(main.Unit.ToInternal(Number(cells[main.Col], culture, file, i + 1, main.Col + 1)));
            for (var k = 0; k < otherCols.Length; k++)
                otherConc[k].Add(otherCols[k].Unit.ToInternal(Number(cells[otherCols[k].Col], culture, file, i + 1, otherCols[k].Col + 1)));
        }
        return new CalibrationStandards(signals.ToArray(), conc.ToArray(),
            others.Select((o, k) => new CalibrationOther(o.Species, o.Coefficient, otherConc[k].ToArray())).ToArray()) { SignalUnit = signalUnit };
    }

    private static double Number(string cell, CultureInfo culture, string file, int line, int col)
    {
        var t = cell.Trim();
        if (double.TryParse(t, NumberStyles.Float, culture, out var v) && double.IsFinite(v)) return v;
        throw Fail.At(file, line, col, Fail.Quote(t), culture.Equals(CultureInfo.InvariantCulture) ? "a number with a decimal point" : "a number with a decimal comma");
    }
}
