using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>Signal (internal unit) → concentration (mol/L) for every point of a trace.</summary>
public delegate void ConcentrationsFromSignal(ReadOnlySpan<double> signal, Span<double> concentration);

/// <summary>
/// One run's conversion, both ways: signal → concentration of the followed species (for analysis) and
/// concentration → signal (for simulation), with the conversion's own uncertainty. Built from the [signal] settings,
/// the run's plan row and, when given, its export (which supplies "first sample" defaults).
/// </summary>
public sealed record SignalModel
{
    /// <summary>What the signal is: the quantity and internal unit the channel must carry.</summary>
    public required Quantity SignalQuantity { get; init; }
    public required string SignalUnit { get; init; }
    /// <summary>Signal (internal unit) and temperature (K) → concentration (mol/L).</summary>
    public required Func<double, double, double> ToConcentration { get; init; }
    /// <summary>
    /// <see cref="ToConcentration"/> for a whole trace at once, when the conversion does not depend on temperature and
    /// has a faster form than a call per point (same doubles); else null.
    /// </summary>
    public ConcentrationsFromSignal? ToConcentrations { get; init; }
    /// <summary>Concentration (mol/L) and temperature (K) → signal (internal unit).</summary>
    public required Func<double, double, double> ToSignal { get; init; }
    /// <summary>Relative standard uncertainty of the concentration scale (d c/d signal), GUM first order.</summary>
    public required double RelativeSystematicUncertainty { get; init; }
    /// <summary>Each uncertain input's relative contribution to <see cref="RelativeSystematicUncertainty"/>.</summary>
    public required IReadOnlyList<KeyValuePair<string, double>> Budget { get; init; }
    /// <summary>Constants and parameters the conversion used, as "name" → "value unit (source)".</summary>
    public required IReadOnlyList<KeyValuePair<string, string>> ConstantsUsed { get; init; }
    /// <summary>The run's temperature, K, when known (the default for points without their own reading).</summary>
    public double? Temperature { get; init; }
    /// <summary>The calibration curve read backwards, when the conversion uses one.</summary>
    public CalibrationCurve? Curve { get; init; }
    /// <summary>True when each point's own temperature matters (conductivity with temperature compensation).</summary>
    public bool UsesPointTemperature { get; init; }
    /// <summary>Signal and temperature → the value the calibration curve is read at (compensated conductivity; else the signal).</summary>
    public Func<double, double, double> CurveInput { get; init; } = (y, _) => y;

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    private static string G(double v) => v.ToString("G10", Inv);

    /// <summary>The conversion for one run. <paramref name="export"/> may be null (simulation): then no default comes from its first sample.</summary>
    public static SignalModel For(SignalSettings settings, PlanRow row, RunExport? export = null)
    {
        // plan.csv columns such as "barometric_pressure (kPa)" give this run its own parameters.
        var s = RunConditions.Apply(settings, row);
        string From(string name, string key) => RunConditions.Source(row, name, key);
        var initials = row.InitialConcentrations;
        double InitialOrZero(string sp) => initials.TryGetValue(sp, out var c) ? c : 0;
        double RequiredInitial()
        {
            if (initials.TryGetValue(s.Species, out var c)) return c;
            if (s.Coefficient > 0) return 0;
            throw Fail.Setting(s.Source, "signal.species", $"no [{s.Species}]0 for run {Fail.Quote(row.Run)}",
                $"the initial concentration of {s.Species} in plan.csv (line {row.Line})", $"add a column \"[{s.Species}]0 (mmol/L)\" to plan.csv");
        }
        double? first = export is null ? null : FirstOf(export, s);

        switch (s.Kind)
        {
            case "absorbance" when s.Calibration is null:
            {
                if (s.MolarAbsorptivity is not { } eps)
                    throw Fail.Setting(s.Source, "signal.molar_absorptivity", "nothing", "the molar absorptivity of the followed species in L/(mol·cm)",
                        "or give a [signal.calibration] table of standards");
                var bl = new BeerLambert(eps, s.PathLength, s.Blank, s.Coefficient, s.Absorbers.Count > 0 ? RequiredInitial() : 0, s.Absorbers, s.MolarAbsorptivityU, s.PathLengthU)
                {
                    OthersInitial = s.Absorbers.ToDictionary(a => a.Species, a => InitialOrZero(a.Species)),
                };
                if (bl.Response.SignalPerExtent == 0)
                    throw Fail.Setting(s.Source, "signal.absorber", "absorbers whose changes cancel", "a net change of absorbance with the reaction");
                var (rel, budget) = UncertaintyBudget.Relative(bl.Scale, bl.UncertainInputs());
                var constants = new List<KeyValuePair<string, string>>
                {
                    new("ε", $"{G(eps)} L/(mol·cm) (signal.molar_absorptivity)"),
                    new("l", $"{G(s.PathLength)} cm ({From("path_length", "signal.path_length")})"),
                    new("blank", $"{G(s.Blank)} AU ({From("blank", "signal.blank")})"),
                };
                constants.AddRange(s.Absorbers.Select(a => new KeyValuePair<string, string>($"ε({a.Species})", $"{G(a.MolarAbsorptivity)} L/(mol·cm), ν = {G(a.Coefficient)} (signal.absorber)")));
                // BeerLambert.Response builds the linear response afresh on every call; build it once per run.
                var response = bl.Response;
                return new SignalModel
                {
                    SignalQuantity = Quantity.Absorbance, SignalUnit = Units.Absorbance,
                    ToConcentration = (a, _) => response.ToConcentration(a), ToSignal = (c, _) => response.ToSignal(c),
                    ToConcentrations = response.ToConcentrations,
                    RelativeSystematicUncertainty = rel, Budget = budget, ConstantsUsed = constants, Temperature = row.TemperatureK,
                };
            }
            case "absorbance" or "calibrated" or "conductivity" when s.Calibration is not null:
            {
                var cal = s.Calibration;
                var curve = cal.Curve ?? throw Fail.Setting(s.Source, "signal.calibration.file", Fail.Quote(cal.File ?? ""), "standards read from the series folder",
                    "the calibration file has not been read; analyse the series folder rather than a single file");
                curve = curve with
                {
                    Coefficient = s.Coefficient,
                    Initial = cal.OtherSpecies.Count > 0 ? RequiredInitial() : 0,
                    OthersInitial = cal.OtherSpecies.ToDictionary(o => o.Species, o => InitialOrZero(o.Species)),
                };
                // The run's signal arrives in internal units (S/m, Pa, …); the standards are in their own unit (declared,
                // else the unit the export wrote its channel in), so the signal is brought into that unit first.
                var stdUnit = StandardsUnit(s, cal, export);
                var comp = s.Kind == "conductivity" && s.TemperatureCoefficient is { } alpha
                    ? new ConductivityConversion(0, 1, 1, alpha, s.ReferenceTemperature) { TemperatureCoefficientU = s.TemperatureCoefficientU }
                    : null;
                var temperature = comp is null ? row.TemperatureK : RunTemperature(s, row);
                // The scale is taken where the run spends its time: the middle of the standards' concentration range.
                var mid = 0.5 * (curve.ConcentrationMin + curve.ConcentrationMax);
                var extra = new List<KeyValuePair<string, double>> { new("signal.calibration", curve.RelativeScaleUncertainty(mid)) };
                var inputs = comp is null || temperature is not { } tk ? [] : new[]
                {
                    new UncertainInput("signal.temperature_coefficient", comp.TemperatureCoefficient!.Value, s.TemperatureCoefficientU,
                        a => 1 / (1 + a * (tk - s.ReferenceTemperature))),
                };
                var scaleAtRun = comp is null || temperature is not { } t0 ? 1 : 1 / comp.TemperatureFactor(t0);
                var (rel, budget) = UncertaintyBudget.Relative(scaleAtRun, inputs, extra);
                var (q, unit) = QuantityOf(s.Kind, export, s);
                var constants = new List<KeyValuePair<string, string>> { new("calibration", curve.Describe()) };
                if (comp is not null)
                    constants.Add(new("α", $"{G(comp.TemperatureCoefficient!.Value)} 1/K to {G(s.ReferenceTemperature)} K (signal.temperature_coefficient)"));
                return new SignalModel
                {
                    SignalQuantity = q, SignalUnit = unit, Curve = curve,
                    ToConcentration = (y, t) => curve.ToConcentration(stdUnit.FromInternal(comp is null ? y : comp.Compensate(y, t))),
                    ToSignal = (c, t) => comp is null ? stdUnit.ToInternal(curve.ToSignal(c)) : stdUnit.ToInternal(curve.ToSignal(c)) * comp.TemperatureFactor(t),
                    RelativeSystematicUncertainty = rel, Budget = budget, ConstantsUsed = constants,
                    Temperature = temperature, UsesPointTemperature = comp is not null,
                    CurveInput = (y, t) => stdUnit.FromInternal(comp is null ? y : comp.Compensate(y, t)),
                };
            }
            case "gas_volume":
            {
                var t = RunTemperature(s, row);
                var pb = s.BarometricPressure ?? throw Missing(s, "barometric_pressure", "the barometric pressure, or a plan.csv column \"barometric_pressure (kPa)\"");
                if (!s.DryGas)
                {
                    if (!(t >= WaterVapour.MinimumTemperature && t <= 373.15))
                        throw Fail.Setting(s.Source, "signal.temperature", $"{G(t)} K", "a temperature of liquid water, 273.15 K to 373.15 K, for a gas collected over water",
                            TemperatureHint(s, row));
                    var pw = WaterVapour.SaturationPressure(t);
                    if (pb <= pw)
                        throw Fail.Setting(s.Source, "signal.barometric_pressure", $"{G(pb)} Pa ({From("barometric_pressure", "signal.barometric_pressure")})",
                            $"a pressure above the water vapour pressure at {G(t)} K ({pw.ToString("F1", Inv)} Pa, IAPWS-IF97)", "check pressure_unit (default Pa)");
                }
                // A collector zeroed after mixing: the reading at mixing is extrapolated from the early samples (negative:
                // the gas lost before the zero) and used as the zero offset. Without an export (simulation) the writer
                // zeroes the trace at its first sample instead.
                var zero = s.ZeroOffset;
                var zeroSource = From("zero_offset", "signal.zero_offset");
                if (s.ZeroedAfterMixing && export is not null)
                {
                    var (z, zse, points) = GasZeroExtrapolation.AtMixing(export, s.Channel, s.Source);
                    zero = z;
                    zeroSource = $"extrapolated to mixing (t = 0) by a quadratic over the first {points} samples, standard error {G(zse)} L; signal.zeroed_after_mixing";
                }
                var gas = new GasOverWater(pb, t, s.SolutionVolume ?? throw Missing(s, "solution_volume", "the volume of the reacting solution, or a plan.csv column \"solution_volume (mL)\""), s.GasCoefficient, s.Coefficient, RequiredInitial(), s.DryGas, zero)
                {
                    BarometricPressureU = s.BarometricPressureU, TemperatureU = s.TemperatureU, SolutionVolumeU = s.SolutionVolumeU,
                };
                var (rel, budget) = UncertaintyBudget.Relative(gas.Scale, gas.UncertainInputs());
                var constants = new List<KeyValuePair<string, string>>
                {
                    new("R", $"{G(PhysicalConstants.GasConstant)} J/(mol·K) (CODATA 2018)"),
                    new("p_bar", $"{G(pb)} Pa ({From("barometric_pressure", "signal.barometric_pressure")})"),
                    new("T", $"{G(t)} K ({TemperatureSource(settings, row)})"),
                    new("p_H2O", s.DryGas ? "0 Pa (signal.dry_gas)" : $"{G(gas.WaterVapourPressure)} Pa (IAPWS-IF97 Eq. 30)"),
                    new("V_solution", $"{G(gas.SolutionVolume)} L ({From("solution_volume", "signal.solution_volume")})"),
                    new("ν_gas", $"{G(s.GasCoefficient)} (signal.gas_coefficient)"),
                };
                if (zero != 0 || row.Conditions.ContainsKey("zero_offset") || s.ZeroedAfterMixing)
                    constants.Add(new("V_zero", $"{G(zero)} L ({zeroSource})"));
                return new SignalModel
                {
                    SignalQuantity = Quantity.GasVolume, SignalUnit = Units.Litre,
                    ToConcentration = (v, _) => gas.ToConcentration(v), ToSignal = (c, _) => gas.ToVolume(c),
                    RelativeSystematicUncertainty = rel, Budget = budget, ConstantsUsed = constants, Temperature = t,
                };
            }
            case "pressure":
            {
                var t = RunTemperature(s, row);
                double p0Partial;
                double p0;
                var planned = PlannedInitialPressure(row);
                var p0Source = s.InitialPressure is not null ? "signal.initial_pressure" : planned is not null ? "plan" : first is not null ? "first sample" : "plan [X]0";
                if (initials.TryGetValue(s.Species, out var c0))
                {
                    // A plan that gives [X]0 as a partial pressure gives p_X0 itself; a concentration becomes [X]0·R·T.
                    p0Partial = row.InitialPressures.TryGetValue(s.Species, out var pPlan) ? pPlan : c0 * 1000 * PhysicalConstants.GasConstant * t;
                    p0 = s.InitialPressure ?? planned ?? first ?? p0Partial / (s.InitialMoleFraction is > 0 ? s.InitialMoleFraction.Value : 1);
                }
                else
                {
                    p0 = s.InitialPressure ?? planned ?? first ?? throw Fail.Setting(s.Source, "signal.initial_pressure", "nothing",
                        $"the total pressure at mixing, a \"p0 (kPa)\" column in plan.csv, or [{s.Species}]0 in plan.csv");
                    p0Partial = (s.InitialMoleFraction ?? (s.Coefficient < 0 ? 1 : 0)) * p0;
                }
                var pc = new PressureConversion(t, s.GasMoleChange is { } dn and not 0 ? dn : throw Missing(s, "gas_mole_change", "a non-zero change in moles of gas per unit extent"), s.Coefficient, p0, p0Partial) { TemperatureU = s.TemperatureU };
                var (rel, budget) = UncertaintyBudget.Relative(pc.Scale, pc.UncertainInputs());
                var constants = new List<KeyValuePair<string, string>>
                {
                    new("R", $"{G(PhysicalConstants.GasConstant)} J/(mol·K) (CODATA 2018)"),
                    new("T", $"{G(t)} K ({TemperatureSource(settings, row)})"),
                    new("p0", $"{G(p0)} Pa ({p0Source})"),
                    new($"p({s.Species})0", $"{G(p0Partial)} Pa{(row.InitialPressures.ContainsKey(s.Species) ? " (plan, as a partial pressure)" : "")}"),
                    new("Δν_gas", $"{G(pc.GasMoleChange)} (signal.gas_mole_change)"),
                };
                return new SignalModel
                {
                    SignalQuantity = Quantity.Pressure, SignalUnit = Units.Pascal,
                    ToConcentration = (p, _) => pc.ToConcentration(p), ToSignal = (c, _) => pc.ToPressure(c),
                    RelativeSystematicUncertainty = rel, Budget = budget, ConstantsUsed = constants, Temperature = t,
                };
            }
            case "conductivity":
            {
                double? temperature = s.TemperatureCoefficient is null ? row.TemperatureK : RunTemperature(s, row);
                var k0 = s.KappaInitial ?? first ?? throw Fail.Setting(s.Source, "signal.kappa_initial", "nothing", "the conductivity at mixing (S/m unless conductivity_unit says otherwise)");
                // A first sample read at the run's temperature is referred to the reference temperature like every other reading.
                if (s.KappaInitial is null && s.TemperatureCoefficient is { } a0 && temperature is { } tt) k0 /= 1 + a0 * (tt - s.ReferenceTemperature);
                var kf = s.KappaFinal ?? throw Missing(s, "kappa_final", "the conductivity at complete reaction");
                if (k0 == kf)
                    throw Fail.Setting(s.Source, "signal.kappa_final", $"{G(kf)} S/m, the same as the conductivity at mixing", "a conductivity at complete reaction that differs from the one at mixing");
                var cc = new ConductivityConversion(k0, kf, RequiredInitial(), s.TemperatureCoefficient, s.ReferenceTemperature)
                {
                    KappaInitialU = s.KappaInitialU, KappaFinalU = s.KappaFinalU, TemperatureCoefficientU = s.TemperatureCoefficientU,
                };
                var tRef = temperature ?? s.ReferenceTemperature;
                var (rel, budget) = UncertaintyBudget.Relative(cc.Scale(tRef), cc.UncertainInputs(tRef));
                var constants = new List<KeyValuePair<string, string>>
                {
                    new("κ0", $"{G(k0)} S/m ({(s.KappaInitial is null ? "first sample" : "signal.kappa_initial")})"),
                    new("κ∞", $"{G(kf)} S/m (signal.kappa_final)"),
                };
                if (s.TemperatureCoefficient is { } alpha)
                    constants.Add(new("α", $"{G(alpha)} 1/K to {G(s.ReferenceTemperature)} K (signal.temperature_coefficient)"));
                return new SignalModel
                {
                    SignalQuantity = Quantity.Conductivity, SignalUnit = Units.SiemensPerMetre,
                    ToConcentration = cc.ToConcentration, ToSignal = cc.ToConductivity,
                    RelativeSystematicUncertainty = rel, Budget = budget, ConstantsUsed = constants,
                    Temperature = temperature, UsesPointTemperature = s.TemperatureCoefficient is not null,
                };
            }
            case "calibrated":
                throw Missing(s, "calibration", "a [signal.calibration] table of standards for kind = \"calibrated\"");
            default:
                throw Fail.Setting(s.Source, "signal.kind", Fail.Quote(s.Kind), $"one of: {string.Join(", ", SignalSettings.Kinds)}");
        }
    }

    private static InputException Missing(SignalSettings s, string key, string expected) =>
        Fail.Setting(s.Source, $"signal.{key}", "nothing", expected, "see docs/formats.md, section [signal]");

    /// <summary>The gas or cell temperature: signal.temperature, else the plan's; range-checked.</summary>
    private static double RunTemperature(SignalSettings s, PlanRow row)
    {
        var t = s.Temperature ?? row.TemperatureK ?? throw Fail.Setting(s.Source, "signal.temperature", "nothing",
            $"the temperature of run {Fail.Quote(row.Run)}", "add a \"temperature (°C)\" column to plan.csv or set signal.temperature");
        if (!(t > 0 && t < 1000))
            throw Fail.Setting(s.Source, "signal.temperature", $"{G(t)} K", "a temperature between 0 K and 1000 K", TemperatureHint(s, row));
        return t;
    }

    /// <summary>Where a gas or cell temperature came from: the plan's gas_temperature cell, signal.temperature, or the run's temperature.</summary>
    private static string TemperatureSource(SignalSettings series, PlanRow row) =>
        row.Conditions.TryGetValue("gas_temperature", out var c) ? c.Source : series.Temperature is not null ? "signal.temperature" : "plan";

    private static string TemperatureHint(SignalSettings s, PlanRow row) =>
        s.Temperature is null ? $"the temperature comes from plan.csv line {row.Line}" : "check signal.temperature and temperature_unit";

    /// <summary>A plan.csv column "p0 (unit)" (any pressure unit): the run's total pressure at mixing.</summary>
    private static double? PlannedInitialPressure(PlanRow row)
    {
        foreach (var (header, text) in row.Extra)
        {
            var m = System.Text.RegularExpressions.Regex.Match(header, @"^p0\s*[\(\[](?<unit>[^\)\]]+)[\)\]]$", System.Text.RegularExpressions.RegexOptions.IgnoreCase);
            if (!m.Success || text.Trim().Length == 0) continue;
            if (Units.Find(m.Groups["unit"].Value) is not { Quantity: Quantity.Pressure } unit)
                throw Fail.At("plan.csv", row.Line, 0, Fail.Quote(header), "a pressure unit in the p0 column header, e.g. \"p0 (kPa)\"");
            var t = text.Trim();
            var culture = t.Contains(',') && !t.Contains('.') ? CultureInfo.GetCultureInfo("de-DE") : Inv;
            if (!double.TryParse(t, NumberStyles.Float, culture, out var v) || !(v > 0))
                throw Fail.At("plan.csv", row.Line, 0, Fail.Quote(t), $"a positive number in column {Fail.Quote(header)}");
            return unit.ToInternal(v);
        }
        return null;
    }

    private static double? FirstOf(RunExport export, SignalSettings s)
    {
        var ch = export.Channel(s.Channel);
        return ch.Count > 0 ? ch.Values[0] : null;
    }

    /// <summary>
    /// The unit the calibration standards' signals are in: the declared one (file header or signal_unit), else the
    /// unit the export wrote the channel in, else the internal unit. A declared unit of another quantity than the
    /// channel's is an error naming both.
    /// </summary>
    private static UnitInfo StandardsUnit(SignalSettings s, CalibrationSettings cal, RunExport? export)
    {
        var identity = new UnitInfo("", Quantity.Other, 1);
        var channel = export?.Channel(s.Channel);
        var declared = cal.Standards?.SignalUnit;
        if (declared is not null)
        {
            if (channel is not null && channel.Quantity != Quantity.Other && declared.Quantity != channel.Quantity)
                throw Fail.Setting(s.Source, cal.File is null ? "signal.calibration.signal_unit" : $"signal.calibration.file ({cal.File})",
                    $"standards in {declared.Symbol} ({Units.Describe(declared.Quantity)})",
                    $"a unit of the channel's quantity: channel {Fail.Quote(channel.Name)} is in {channel.SourceUnit ?? channel.Unit} ({Units.Describe(channel.Quantity)})");
            return declared.Quantity == Quantity.Other || (channel is not null && channel.Quantity == Quantity.Other) ? identity : declared;
        }
        if (channel is { SourceUnit: { Length: > 0 } su } && Units.Find(su) is { } fromExport && fromExport.Quantity == channel.Quantity && channel.Quantity != Quantity.Other)
            return fromExport;
        return identity;
    }

    private static (Quantity, string) QuantityOf(string kind, RunExport? export, SignalSettings s) => kind switch
    {
        "absorbance" => (Quantity.Absorbance, Units.Absorbance),
        "conductivity" => (Quantity.Conductivity, Units.SiemensPerMetre),
        _ => export is null ? (Quantity.Other, "") : (export.Channel(s.Channel).Quantity, export.Channel(s.Channel).Unit),
    };
}
