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
    /// <summary>The kinds of signal TraceKin converts.</summary>
    public static IReadOnlyList<string> Kinds { get; } = ["absorbance", "calibrated", "gas_volume", "pressure", "conductivity"];

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

    public static SignalSettings FromToml(TomlSection s)
    {
        var d = new SignalSettings();
        var kind = s.Choice("kind", d.Kind, [.. Kinds]);
        var species = s.String("species", d.Species);
        var coefficient = s.Double("coefficient", d.Coefficient);
        if (coefficient == 0)
            throw Fail.Setting(s.File, s.KeyName("coefficient"), "0", "a non-zero stoichiometric coefficient (negative for a reactant, positive for a product)");

        var lengthUnit = s.Choice("path_length_unit", "cm", "cm", "mm");
        double Cm(double v) => lengthUnit == "mm" ? v / 10 : v;
        var temperatureUnit = UnitOf(s, "temperature_unit", "K", Quantity.Temperature);
        var pressureUnit = UnitOf(s, "pressure_unit", "Pa", Quantity.Pressure);
        var volumeUnit = UnitOf(s, "volume_unit", "mL", Quantity.GasVolume);
        var conductivityUnit = UnitOf(s, "conductivity_unit", "S/m", Quantity.Conductivity);

        double? Temperature(string key)
        {
            if (s.Double(key) is not { } v) return null;
            var k = temperatureUnit.ToInternal(v);
            if (!(k > 0 && k < 1000))
                throw Fail.Setting(s.File, s.KeyName(key), $"{v.ToString(CultureInfo.InvariantCulture)} {temperatureUnit.Symbol}", "a temperature between 0 K and 1000 K",
                    "set temperature_unit = \"°C\" for Celsius");
            return k;
        }

        var absorbers = new List<Absorber>();
        foreach (var a in s.Sections("absorber"))
        {
            var sp = a.String("species") ?? throw Fail.Setting(s.File, a.KeyName("species"), "nothing", "the name of the other absorbing species, as in plan.csv");
            var eps = a.Positive("molar_absorptivity") ?? throw Fail.Setting(s.File, a.KeyName("molar_absorptivity"), "nothing", $"the molar absorptivity of {sp} in L/(mol·cm)");
            var nu = a.Double("coefficient") ?? throw Fail.Setting(s.File, a.KeyName("coefficient"), "nothing", $"the stoichiometric coefficient of {sp} (negative for a reactant)");
            absorbers.Add(new Absorber(sp, eps, nu, NonNegative(a, "molar_absorptivity_u") ?? 0));
            RejectUnknown(a);
        }

        var settings = d with
        {
            Source = s.File,
            Kind = kind,
            Channel = s.String("channel"),
            Species = species,
            Coefficient = coefficient,
            MolarAbsorptivity = s.Positive("molar_absorptivity"),
            MolarAbsorptivityU = NonNegative(s, "molar_absorptivity_u") ?? 0,
            PathLength = Cm(s.Positive("path_length") ?? d.PathLength),
            PathLengthU = Cm(NonNegative(s, "path_length_u") ?? 0),
            Blank = s.Double("blank", 0),
            ReferenceChannel = s.String("reference_channel"),
            LinearLimit = s.Positive("linear_limit") ?? d.LinearLimit,
            Absorbers = absorbers,
            CheckChannel = s.String("check_channel"),
            CheckMolarAbsorptivity = s.Positive("check_molar_absorptivity"),
            CheckBlank = s.Double("check_blank", 0),
            CheckTolerance = s.Positive("check_tolerance") ?? d.CheckTolerance,
            Temperature = Temperature("temperature"),
            TemperatureU = (NonNegative(s, "temperature_u") ?? 0) * temperatureUnit.Factor,
            BarometricPressure = s.Positive("barometric_pressure") is { } pb ? pressureUnit.ToInternal(pb) : null,
            BarometricPressureU = (NonNegative(s, "barometric_pressure_u") ?? 0) * pressureUnit.Factor,
            DryGas = s.Bool("dry_gas") ?? false,
            GasCoefficient = s.Positive("gas_coefficient") ?? d.GasCoefficient,
            SolutionVolume = s.Positive("solution_volume") is { } sv ? volumeUnit.ToInternal(sv) : null,
            SolutionVolumeU = (NonNegative(s, "solution_volume_u") ?? 0) * volumeUnit.Factor,
            ZeroOffset = volumeUnit.ToInternal(s.Double("zero_offset", 0)),
            ZeroedAfterMixing = s.Bool("zeroed_after_mixing") ?? false,
            GasMoleChange = s.Double("gas_mole_change"),
            InitialPressure = s.Positive("initial_pressure") is { } p0 ? pressureUnit.ToInternal(p0) : null,
            InitialMoleFraction = NonNegative(s, "initial_mole_fraction"),
            KappaInitial = s.Double("kappa_initial") is { } k0 ? conductivityUnit.ToInternal(k0) : null,
            KappaInitialU = (NonNegative(s, "kappa_initial_u") ?? 0) * conductivityUnit.Factor,
            KappaFinal = s.Double("kappa_final") is { } k1 ? conductivityUnit.ToInternal(k1) : null,
            KappaFinalU = (NonNegative(s, "kappa_final_u") ?? 0) * conductivityUnit.Factor,
            TemperatureCoefficient = s.Double("temperature_coefficient"),
            TemperatureCoefficientU = NonNegative(s, "temperature_coefficient_u") ?? 0,
            ReferenceTemperature = Temperature("reference_temperature") ?? d.ReferenceTemperature,
            Calibration = s.Has("calibration") ? CalibrationSettings.FromToml(s.Section("calibration"), species) : null,
        };
        settings.Validate(s);
        return settings;
    }

    /// <summary>Checks that need several keys at once: each kind's required keys, and keys that contradict each other.</summary>
    private void Validate(TomlSection s)
    {
        Exception Missing(string key, string expected, string hint = "") => Fail.Setting(s.File, s.KeyName(key), "nothing", expected, hint);
        if (InitialMoleFraction is > 1)
            throw Fail.Setting(s.File, s.KeyName("initial_mole_fraction"), InitialMoleFraction.Value.ToString(CultureInfo.InvariantCulture), "a mole fraction between 0 and 1");
        if (ZeroedAfterMixing && Kind != "gas_volume")
            throw Fail.Setting(s.File, s.KeyName("zeroed_after_mixing"), $"zeroed_after_mixing with kind = \"{Kind}\"", "kind = \"gas_volume\"",
                "only a gas collector is zeroed; leave the key out for other kinds");
        switch (Kind)
        {
            case "absorbance":
                if (MolarAbsorptivity is not null && Calibration is not null)
                    throw Fail.Setting(s.File, s.KeyName("molar_absorptivity"), "both a molar absorptivity and [signal.calibration]", "one of them");
                if (Absorbers.Count > 0 && Calibration is not null)
                    throw Fail.Setting(s.File, s.KeyName("absorber"), "other absorbers with [signal.calibration]", "other species in [[signal.calibration.other]] instead",
                        "a calibration learns every species' contribution from its standards");
                if (CheckChannel is not null && CheckMolarAbsorptivity is null)
                    throw Missing("check_molar_absorptivity", "the molar absorptivity at the check channel, in L/(mol·cm)");
                break;
            case "calibrated":
                if (Calibration is null) throw Missing("calibration", "a [signal.calibration] table of standards for kind = \"calibrated\"");
                break;
            case "gas_volume" or "pressure" when Calibration is not null:
                throw Fail.Setting(s.File, s.KeyName("calibration"), $"a calibration table with kind = \"{Kind}\"", "no calibration: this kind is converted from physical laws",
                    "use kind = \"calibrated\" to read the signal through standards instead");
            case "gas_volume" when ZeroedAfterMixing && s.Double("zero_offset") is not null:
                throw Fail.Setting(s.File, s.KeyName("zero_offset"), "a zero offset with zeroed_after_mixing = true", "one of them",
                    "a collector zeroed after mixing has its offset extrapolated from the trace");
            // gas_volume's barometric pressure and solution volume may come per run from plan.csv: SeriesCheck asks for them.
            case "pressure":
                if (GasMoleChange is null) throw Missing("gas_mole_change", "the change in moles of gas per unit extent of reaction, e.g. 1 for A(g) → 2 B(g)");
                if (GasMoleChange == 0)
                    throw Fail.Setting(s.File, s.KeyName("gas_mole_change"), "0", "a non-zero change in moles of gas", "a reaction that keeps the number of gas moles cannot be followed by its pressure");
                break;
            case "conductivity":
                if (Calibration is null && KappaFinal is null)
                    throw Missing("kappa_final", "the conductivity at complete reaction (or a [signal.calibration] table)");
                if (Calibration is null && Coefficient > 0)
                    throw Fail.Setting(s.File, s.KeyName("coefficient"), Coefficient.ToString(CultureInfo.InvariantCulture),
                        "a negative coefficient: the two-point conductivity conversion follows the limiting reactant");
                if (KappaInitial is { } k0 && KappaFinal is { } k1 && k0 == k1)
                    throw Fail.Setting(s.File, s.KeyName("kappa_final"), "the same value as kappa_initial", "a conductivity at complete reaction that differs from the one at mixing");
                if (TemperatureCoefficient is { } a && !(Math.Abs(a) < 1))
                    throw Fail.Setting(s.File, s.KeyName("temperature_coefficient"), a.ToString(CultureInfo.InvariantCulture), "a coefficient per kelvin, e.g. 0.02 (2 %/K)");
                break;
        }
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
