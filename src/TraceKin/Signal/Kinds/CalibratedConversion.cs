using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// The conversion through a [signal.calibration] curve, shared by every kind that accepts one (absorbance,
/// calibrated, conductivity): the run's signal brought into the standards' unit, optionally temperature-compensated
/// first, and the curve read backwards.
/// </summary>
internal static class CalibratedConversion
{
    /// <param name="run">The run.</param>
    /// <param name="quantity">The signal's quantity and internal unit, or null for the export channel's own (none without an export).</param>
    /// <param name="compensation">Temperature compensation applied before the curve is read (conductivity), or null.</param>
    public static SignalModel Build(SignalRun run, (Quantity Quantity, string Unit)? quantity, ConductivityConversion? compensation)
    {
        var s = run.Settings;
        var row = run.Row;
        var export = run.Export;
        var cal = s.Calibration!;
        var curve = cal.Curve ?? throw Fail.Setting(s.Source, "signal.calibration.file", Fail.Quote(cal.File ?? ""), "standards read from the series folder",
            "the calibration file has not been read; analyse the series folder rather than a single file");
        curve = curve with
        {
            Coefficient = s.Coefficient,
            Initial = cal.OtherSpecies.Count > 0 ? run.RequiredInitial() : 0,
            OthersInitial = cal.OtherSpecies.ToDictionary(o => o.Species, o => run.InitialOrZero(o.Species)),
        };
        // The run's signal arrives in internal units (S/m, Pa, …); the standards are in their own unit (declared,
        // else the unit the export wrote its channel in), so the signal is brought into that unit first.
        var stdUnit = StandardsUnit(s, cal, export);
        var comp = compensation;
        var temperature = comp is null ? row.TemperatureK : run.RunTemperature();
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
        var (q, unit) = quantity ?? (export is null ? (Quantity.Other, "") : (export.Channel(s.Channel).Quantity, export.Channel(s.Channel).Unit));
        var constants = new List<KeyValuePair<string, string>> { new("calibration", curve.Describe()) };
        if (comp is not null)
            constants.Add(new("α", $"{SignalRun.G(comp.TemperatureCoefficient!.Value)} 1/K to {SignalRun.G(s.ReferenceTemperature)} K (signal.temperature_coefficient)"));
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
}
