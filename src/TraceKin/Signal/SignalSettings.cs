using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// The [signal] table of series.toml: what the signal is, which species it follows and how to turn it into
/// that species' concentration. All values are held in internal units (cm, L, Pa, K, mol/L, S/m); every key,
/// its unit key and its default are listed in docs/formats.md, section "[signal]".
/// </summary>
public sealed record SignalSettings
{
    /// <summary>The kinds of signal TraceKin converts: the names of <see cref="SignalKinds.All"/>.</summary>
    public static IReadOnlyList<string> Kinds => SignalKinds.Names;

    /// <summary>series.toml's file name, for errors found while converting.</summary>
    public string Source { get; init; } = "series.toml";

    /// <summary>One of <see cref="Kinds"/>.</summary>
    public string Kind { get; init; } = "absorbance";
    /// <summary>Column header of the signal channel; null when the export has only one.</summary>
    public string? Channel { get; init; }
    /// <summary>The species the signal follows, as named in plan.csv's [X]0 columns.</summary>
    public string Species { get; init; } = "A";
    /// <summary>Stoichiometric coefficient ν of that species (negative for a reactant): rate = (1/ν)·d[X]/dt.</summary>
    public double Coefficient { get; init; } = -1;

    // ---- absorbance ----
    /// <summary>Molar absorptivity ε in L/(mol·cm).</summary>
    public double? MolarAbsorptivity { get; init; }
    /// <summary>Standard uncertainty of ε, L/(mol·cm).</summary>
    public double MolarAbsorptivityU { get; init; }
    /// <summary>Optical path length l in cm.</summary>
    public double PathLength { get; init; } = 1.0;
    /// <summary>Standard uncertainty of l, cm.</summary>
    public double PathLengthU { get; init; }
    /// <summary>Absorbance of the blank (everything but the absorbing species), subtracted before Beer–Lambert.</summary>
    public double Blank { get; init; }
    /// <summary>A channel subtracted point by point from the signal channel (a non-absorbing reference wavelength).</summary>
    public string? ReferenceChannel { get; init; }
    /// <summary>Absorbance above which a warning says the reading may be outside the linear range.</summary>
    public double LinearLimit { get; init; } = 1.5;
    /// <summary>Other species that absorb at the signal channel.</summary>
    public IReadOnlyList<Absorber> Absorbers { get; init; } = [];
    /// <summary>A second analytical wavelength converted on its own, to check the first.</summary>
    public string? CheckChannel { get; init; }
    public double? CheckMolarAbsorptivity { get; init; }
    public double CheckBlank { get; init; }
    /// <summary>Largest accepted difference between the two wavelengths' concentrations, relative to the concentration range.</summary>
    public double CheckTolerance { get; init; } = 0.05;

    // ---- calibration ----
    /// <summary>[signal.calibration], or null when the conversion uses physics alone.</summary>
    public CalibrationSettings? Calibration { get; init; }

    // ---- gas and pressure ----
    /// <summary>Temperature of the gas or cell, K; null = the run's temperature from the plan.</summary>
    public double? Temperature { get; init; }
    /// <summary>Standard uncertainty of the temperature, K.</summary>
    public double TemperatureU { get; init; }
    /// <summary>Barometric pressure, Pa.</summary>
    public double? BarometricPressure { get; init; }
    public double BarometricPressureU { get; init; }
    /// <summary>True when the gas is collected dry (no water-vapour correction).</summary>
    public bool DryGas { get; init; }
    /// <summary>Moles of gas formed per unit extent of reaction (positive).</summary>
    public double GasCoefficient { get; init; } = 1;
    /// <summary>Volume of the reacting solution, L.</summary>
    public double? SolutionVolume { get; init; }
    public double SolutionVolumeU { get; init; }
    /// <summary>Gas volume read before any gas formed, L.</summary>
    public double ZeroOffset { get; init; }
    /// <summary>True when the collector was zeroed after mixing: the gas lost before its zero is extrapolated (<see cref="GasZeroExtrapolation"/>).</summary>
    public bool ZeroedAfterMixing { get; init; }
    /// <summary>Change in moles of gas per unit extent (pressure kind).</summary>
    public double? GasMoleChange { get; init; }
    /// <summary>Total pressure at mixing, Pa; null = the first sample.</summary>
    public double? InitialPressure { get; init; }
    /// <summary>Mole fraction of the followed species in the gas at mixing, used when the plan gives no [X]0.</summary>
    public double? InitialMoleFraction { get; init; }

    // ---- conductivity ----
    /// <summary>κ at mixing (at the reference temperature), S/m; null = the first sample.</summary>
    public double? KappaInitial { get; init; }
    public double KappaInitialU { get; init; }
    /// <summary>κ at complete reaction (at the reference temperature), S/m.</summary>
    public double? KappaFinal { get; init; }
    public double KappaFinalU { get; init; }
    /// <summary>Linear temperature-compensation coefficient α, 1/K; null = no compensation.</summary>
    public double? TemperatureCoefficient { get; init; }
    public double TemperatureCoefficientU { get; init; }
    /// <summary>Reference temperature of the compensation, K.</summary>
    public double ReferenceTemperature { get; init; } = 298.15;

    // ---- kinds that keep their keys in a record of their own ----
    /// <summary>
    /// The settings of kinds whose keys live in a record of their own rather than in properties here, by kind name
    /// (set by the kind's <see cref="ISignalKind.Read"/> with <see cref="WithOptions"/>, read with <see cref="Options{T}"/>).
    /// Internal, so the report's settings table (which lists public properties) shows such keys as series.toml gave them.
    /// </summary>
    internal IReadOnlyDictionary<string, object> KindOptions { get; init; } = new Dictionary<string, object>();

    /// <summary>These settings with <paramref name="options"/> as the settings of kind <paramref name="kind"/>.</summary>
    public SignalSettings WithOptions(string kind, object options) =>
        this with { KindOptions = new Dictionary<string, object>(KindOptions, StringComparer.Ordinal) { [kind] = options } };

    /// <summary>The settings record of kind <paramref name="kind"/>, or null when it has none.</summary>
    public T? Options<T>(string kind) where T : class => KindOptions.TryGetValue(kind, out var o) ? o as T : null;

    public static SignalSettings FromToml(TomlSection s)
    {
        var d = new SignalSettings();
        var kind = s.Choice("kind", d.Kind, [.. Kinds]);
        var species = s.String("species", d.Species);
        var coefficient = s.Double("coefficient", d.Coefficient);
        if (coefficient == 0)
            throw Fail.Setting(s.File, s.KeyName("coefficient"), "0", "a non-zero stoichiometric coefficient (negative for a reactant, positive for a product)");

        var table = new SignalTable(s);
        var settings = d with
        {
            Source = s.File,
            Kind = kind,
            Channel = s.String("channel"),
            Species = species,
            Coefficient = coefficient,
        };
        // Each kind reads the keys it introduces (all kinds, in registry order, so every key is read and checked
        // whatever the chosen kind); the calibration table, shared by several kinds, last.
        foreach (var k in SignalKinds.All) settings = k.Read(table, settings);
        settings = settings with { Calibration = s.Has("calibration") ? CalibrationSettings.FromToml(s.Section("calibration"), species) : null };
        settings.Validate(s);
        return settings;
    }

    /// <summary>Checks that need several keys at once: keys that contradict each other, then the chosen kind's own checks.</summary>
    private void Validate(TomlSection s)
    {
        if (InitialMoleFraction is > 1)
            throw Fail.Setting(s.File, s.KeyName("initial_mole_fraction"), InitialMoleFraction.Value.ToString(CultureInfo.InvariantCulture), "a mole fraction between 0 and 1");
        if (ZeroedAfterMixing && Kind != "gas_volume")
            throw Fail.Setting(s.File, s.KeyName("zeroed_after_mixing"), $"zeroed_after_mixing with kind = \"{Kind}\"", "kind = \"gas_volume\"",
                "only a gas collector is zeroed; leave the key out for other kinds");
        SignalKinds.Find(Kind)?.Validate(this, s);
    }

    /// <summary>
    /// These settings with everything they name in other files read: the calibration CSV, relative to
    /// <paramref name="seriesDirectory"/>. Call once per series before converting runs.
    /// </summary>
    public SignalSettings WithFilesFrom(string seriesDirectory)
    {
        if (Calibration is not { File: { } file, Standards: null } cal) return this;
        var path = Path.Combine(seriesDirectory, file);
        if (!System.IO.File.Exists(path))
            throw Fail.Setting(Source, "signal.calibration.file", Fail.Quote(file), "a CSV of standards in the series folder", $"no file {file} was found beside {Source}");
        CalibrationStandards standards;
        if (cal.OtherFiles.Count == 0)
            standards = CalibrationStandards.FromCsvText(System.IO.File.ReadAllText(path), file, Species, cal.OtherSpecies);
        else
        {
            // One species per file: each file read on its own, then joined.
            var own = CalibrationStandards.FromCsvText(System.IO.File.ReadAllText(path), file, Species, []);
            var perOther = new List<(CalibrationStandards, string)>();
            for (var k = 0; k < cal.OtherFiles.Count; k++)
            {
                var otherFile = cal.OtherFiles[k];
                var otherPath = Path.Combine(seriesDirectory, otherFile);
                if (!System.IO.File.Exists(otherPath))
                    throw Fail.Setting(Source, $"signal.calibration.other[{k}].file", Fail.Quote(otherFile), "a CSV of standards in the series folder", $"no file {otherFile} was found beside {Source}");
                perOther.Add((CalibrationStandards.FromCsvText(System.IO.File.ReadAllText(otherPath), otherFile, cal.OtherSpecies[k].Species, []), otherFile));
            }
            standards = CalibrationStandards.Join(own, file, perOther, cal.OtherSpecies);
        }
        return this with { Calibration = cal with { Standards = standards, Curve = CalibrationCurve.FromStandards(standards, cal.Model, file) } };
    }

    internal static UnitInfo UnitOf(TomlSection s, string key, string fallback, Quantity quantity)
    {
        var text = s.String(key, fallback);
        var u = Units.Find(text);
        if (u is null || u.Quantity != quantity)
            throw Fail.Setting(s.File, s.KeyName(key), Fail.Quote(text), $"a {Units.Describe(quantity)} unit ({string.Join(", ", Units.Examples(quantity))})");
        return u;
    }

    internal static double? NonNegative(TomlSection s, string key)
    {
        var v = s.Double(key);
        if (v is < 0) throw Fail.Setting(s.File, s.KeyName(key), v.Value.ToString(CultureInfo.InvariantCulture), "a number ≥ 0");
        return v;
    }

    /// <summary>Sub-tables are not checked by SeriesConfig; a misspelt key in one must still be an error.</summary>
    internal static void RejectUnknown(TomlSection s)
    {
        foreach (var k in s.UnreadKeys)
            throw Fail.Setting(s.File, s.KeyName(k), "a key TraceKin does not know", "one of the keys listed in docs/formats.md", "check the spelling");
    }
}
