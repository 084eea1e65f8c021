using System.Globalization;
using TraceKin.Setup;
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
        var table = SetupTable.FromText(text, file)
            ?? throw Fail.At(file, 1, 1, "an empty file", $"a header line such as: signal,[{species}] (mmol/L)");
        var header = table.Header.Cells.Select(h => h.Trimmed).ToArray();
        var headerLine = string.Join(table.Delimiter, header);
        var headerIndex = table.Header.Line - 1;
        // 1-based character position where header cell c starts.
        int HeaderAt(int c) => table.Header[c].Column;
        var signalCol = Array.FindIndex(header, h => h.StartsWith("signal", StringComparison.OrdinalIgnoreCase));
        var concentrationCol = Array.FindIndex(header, h => h.StartsWith("concentration", StringComparison.OrdinalIgnoreCase));
        if (signalCol < 0 && concentrationCol >= 0)
            return FromWideCsv(table, header, concentrationCol, file, species, others);
        if (signalCol < 0)
            throw Fail.At(file, headerIndex + 1, 1, Fail.Quote(headerLine),
                "a column whose header starts with \"signal\" (one signal per standard), or one \"concentration (unit)\" column with a signal column per species",
                $"e.g. \"signal (mS/cm),[{species}] (mmol/L)\" or \"concentration (mmol/L),{string.Join(",", others.Select(o => o.Species).Prepend(species).Select(sp => sp + " (mS/cm)"))}\"");

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
                    throw Fail.At(file, headerIndex + 1, HeaderAt(c), Fail.Quote(h), $"a concentration unit in the header, e.g. \"[{sp}] (mmol/L)\"");
                return (c, Units.Require(unitText, Quantity.Concentration, file, headerIndex + 1, HeaderAt(c)));
            }
            // A file of one species' standards may head its concentrations plainly: "signal (mS/cm),concentration (mmol/L)".
            if (others.Count == 0 && concentrationCol >= 0)
            {
                var h = header[concentrationCol];
                var unitText = h["concentration".Length..].Trim().Trim('(', ')', '[', ']', ' ');
                if (unitText.Length == 0)
                    throw Fail.At(file, headerIndex + 1, HeaderAt(concentrationCol), Fail.Quote(h), "a concentration unit in the header, e.g. \"concentration (mmol/L)\"");
                return (concentrationCol, Units.Require(unitText, Quantity.Concentration, file, headerIndex + 1, HeaderAt(concentrationCol)));
            }
            throw Fail.At(file, headerIndex + 1, 1, Fail.Quote(headerLine), $"a column \"[{sp}] (unit)\" with the concentration of {sp} in each standard");
        }

        // "signal (mS/cm)", "signal [AU]", "signal/mS/cm" or plain "signal".
        var signalHeader = header[signalCol];
        var signalUnitText = signalHeader[6..].Trim().TrimStart('/').Trim().Trim('(', ')', '[', ']', ' ');
        UnitInfo? signalUnit = null;
        if (signalUnitText.Length > 0)
            signalUnit = Units.Find(signalUnitText) ?? throw Fail.At(file, headerIndex + 1, HeaderAt(signalCol), Fail.Quote(signalHeader),
                "a known signal unit in the header, e.g. \"signal (mS/cm)\", \"signal (AU)\" or \"signal (kPa)\", or plain \"signal\" for the unit of the export's channel");
        var main = Column(species);
        var otherCols = others.Select(o => Column(o.Species)).ToArray();
        var culture = CultureOf(table);
        var signals = new List<double>();
        var conc = new List<double>();
        var otherConc = others.Select(_ => new List<double>()).ToArray();
        foreach (var cells in DataRows(table, file))
        {
            signals.Add(Setup.Plan.Number(cells[signalCol], culture, file));
            conc.Add(main.Unit.ToInternal(Setup.Plan.Number(cells[main.Col], culture, file)));
            for (var k = 0; k < otherCols.Length; k++)
                otherConc[k].Add(otherCols[k].Unit.ToInternal(Setup.Plan.Number(cells[otherCols[k].Col], culture, file)));
        }
        return new CalibrationStandards(signals.ToArray(), conc.ToArray(),
            others.Select((o, k) => new CalibrationOther(o.Species, o.Coefficient, otherConc[k].ToArray())).ToArray()) { SignalUnit = signalUnit };
    }

    /// <summary>
    /// The layout with one <c>concentration (unit)</c> column and one signal column per standard species, headed by the
    /// species' name and the signal unit (<c>NaOH (mS/cm)</c>): each row holds, for every species, the signal of a
    /// standard of that species alone at that concentration. Read as one standard per species and row, the others at
    /// zero, so the multi-species calibration learns each species' response from its own standards.
    /// </summary>
    private static CalibrationStandards FromWideCsv(SetupTable table, string[] header, int concentrationCol,
        string file, string species, IReadOnlyList<(string Species, double Coefficient)> others)
    {
        int HeaderAt(int c) => table.Header[c].Column;
        var line = table.Header.Line;
        var concHeader = header[concentrationCol];
        var concUnitText = concHeader["concentration".Length..].Trim().Trim('(', ')', '[', ']', ' ');
        if (concUnitText.Length == 0)
            throw Fail.At(file, line, HeaderAt(concentrationCol), Fail.Quote(concHeader), "a concentration unit in the header, e.g. \"concentration (mmol/L)\"");
        var concUnit = Units.Require(concUnitText, Quantity.Concentration, file, line, HeaderAt(concentrationCol));
        var names = others.Select(o => o.Species).Prepend(species).ToArray();
        var cols = new int[names.Length];
        var units = new UnitInfo?[names.Length];
        Array.Fill(cols, -1);
        for (var c = 0; c < header.Length; c++)
        {
            if (c == concentrationCol) continue;
            var h = header[c];
            var open = h.IndexOfAny(['(', '[']);
            var name = (open >= 0 ? h[..open] : h).Trim();
            var k = Array.IndexOf(names, name);
            if (k < 0)
                throw Fail.At(file, line, HeaderAt(c), Fail.Quote(h), $"a signal column named by a species of the calibration: {string.Join(", ", names)}",
                    "the followed species is signal.species; others are [[signal.calibration.other]] species");
            if (cols[k] >= 0)
                throw Fail.At(file, line, HeaderAt(c), Fail.Quote(h), $"one signal column for {name} (the first is at column {HeaderAt(cols[k])})");
            cols[k] = c;
            var unitText = open >= 0 ? h[open..].Trim('(', ')', '[', ']', ' ') : "";
            if (unitText.Length > 0)
                units[k] = Units.Find(unitText) ?? throw Fail.At(file, line, HeaderAt(c), Fail.Quote(h),
                    "a known signal unit in the header, e.g. \"" + name + " (mS/cm)\", or none for the unit of the export's channel");
        }
        for (var k = 0; k < names.Length; k++)
            if (cols[k] < 0)
                throw Fail.At(file, line, 1, Fail.Quote(string.Join(",", header)), $"a signal column for {names[k]}, e.g. \"{names[k]} (mS/cm)\"");
        // One unit for all signals: the first column's; the others are converted to it, and must measure the same quantity.
        var unit = units[0];
        for (var k = 1; k < names.Length; k++)
        {
            if ((units[k] is null) != (unit is null))
                throw Fail.At(file, line, HeaderAt(cols[k]), Fail.Quote(header[cols[k]]),
                    $"a signal unit in every species' header or in none (column {HeaderAt(cols[0])} is {Fail.Quote(header[cols[0]])})");
            if (units[k] is { } u && u.Quantity != unit!.Quantity)
                throw Fail.At(file, line, HeaderAt(cols[k]), $"signals in {u.Symbol} ({Units.Describe(u.Quantity)})",
                    $"the quantity of column {HeaderAt(cols[0])}, in {unit.Symbol} ({Units.Describe(unit.Quantity)})");
        }
        var culture = CultureOf(table);
        var signals = new List<double>();
        var conc = new List<double>();
        var otherConc = others.Select(_ => new List<double>()).ToArray();
        foreach (var cells in DataRows(table, file))
        {
            var c = concUnit.ToInternal(Setup.Plan.Number(cells[concentrationCol], culture, file));
            for (var k = 0; k < names.Length; k++)
            {
                var v = Setup.Plan.Number(cells[cols[k]], culture, file);
                signals.Add(units[k] is { } uk ? unit!.FromInternal(uk.ToInternal(v)) : v);
                conc.Add(k == 0 ? c : 0);
                for (var o = 0; o < others.Count; o++) otherConc[o].Add(k == o + 1 ? c : 0);
            }
        }
        return new CalibrationStandards(signals.ToArray(), conc.ToArray(),
            others.Select((o, k) => new CalibrationOther(o.Species, o.Coefficient, otherConc[k].ToArray())).ToArray()) { SignalUnit = unit };
    }

    /// <summary>
    /// Standards kept one species per file: the followed species' file and one per other species, each read on its own
    /// (every standard holds that species alone) and joined, the other species at zero in each file's standards. The
    /// signals are brought into the first file's unit; files in units of different quantities, or a unit in some
    /// headers and not in others, are errors naming both files.
    /// </summary>
    public static CalibrationStandards Join(CalibrationStandards followed, string followedFile, IReadOnlyList<(CalibrationStandards Standards, string File)> perOther,
        IReadOnlyList<(string Species, double Coefficient)> others)
    {
        var unit = followed.SignalUnit;
        var signals = new List<double>(followed.Signals);
        var conc = new List<double>(followed.Concentrations);
        var otherConc = others.Select(_ => Enumerable.Repeat(0.0, followed.Signals.Length).ToList()).ToArray();
        for (var k = 0; k < perOther.Count; k++)
        {
            var (st, f) = perOther[k];
            if ((st.SignalUnit is null) != (unit is null))
                throw Fail.At(f, 1, 1, st.SignalUnit is null ? "a signal header without a unit" : $"signals in {st.SignalUnit.Symbol}",
                    unit is null ? $"no unit, as in {followedFile}" : $"a unit in the signal header, as {followedFile} has ({unit.Symbol})");
            if (st.SignalUnit is { } u && u.Quantity != unit!.Quantity)
                throw Fail.At(f, 1, 1, $"signals in {u.Symbol} ({Units.Describe(u.Quantity)})", $"the quantity of {followedFile}, in {unit.Symbol} ({Units.Describe(unit.Quantity)})");
            foreach (var v in st.Signals) signals.Add(st.SignalUnit is { } su ? unit!.FromInternal(su.ToInternal(v)) : v);
            for (var i = 0; i < st.Signals.Length; i++)
            {
                conc.Add(0);
                for (var o = 0; o < others.Count; o++) otherConc[o].Add(o == k ? st.Concentrations[i] : 0);
            }
        }
        return new CalibrationStandards(signals.ToArray(), conc.ToArray(),
            others.Select((o, k) => new CalibrationOther(o.Species, o.Coefficient, otherConc[k].ToArray())).ToArray()) { SignalUnit = unit };
    }

    /// <summary>The data rows after the header (blank and # lines skipped); a row with another number of cells than
    /// the header is a located error.</summary>
    private static IEnumerable<SetupRecord> DataRows(SetupTable table, string file)
    {
        var cellsPerRow = table.Header.Count;
        foreach (var rec in table.Rows)
        {
            if (rec.Count != cellsPerRow)
            {
                var (line, column) = rec.At(Math.Min(rec.Count, cellsPerRow));
                throw Fail.At(file, line, column, $"{rec.Count} cells", $"{cellsPerRow} cells, as in the header");
            }
            yield return rec;
        }
    }

    /// <summary>With semicolons, a comma in any data cell means decimal commas (a comma-delimited file cannot have them).</summary>
    private static CultureInfo CultureOf(SetupTable table) =>
        table.Delimiter == ';' && table.Rows.Any(r => r.Cells.Any(c => c.Text.Contains(','))) ? CultureInfo.GetCultureInfo("de-DE") : CultureInfo.InvariantCulture;
}
