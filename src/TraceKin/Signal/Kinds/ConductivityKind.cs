using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// kind = "conductivity": the two-point conversion between κ at mixing and at complete reaction
/// (<see cref="ConductivityConversion"/>), or, with a [signal.calibration] table, the standards' curve read after the
/// optional temperature compensation.
/// </summary>
internal sealed class ConductivityKind : ISignalKind
{
    public string Name => "conductivity";

    public (string Header, string Unit) SampleColumn => ("conductivity (mS/cm)", Units.SiemensPerMetre);

    public SignalSettings Read(SignalTable t, SignalSettings d)
    {
        var s = t.Section;
        return d with
        {
            KappaInitial = s.Double("kappa_initial") is { } k0 ? t.ConductivityUnit.ToInternal(k0) : null,
            KappaInitialU = (t.NonNegative("kappa_initial_u") ?? 0) * t.ConductivityUnit.Factor,
            KappaFinal = s.Double("kappa_final") is { } k1 ? t.ConductivityUnit.ToInternal(k1) : null,
            KappaFinalU = (t.NonNegative("kappa_final_u") ?? 0) * t.ConductivityUnit.Factor,
            TemperatureCoefficient = s.Double("temperature_coefficient"),
            TemperatureCoefficientU = t.NonNegative("temperature_coefficient_u") ?? 0,
            ReferenceTemperature = t.Temperature("reference_temperature") ?? d.ReferenceTemperature,
        };
    }

    public void Validate(SignalSettings x, TomlSection s)
    {
        if (x.Calibration is null && x.KappaFinal is null)
            throw Fail.Setting(s.File, s.KeyName("kappa_final"), "nothing", "the conductivity at complete reaction (or a [signal.calibration] table)", "");
        if (x.Calibration is null && x.Coefficient > 0)
            throw Fail.Setting(s.File, s.KeyName("coefficient"), x.Coefficient.ToString(CultureInfo.InvariantCulture),
                "a negative coefficient: the two-point conductivity conversion follows the limiting reactant");
        if (x.KappaInitial is { } k0 && x.KappaFinal is { } k1 && k0 == k1)
            throw Fail.Setting(s.File, s.KeyName("kappa_final"), "the same value as kappa_initial", "a conductivity at complete reaction that differs from the one at mixing");
        if (x.TemperatureCoefficient is { } a && !(Math.Abs(a) < 1))
            throw Fail.Setting(s.File, s.KeyName("temperature_coefficient"), a.ToString(CultureInfo.InvariantCulture), "a coefficient per kelvin, e.g. 0.02 (2 %/K)");
    }

    public SignalModel Build(SignalRun run)
    {
        var s = run.Settings;
        var row = run.Row;
        if (s.Calibration is not null)
        {
            var comp = s.TemperatureCoefficient is { } alpha
                ? new ConductivityConversion(0, 1, 1, alpha, s.ReferenceTemperature) { TemperatureCoefficientU = s.TemperatureCoefficientU }
                : null;
            return CalibratedConversion.Build(run, (Quantity.Conductivity, Units.SiemensPerMetre), comp);
        }
        var G = SignalRun.G;
        double? temperature = s.TemperatureCoefficient is null ? row.TemperatureK : run.RunTemperature();
        var k0 = s.KappaInitial ?? run.First ?? throw Fail.Setting(s.Source, "signal.kappa_initial", "nothing", "the conductivity at mixing (S/m unless conductivity_unit says otherwise)");
        // A first sample read at the run's temperature is referred to the reference temperature like every other reading.
        if (s.KappaInitial is null && s.TemperatureCoefficient is { } a0 && temperature is { } tt) k0 /= 1 + a0 * (tt - s.ReferenceTemperature);
        var kf = s.KappaFinal ?? throw run.Missing("kappa_final", "the conductivity at complete reaction");
        if (k0 == kf)
            throw Fail.Setting(s.Source, "signal.kappa_final", $"{G(kf)} S/m, the same as the conductivity at mixing", "a conductivity at complete reaction that differs from the one at mixing");
        var cc = new ConductivityConversion(k0, kf, run.RequiredInitial(), s.TemperatureCoefficient, s.ReferenceTemperature)
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
        if (s.TemperatureCoefficient is { } alpha2)
            constants.Add(new("α", $"{G(alpha2)} 1/K to {G(s.ReferenceTemperature)} K (signal.temperature_coefficient)"));
        return new SignalModel
        {
            SignalQuantity = Quantity.Conductivity, SignalUnit = Units.SiemensPerMetre,
            ToConcentration = cc.ToConcentration, ToSignal = cc.ToConductivity,
            RelativeSystematicUncertainty = rel, Budget = budget, ConstantsUsed = constants,
            Temperature = temperature, UsesPointTemperature = s.TemperatureCoefficient is not null,
        };
    }
}
