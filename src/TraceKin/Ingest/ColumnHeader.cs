using System.Globalization;
using System.Text.RegularExpressions;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>What a column of an export is for.</summary>
internal enum ColumnRole
{
    Time,
    /// <summary>A signal channel: absorbance, gas volume, pressure, conductivity (or a concentration probe).</summary>
    Signal,
    /// <summary>An absorbance reference channel (kept among the channels, marked in Detected).</summary>
    Reference,
    /// <summary>A non-signal column kept alongside: temperature, pH.</summary>
    Auxiliary,
    /// <summary>A sample number or a column named in ingest.ignore_columns.</summary>
    Ignored,
}

/// <summary>One column as its header describes it.</summary>
internal sealed record ColumnSpec(int Index, string Header, string Name, ColumnRole Role, Quantity Quantity, UnitInfo? Unit, double? Wavelength)
{
    public string Describe()
    {
        var what = Role switch
        {
            ColumnRole.Time => "time",
            ColumnRole.Ignored => "ignored",
            ColumnRole.Reference => "absorbance reference",
            ColumnRole.Auxiliary => Quantity == Quantity.Other ? Name : Units.Describe(Quantity),
            _ => Units.Describe(Quantity),
        };
        if (Wavelength is { } wl) what += $" at {wl.ToString(CultureInfo.InvariantCulture)} nm";
        if (Unit is { } u && Role != ColumnRole.Ignored) what += $", {(u.Symbol.Length == 0 ? "no unit" : u.Symbol)}";
        return what;
    }
}

/// <summary>
/// Reads a column header: a name and a unit written as "name (unit)", "name [unit]" or "name/unit" (the
/// quantity-calculus form of IUPAC Green Book §1.1), then decides the column's role from the name and the unit.
/// An unknown unit is an error naming it; TraceKin never guesses a unit.
/// </summary>
internal static partial class ColumnHeader
{
    [GeneratedRegex(@"^(?<name>.*?)\s*(?:\((?<unit>[^()]*)\)|\[(?<unit>[^\[\]]*)\])$")]
    private static partial Regex Bracketed();

    [GeneratedRegex(@"^(?:A|Abs|Absorbance|OD)?\s*[@_ ]?\s*(?<wl>\d{3,4}(?:\.\d+)?)\s*(?:nm)?$|^(?:A|Abs|Absorbance|OD)$", RegexOptions.IgnoreCase)]
    private static partial Regex AbsorbanceName();

    [GeneratedRegex(@"(?:^|[\s_\-(])(?:ref|reference)(?:$|[\s_\-)])|^ref(?=\s*\d)", RegexOptions.IgnoreCase)]
    private static partial Regex ReferenceWord();

    private static readonly string[] TimeNames = ["t", "time", "elapsed", "elapsed time", "timestamp", "date time", "datetime", "date/time", "clock", "zeit", "temps"];
    private static readonly string[] IndexNames = ["index", "no", "no.", "#", "n", "nr", "nr.", "point", "sample", "row", "scan"];
    private static readonly string[] TemperatureNames = ["t", "temp", "temp.", "temperature", "theta", "θ"];
    private static readonly string[] VolumeNames = ["v", "vol", "volume", "gas volume", "gas", "v_gas", "evolved gas", "gas evolved"];
    private static readonly string[] PressureNames = ["p", "pressure", "p_abs", "p_gauge", "druck"];
    private static readonly string[] ConductivityNames = ["κ", "kappa", "conductivity", "cond", "cond.", "σ", "sigma", "ec"];

    /// <summary>Splits a header into its name and the unit text (null when no unit is written).</summary>
    public static (string Name, string? Unit) Split(string header)
    {
        var h = header.Trim();
        var m = Bracketed().Match(h);
        if (m.Success && m.Groups["name"].Value.Trim().Length > 0) return (m.Groups["name"].Value.Trim(), m.Groups["unit"].Value.Trim());
        var slash = h.IndexOf('/');
        if (slash > 0 && slash < h.Length - 1 && !Contains(TimeNames, h)) return (h[..slash].Trim(), h[(slash + 1)..].Trim());
        return (h, null);
    }

    /// <summary>A header that names time ("t (s)", "Time/ms", "timestamp"); "T (°C)" is a temperature, not a time.</summary>
    public static bool IsTimeName(string header)
    {
        var (name, unit) = Split(header);
        if (unit is not null && Units.Find(unit) is { } u && u.Quantity != Quantity.Time) return false;
        return Contains(TimeNames, name) || name.StartsWith("time", StringComparison.OrdinalIgnoreCase);
    }

    /// <summary>The role, quantity and unit of a non-time column, or a located error.</summary>
    public static ColumnSpec Classify(int index, string header, IngestSettings settings, string file, int line, int column)
    {
        var (name, unitText) = Split(header);
        if (header.Trim().Length == 0)
            throw Fail.At(file, line, column, "an empty column header", "a column name such as \"A520\" or \"V (mL)\"", "name every column, or drop the empty one");
        if (settings.IgnoreColumns.Any(c => string.Equals(c.Trim(), header.Trim(), StringComparison.OrdinalIgnoreCase) || string.Equals(c.Trim(), name, StringComparison.OrdinalIgnoreCase)))
            return new ColumnSpec(index, header, name, ColumnRole.Ignored, Quantity.Other, null, null);
        if (unitText is null && Contains(IndexNames, name))
            return new ColumnSpec(index, header, name, ColumnRole.Ignored, Quantity.Other, null, null);

        UnitInfo Need(Quantity q, string? fallback)
        {
            var text = unitText ?? fallback;
            if (text is null)
                throw Fail.At(file, line, column, Fail.Quote(header), $"a {Units.Describe(q)} column with its unit, e.g. \"{name} ({Units.Examples(q).First()})\"",
                    "write the unit in brackets after the name");
            if (Units.Find(text) is null)
                throw Fail.At(file, line, column, $"the unknown unit {Fail.Quote(text)}", $"a {Units.Describe(q)} unit ({string.Join(", ", Units.Examples(q))})",
                    "TraceKin does not guess units; write one it knows");
            return Units.Require(text, q, file, line, column);
        }

        // Absorbance: "A520", "A@520nm", "Abs 430 nm", "absorbance", optionally marked as a reference channel.
        var isReference = ReferenceWord().IsMatch(name);
        var core = isReference ? ReferenceWord().Replace(name, " ").Trim(' ', '_', '-') : name;
        var abs = AbsorbanceName().Match(core);
        if ((abs.Success && (abs.Groups["wl"].Success ? !IsBareNumberName(core) || isReference : true)) || (isReference && core.Length == 0))
        {
            double? wl = abs.Success && abs.Groups["wl"].Success ? double.Parse(abs.Groups["wl"].Value, NumberStyles.Float, CultureInfo.InvariantCulture) : null;
            var unit = Need(Quantity.Absorbance, "AU");
            return new ColumnSpec(index, header, header.Trim(), isReference ? ColumnRole.Reference : ColumnRole.Signal, Quantity.Absorbance, unit, wl);
        }
        if (name.Equals("pH", StringComparison.OrdinalIgnoreCase))
        {
            if (unitText is { Length: > 0 })
                throw Fail.At(file, line, column, $"pH with the unit {Fail.Quote(unitText)}", "pH without a unit");
            return new ColumnSpec(index, header, "pH", ColumnRole.Auxiliary, Quantity.Other, new UnitInfo("", Quantity.Other, 1), null);
        }
        if (Contains(TemperatureNames, name))
            return new ColumnSpec(index, header, header.Trim(), ColumnRole.Auxiliary, Quantity.Temperature, Need(Quantity.Temperature, null), null);
        if (Contains(VolumeNames, name))
            return new ColumnSpec(index, header, header.Trim(), ColumnRole.Signal, Quantity.GasVolume, Need(Quantity.GasVolume, null), null);
        if (Contains(PressureNames, name))
            return new ColumnSpec(index, header, header.Trim(), ColumnRole.Signal, Quantity.Pressure, Need(Quantity.Pressure, null), null);
        if (Contains(ConductivityNames, name))
            return new ColumnSpec(index, header, header.Trim(), ColumnRole.Signal, Quantity.Conductivity, Need(Quantity.Conductivity, null), null);

        // A microplate well ("A1", "B07", "H12"): one channel per well, named in its normal form so A01 and A1 agree.
        // Without a unit its readings are in ingest.well_unit (absorbance, AU, by default).
        if (WellName.Normalise(name) is { } well)
        {
            var wellUnitText = unitText ?? settings.WellUnit;
            var wu = Units.Find(wellUnitText)
                ?? throw Fail.At(file, line, column, $"the unknown unit {Fail.Quote(wellUnitText)} for well {Fail.Quote(header)}", "a signal unit TraceKin knows, e.g. AU, mS/cm, kPa",
                    unitText is null ? "check ingest.well_unit" : "TraceKin does not guess units");
            if (wu.Quantity is not (Quantity.Absorbance or Quantity.GasVolume or Quantity.Pressure or Quantity.Conductivity or Quantity.Concentration))
                throw Fail.At(file, line, column, $"well {Fail.Quote(header)} in {Fail.Quote(wellUnitText)}", "a signal unit (absorbance, volume, pressure, conductivity, concentration)",
                    unitText is null ? "check ingest.well_unit" : "write the signal's unit after the well name");
            return new ColumnSpec(index, header, well, ColumnRole.Signal, wu.Quantity, wu, null);
        }

        if (unitText is null)
            throw Fail.At(file, line, column, Fail.Quote(header), "an absorbance column (\"A520\", \"Abs 430 nm\") or a column with its unit, e.g. \"V (mL)\", \"p [kPa]\", \"κ (mS/cm)\"",
                "add the unit to the header, or list the column in ingest.ignore_columns");
        var u = Units.Find(unitText)
            ?? throw Fail.At(file, line, column, $"the unknown unit {Fail.Quote(unitText)} in {Fail.Quote(header)}", "a unit TraceKin knows (see docs/formats.md, \"Instrument exports\")",
                "TraceKin does not guess units");
        return u.Quantity switch
        {
            Quantity.Absorbance or Quantity.GasVolume or Quantity.Pressure or Quantity.Conductivity or Quantity.Concentration =>
                new ColumnSpec(index, header, header.Trim(), ColumnRole.Signal, u.Quantity, u, null),
            Quantity.Temperature => new ColumnSpec(index, header, header.Trim(), ColumnRole.Auxiliary, u.Quantity, u, null),
            _ => throw Fail.At(file, line, column, $"{Fail.Quote(header)} in {Fail.Quote(unitText)}",
                "a signal (absorbance, volume, pressure, conductivity) or temperature column", "list the column in ingest.ignore_columns to skip it"),
        };
    }

    // "520" alone is a wavelength only when marked as absorbance or reference; a bare number header is not a name.
    private static bool IsBareNumberName(string core) => core.Length > 0 && char.IsDigit(core[0]);

    private static bool Contains(string[] names, string name)
    {
        foreach (var n in names)
            if (string.Equals(n, name.Trim(), StringComparison.OrdinalIgnoreCase)) return true;
        return false;
    }
}
