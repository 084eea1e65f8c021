using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// kind = "absorbance": Beer–Lambert from ε and l (<see cref="BeerLambert"/>, other absorbers included), or, with a
/// [signal.calibration] table, the standards' curve read backwards (<see cref="CalibratedConversion"/>).
/// </summary>
internal sealed class AbsorbanceKind : ISignalKind
{
    public string Name => "absorbance";

    public (string Header, string Unit) SampleColumn => ("A", Units.Absorbance);

    public SignalSettings Read(SignalTable t, SignalSettings d)
    {
        var s = t.Section;
        var absorbers = new List<Absorber>();
        foreach (var a in s.Sections("absorber"))
        {
            var sp = a.String("species") ?? throw Fail.Setting(s.File, a.KeyName("species"), "nothing", "the name of the other absorbing species, as in plan.csv");
            var eps = a.Positive("molar_absorptivity") ?? throw Fail.Setting(s.File, a.KeyName("molar_absorptivity"), "nothing", $"the molar absorptivity of {sp} in L/(mol·cm)");
            var nu = a.Double("coefficient") ?? throw Fail.Setting(s.File, a.KeyName("coefficient"), "nothing", $"the stoichiometric coefficient of {sp} (negative for a reactant)");
            absorbers.Add(new Absorber(sp, eps, nu, SignalSettings.NonNegative(a, "molar_absorptivity_u") ?? 0));
            SignalSettings.RejectUnknown(a);
        }
        return d with
        {
            MolarAbsorptivity = s.Positive("molar_absorptivity"),
            MolarAbsorptivityU = t.NonNegative("molar_absorptivity_u") ?? 0,
            PathLength = t.Cm(s.Positive("path_length") ?? d.PathLength),
            PathLengthU = t.Cm(t.NonNegative("path_length_u") ?? 0),
            Blank = s.Double("blank", 0),
            ReferenceChannel = s.String("reference_channel"),
            LinearLimit = s.Positive("linear_limit") ?? d.LinearLimit,
            Absorbers = absorbers,
            CheckChannel = s.String("check_channel"),
            CheckMolarAbsorptivity = s.Positive("check_molar_absorptivity"),
            CheckBlank = s.Double("check_blank", 0),
            CheckTolerance = s.Positive("check_tolerance") ?? d.CheckTolerance,
        };
    }

    public void Validate(SignalSettings x, TomlSection s)
    {
        if (x.MolarAbsorptivity is not null && x.Calibration is not null)
            throw Fail.Setting(s.File, s.KeyName("molar_absorptivity"), "both a molar absorptivity and [signal.calibration]", "one of them");
        if (x.Absorbers.Count > 0 && x.Calibration is not null)
            throw Fail.Setting(s.File, s.KeyName("absorber"), "other absorbers with [signal.calibration]", "other species in [[signal.calibration.other]] instead",
                "a calibration learns every species' contribution from its standards");
        if (x.CheckChannel is not null && x.CheckMolarAbsorptivity is null)
            throw Fail.Setting(s.File, s.KeyName("check_molar_absorptivity"), "nothing", "the molar absorptivity at the check channel, in L/(mol·cm)", "");
    }

    public IReadOnlyList<string> PlanConditions(SignalSettings s) => s.Calibration is null ? ["blank", "path_length"] : [];

    public SignalModel Build(SignalRun run)
    {
        var s = run.Settings;
        if (s.Calibration is not null) return CalibratedConversion.Build(run, (Quantity.Absorbance, Units.Absorbance), null);
        if (s.MolarAbsorptivity is not { } eps)
            throw Fail.Setting(s.Source, "signal.molar_absorptivity", "nothing", "the molar absorptivity of the followed species in L/(mol·cm)",
                "or give a [signal.calibration] table of standards");
        var bl = new BeerLambert(eps, s.PathLength, s.Blank, s.Coefficient, s.Absorbers.Count > 0 ? run.RequiredInitial() : 0, s.Absorbers, s.MolarAbsorptivityU, s.PathLengthU)
        {
            OthersInitial = s.Absorbers.ToDictionary(a => a.Species, a => run.InitialOrZero(a.Species)),
        };
        if (bl.Response.SignalPerExtent == 0)
            throw Fail.Setting(s.Source, "signal.absorber", "absorbers whose changes cancel", "a net change of absorbance with the reaction");
        var (rel, budget) = UncertaintyBudget.Relative(bl.Scale, bl.UncertainInputs());
        var G = SignalRun.G;
        var constants = new List<KeyValuePair<string, string>>
        {
            new("ε", $"{G(eps)} L/(mol·cm) (signal.molar_absorptivity)"),
            new("l", $"{G(s.PathLength)} cm ({run.From("path_length", "signal.path_length")})"),
            new("blank", $"{G(s.Blank)} AU ({run.From("blank", "signal.blank")})"),
        };
        constants.AddRange(s.Absorbers.Select(a => new KeyValuePair<string, string>($"ε({a.Species})", $"{G(a.MolarAbsorptivity)} L/(mol·cm), ν = {G(a.Coefficient)} (signal.absorber)")));
        // BeerLambert.Response builds the linear response afresh on every call; build it once per run.
        var response = bl.Response;
        return new SignalModel
        {
            SignalQuantity = Quantity.Absorbance, SignalUnit = Units.Absorbance,
            ToConcentration = (a, _) => response.ToConcentration(a), ToSignal = (c, _) => response.ToSignal(c),
            ToConcentrations = response.ToConcentrations,
            RelativeSystematicUncertainty = rel, Budget = budget, ConstantsUsed = constants, Temperature = run.Row.TemperatureK,
        };
    }
}
