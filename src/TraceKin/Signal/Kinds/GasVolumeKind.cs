using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>kind = "gas_volume": gas collected (over water or dry) read as a volume, converted by <see cref="GasOverWater"/>.</summary>
internal sealed class GasVolumeKind : ISignalKind
{
    public string Name => "gas_volume";

    public (string Header, string Unit) SampleColumn => ("volume (mL)", Units.Litre);

    /// <summary>Also reads the gas or cell temperature (signal.temperature, temperature_u), which pressure and conductivity use too.</summary>
    public SignalSettings Read(SignalTable t, SignalSettings d)
    {
        var s = t.Section;
        return d with
        {
            Temperature = t.Temperature("temperature"),
            TemperatureU = (t.NonNegative("temperature_u") ?? 0) * t.TemperatureUnit.Factor,
            BarometricPressure = s.Positive("barometric_pressure") is { } pb ? t.PressureUnit.ToInternal(pb) : null,
            BarometricPressureU = (t.NonNegative("barometric_pressure_u") ?? 0) * t.PressureUnit.Factor,
            DryGas = s.Bool("dry_gas") ?? false,
            GasCoefficient = s.Positive("gas_coefficient") ?? d.GasCoefficient,
            SolutionVolume = s.Positive("solution_volume") is { } sv ? t.VolumeUnit.ToInternal(sv) : null,
            SolutionVolumeU = (t.NonNegative("solution_volume_u") ?? 0) * t.VolumeUnit.Factor,
            ZeroOffset = t.VolumeUnit.ToInternal(s.Double("zero_offset", 0)),
            ZeroedAfterMixing = s.Bool("zeroed_after_mixing") ?? false,
        };
    }

    public void Validate(SignalSettings x, TomlSection s)
    {
        if (x.Calibration is not null)
            throw Fail.Setting(s.File, s.KeyName("calibration"), $"a calibration table with kind = \"{x.Kind}\"", "no calibration: this kind is converted from physical laws",
                "use kind = \"calibrated\" to read the signal through standards instead");
        if (x.ZeroedAfterMixing && s.Double("zero_offset") is not null)
            throw Fail.Setting(s.File, s.KeyName("zero_offset"), "a zero offset with zeroed_after_mixing = true", "one of them",
                "a collector zeroed after mixing has its offset extrapolated from the trace");
        // The barometric pressure and solution volume may come per run from plan.csv: SeriesCheck asks for them.
    }

    public IReadOnlyList<string> PlanConditions(SignalSettings s) => s.ZeroedAfterMixing
        ? ["barometric_pressure", "solution_volume", "gas_temperature"]
        : ["barometric_pressure", "solution_volume", "zero_offset", "gas_temperature"];

    public SignalModel Build(SignalRun run)
    {
        var s = run.Settings;
        var row = run.Row;
        var export = run.Export;
        var G = SignalRun.G;
        var t = run.RunTemperature();
        var pb = s.BarometricPressure ?? throw run.Missing("barometric_pressure", "the barometric pressure, or a plan.csv column \"barometric_pressure (kPa)\"");
        if (!s.DryGas)
        {
            if (!(t >= WaterVapour.MinimumTemperature && t <= 373.15))
                throw Fail.Setting(s.Source, "signal.temperature", $"{G(t)} K", "a temperature of liquid water, 273.15 K to 373.15 K, for a gas collected over water",
                    run.TemperatureHint());
            var pw = WaterVapour.SaturationPressure(t);
            if (pb <= pw)
                throw Fail.Setting(s.Source, "signal.barometric_pressure", $"{G(pb)} Pa ({run.From("barometric_pressure", "signal.barometric_pressure")})",
                    $"a pressure above the water vapour pressure at {G(t)} K ({pw.ToString("F1", CultureInfo.InvariantCulture)} Pa, IAPWS-IF97)", "check pressure_unit (default Pa)");
        }
        // A collector zeroed after mixing: the reading at mixing is extrapolated from the early samples (negative:
        // the gas lost before the zero) and used as the zero offset. Without an export (simulation) the writer
        // zeroes the trace at its first sample instead.
        var zero = s.ZeroOffset;
        var zeroSource = run.From("zero_offset", "signal.zero_offset");
        if (s.ZeroedAfterMixing && export is not null)
        {
            var (z, zse, points) = GasZeroExtrapolation.AtMixing(export, s.Channel, s.Source);
            zero = z;
            zeroSource = $"extrapolated to mixing (t = 0) by a quadratic over the first {points} samples, standard error {G(zse)} L; signal.zeroed_after_mixing";
        }
        var gas = new GasOverWater(pb, t, s.SolutionVolume ?? throw run.Missing("solution_volume", "the volume of the reacting solution, or a plan.csv column \"solution_volume (mL)\""), s.GasCoefficient, s.Coefficient, run.RequiredInitial(), s.DryGas, zero)
        {
            BarometricPressureU = s.BarometricPressureU, TemperatureU = s.TemperatureU, SolutionVolumeU = s.SolutionVolumeU,
        };
        var (rel, budget) = UncertaintyBudget.Relative(gas.Scale, gas.UncertainInputs());
        var constants = new List<KeyValuePair<string, string>>
        {
            new("R", $"{G(PhysicalConstants.GasConstant)} J/(mol·K) (CODATA 2018)"),
            new("p_bar", $"{G(pb)} Pa ({run.From("barometric_pressure", "signal.barometric_pressure")})"),
            new("T", $"{G(t)} K ({run.TemperatureSource()})"),
            new("p_H2O", s.DryGas ? "0 Pa (signal.dry_gas)" : $"{G(gas.WaterVapourPressure)} Pa (IAPWS-IF97 Eq. 30)"),
            new("V_solution", $"{G(gas.SolutionVolume)} L ({run.From("solution_volume", "signal.solution_volume")})"),
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
}
