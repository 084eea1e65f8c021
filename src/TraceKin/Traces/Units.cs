namespace TraceKin.Traces;

/// <summary>A unit known to TraceKin: internal value = value·<see cref="Factor"/> + <see cref="Offset"/>.</summary>
public sealed record UnitInfo(string Symbol, Quantity Quantity, double Factor, double Offset = 0)
{
    public double ToInternal(double value) => value * Factor + Offset;
    public double FromInternal(double value) => (value - Offset) / Factor;
}

/// <summary>
/// The unit spellings TraceKin reads, and their factors to the internal units
/// (s, mol/L, K, Pa, L, S/m, cm for path lengths). Exact conversion factors: SI Brochure 9th ed. (BIPM 2019)
/// and CODATA 2018 (standard atmosphere 101 325 Pa; torr = 101 325/760 Pa; psi = 6894.757293168 Pa, NIST SP 811 B.8).
/// </summary>
public static class Units
{
    public const string Second = "s";
    public const string MolPerLitre = "mol/L";
    public const string Kelvin = "K";
    public const string Pascal = "Pa";
    public const string Litre = "L";
    public const string SiemensPerMetre = "S/m";
    public const string Absorbance = "AU";
    public const string Centimetre = "cm";
    public const string RateUnit = "mol/(L·s)";

    private static readonly Dictionary<string, UnitInfo> Table = Build();

    private static Dictionary<string, UnitInfo> Build()
    {
        var t = new Dictionary<string, UnitInfo>(StringComparer.Ordinal);
        void Add(Quantity q, double factor, double offset, params string[] symbols)
        {
            foreach (var s in symbols) t[s] = new UnitInfo(s, q, factor, offset);
        }
        Add(Quantity.Time, 1, 0, "s", "sec", "secs", "second", "seconds");
        Add(Quantity.Time, 1e-3, 0, "ms", "msec");
        Add(Quantity.Time, 60, 0, "min", "mins", "minute", "minutes");
        Add(Quantity.Time, 3600, 0, "h", "hr", "hrs", "hour", "hours");
        Add(Quantity.Concentration, 1, 0, "mol/L", "mol/l", "mol L-1", "mol·L-1", "mol L^-1", "M", "mol/dm3", "mol/dm^3");
        Add(Quantity.Concentration, 1e-3, 0, "mmol/L", "mmol/l", "mmol L-1", "mM", "mol/m3", "mol/m^3");
        foreach (var mu in new[] { "µ", "μ", "u" })
        {
            Add(Quantity.Concentration, 1e-6, 0, $"{mu}mol/L", $"{mu}mol/l", $"{mu}M");
            Add(Quantity.GasVolume, 1e-6, 0, $"{mu}L", $"{mu}l");
            Add(Quantity.Conductivity, 1e-4, 0, $"{mu}S/cm");
            Add(Quantity.Conductivity, 1e-6, 0, $"{mu}S/m");
            Add(Quantity.Time, 1e-6, 0, $"{mu}s");
        }
        Add(Quantity.Concentration, 1e-9, 0, "nmol/L", "nmol/l", "nM");
        Add(Quantity.Temperature, 1, 0, "K", "kelvin");
        Add(Quantity.Temperature, 1, 273.15, "°C", "degC", "C", "℃", "deg C");
        Add(Quantity.Pressure, 1, 0, "Pa");
        Add(Quantity.Pressure, 1e3, 0, "kPa");
        Add(Quantity.Pressure, 1e6, 0, "MPa");
        Add(Quantity.Pressure, 1e5, 0, "bar");
        Add(Quantity.Pressure, 100, 0, "mbar", "hPa");
        Add(Quantity.Pressure, 101325, 0, "atm");
        Add(Quantity.Pressure, 6894.757293168, 0, "psi");
        Add(Quantity.Pressure, 101325.0 / 760, 0, "Torr", "torr");
        Add(Quantity.Pressure, 133.322387415, 0, "mmHg");
        Add(Quantity.GasVolume, 1, 0, "L", "l", "dm3", "dm³");
        Add(Quantity.GasVolume, 1e-3, 0, "mL", "ml", "cm3", "cm³", "cc");
        Add(Quantity.GasVolume, 1e3, 0, "m3");
        Add(Quantity.Conductivity, 1, 0, "S/m");
        Add(Quantity.Conductivity, 0.1, 0, "mS/cm");
        Add(Quantity.Conductivity, 1e-3, 0, "mS/m");
        Add(Quantity.Conductivity, 100, 0, "S/cm");
        Add(Quantity.Absorbance, 1e-3, 0, "mAU", "mOD");
        Add(Quantity.Absorbance, 1, 0, "AU", "au", "A", "OD", "abs", "");
        Add(Quantity.Other, 1, 0, "cm");
        Add(Quantity.Other, 0.1, 0, "mm");
        return t;
    }

    /// <summary>The unit of that spelling, or null when TraceKin does not know it (callers report it, never guess).</summary>
    public static UnitInfo? Find(string symbol) => Table.GetValueOrDefault(symbol.Trim());

    /// <summary>
    /// The unit of that spelling, else the one unit whose spelling matches ignoring case ("KPA" → kPa, as upper-case
    /// formats such as JCAMP-DX write them); null when none or more than one quantity matches.
    /// </summary>
    public static UnitInfo? FindIgnoringCase(string symbol)
    {
        if (Find(symbol) is { } exact) return exact;
        var matches = Table.Where(p => string.Equals(p.Key, symbol.Trim(), StringComparison.OrdinalIgnoreCase)).Select(p => p.Value).ToArray();
        return matches.Length > 0 && matches.All(m => m.Quantity == matches[0].Quantity && m.Factor == matches[0].Factor && m.Offset == matches[0].Offset) ? matches[0] : null;
    }

    /// <summary>The unit of that spelling, which must measure <paramref name="quantity"/>; else a located error.</summary>
    public static UnitInfo Require(string symbol, Quantity quantity, string file, int line, int column)
    {
        var u = Find(symbol);
        if (u is null || (u.Quantity != quantity && !(quantity == Quantity.Other && u.Symbol is "cm" or "mm")))
            throw Fail.At(file, line, column, $"unit {Fail.Quote(symbol)}", $"a {Describe(quantity)} unit ({string.Join(", ", Examples(quantity))})",
                "write the unit in the column header, e.g. \"time (s)\"");
        return u;
    }

    /// <summary>A path length in centimetres from a value and its unit (cm or mm).</summary>
    public static double LengthToCentimetres(double value, string unit) => unit.Trim() switch
    {
        "cm" => value,
        "mm" => value / 10,
        "m" => value * 100,
        _ => double.NaN,
    };

    public static IEnumerable<string> Examples(Quantity q) => q switch
    {
        Quantity.Time => ["s", "ms", "min", "h"],
        Quantity.Concentration => ["mol/L", "mmol/L", "µmol/L", "M", "mM"],
        Quantity.Temperature => ["K", "°C"],
        Quantity.Pressure => ["Pa", "kPa", "bar", "atm", "Torr", "mmHg", "psi"],
        Quantity.GasVolume => ["mL", "L", "µL"],
        Quantity.Conductivity => ["S/m", "mS/cm", "µS/cm"],
        Quantity.Absorbance => ["AU"],
        _ => ["cm", "mm"],
    };

    public static string Describe(Quantity q) => q switch
    {
        Quantity.GasVolume => "volume",
        _ => q.ToString().ToLowerInvariant(),
    };
}
