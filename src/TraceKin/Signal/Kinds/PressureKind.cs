using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>kind = "pressure": the total pressure of a gas-phase reaction in a closed vessel, converted by <see cref="PressureConversion"/>.</summary>
internal sealed class PressureKind : ISignalKind
{
    public string Name => "pressure";

    public (string Header, string Unit) SampleColumn => ("pressure (kPa)", Units.Pascal);

    public SignalSettings Read(SignalTable t, SignalSettings d)
    {
        var s = t.Section;
        return d with
        {
            GasMoleChange = s.Double("gas_mole_change"),
            InitialPressure = s.Positive("initial_pressure") is { } p0 ? t.PressureUnit.ToInternal(p0) : null,
            InitialMoleFraction = t.NonNegative("initial_mole_fraction"),
        };
    }

    public void Validate(SignalSettings x, TomlSection s)
    {
        if (x.Calibration is not null)
            throw Fail.Setting(s.File, s.KeyName("calibration"), $"a calibration table with kind = \"{x.Kind}\"", "no calibration: this kind is converted from physical laws",
                "use kind = \"calibrated\" to read the signal through standards instead");
        if (x.GasMoleChange is null)
            throw Fail.Setting(s.File, s.KeyName("gas_mole_change"), "nothing", "the change in moles of gas per unit extent of reaction, e.g. 1 for A(g) → 2 B(g)", "");
        if (x.GasMoleChange == 0)
            throw Fail.Setting(s.File, s.KeyName("gas_mole_change"), "0", "a non-zero change in moles of gas", "a reaction that keeps the number of gas moles cannot be followed by its pressure");
    }

    public IReadOnlyList<string> PlanConditions(SignalSettings s) => ["gas_temperature"];

    public SignalModel Build(SignalRun run)
    {
        var s = run.Settings;
        var row = run.Row;
        var first = run.First;
        var G = SignalRun.G;
        var t = run.RunTemperature();
        double p0Partial;
        double p0;
        var planned = PlannedInitialPressure(row);
        var p0Source = s.InitialPressure is not null ? "signal.initial_pressure" : planned is not null ? "plan" : first is not null ? "first sample" : "plan [X]0";
        if (row.InitialConcentrations.TryGetValue(s.Species, out var c0))
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
        var pc = new PressureConversion(t, s.GasMoleChange is { } dn and not 0 ? dn : throw run.Missing("gas_mole_change", "a non-zero change in moles of gas per unit extent"), s.Coefficient, p0, p0Partial) { TemperatureU = s.TemperatureU };
        var (rel, budget) = UncertaintyBudget.Relative(pc.Scale, pc.UncertainInputs());
        var constants = new List<KeyValuePair<string, string>>
        {
            new("R", $"{G(PhysicalConstants.GasConstant)} J/(mol·K) (CODATA 2018)"),
            new("T", $"{G(t)} K ({run.TemperatureSource()})"),
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

    /// <summary>A plan.csv column "p0 (unit)" (any pressure unit): the run's total pressure at mixing.</summary>
    private static double? PlannedInitialPressure(PlanRow row)
    {
        foreach (var (header, text) in row.Extra)
        {
            var m = System.Text.RegularExpressions.Regex.Match(header, @"^p0\s*[\(\[](?<unit>[^\)\]]+)[\)\]]$", System.Text.RegularExpressions.RegexOptions.IgnoreCase);
            if (!m.Success || text.Trim().Length == 0) continue;
            if (Units.Find(m.Groups["unit"].Value) is not { Quantity: Quantity.Pressure } unit)
                throw Fail.At("plan.csv", row.Line, 0, Fail.Quote(header), "a pressure unit in the p0 column header, e.g. \"p0 (kPa)\"");
            var tx = text.Trim();
            var culture = tx.Contains(',') && !tx.Contains('.') ? CultureInfo.GetCultureInfo("de-DE") : CultureInfo.InvariantCulture;
            if (!double.TryParse(tx, NumberStyles.Float, culture, out var v) || !(v > 0))
                throw Fail.At("plan.csv", row.Line, 0, Fail.Quote(tx), $"a positive number in column {Fail.Quote(header)}");
            return unit.ToInternal(v);
        }
        return null;
    }
}
