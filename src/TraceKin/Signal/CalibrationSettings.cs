using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// The [signal.calibration] table: standards (inline arrays, or a CSV file beside series.toml) and the curve's model.
/// The curve is fitted when the settings are read, so a bad table is reported before any run is touched.
/// </summary>
public sealed record CalibrationSettings
{
    /// <summary>"linear" or "quadratic".</summary>
    public string Model { get; init; } = "linear";
    /// <summary>CSV file of standards, relative to the series folder; null when the standards are inline.</summary>
    public string? File { get; init; }
    /// <summary>Other contributing species: name and stoichiometric coefficient (their concentrations are in the standards).</summary>
    public IReadOnlyList<(string Species, double Coefficient)> OtherSpecies { get; init; } = [];
    /// <summary>One CSV of standards per other species (same order as <see cref="OtherSpecies"/>), when the standards are kept one species per file; else empty.</summary>
    public IReadOnlyList<string> OtherFiles { get; init; } = [];
    /// <summary>The standards, once read (inline at once; from <see cref="File"/> by <see cref="SignalSettings.WithFilesFrom"/>).</summary>
    public CalibrationStandards? Standards { get; init; }
    /// <summary>The fitted curve, once the standards are known.</summary>
    public CalibrationCurve? Curve { get; init; }

    internal static CalibrationSettings FromToml(TomlSection s, string species)
    {
        var model = s.Choice("model", "linear", "linear", "quadratic");
        var file = s.String("file");
        var unit = SignalSettings.UnitOf(s, "concentration_unit", "mol/L", Quantity.Concentration);
        var signalUnitText = s.String("signal_unit");
        UnitInfo? signalUnit = null;
        if (signalUnitText is not null)
            signalUnit = Units.Find(signalUnitText) ?? throw Fail.Setting(s.File, s.KeyName("signal_unit"), Fail.Quote(signalUnitText),
                "a known signal unit, e.g. \"mS/cm\", \"AU\" or \"kPa\" (leave it out to read the standards in the unit of the export's channel)");
        var signals = s.Doubles("signal");
        var conc = s.Doubles("concentration");
        var others = new List<(string, double)>();
        var otherConc = new List<double[]?>();
        var otherFiles = new List<string?>();
        foreach (var o in s.Sections("other"))
        {
            otherFiles.Add(o.String("file"));
            var sp = o.String("species") ?? throw Fail.Setting(s.File, o.KeyName("species"), "nothing", "the name of the other species, as in plan.csv");
            var nu = o.Double("coefficient") ?? throw Fail.Setting(s.File, o.KeyName("coefficient"), "nothing", $"the stoichiometric coefficient of {sp}");
            others.Add((sp, nu));
            otherConc.Add(o.Doubles("concentration")?.Select(unit.ToInternal).ToArray());
            SignalSettings.RejectUnknown(o);
        }
        SignalSettings.RejectUnknown(s);

        if (otherFiles.Any(f => f is not null))
        {
            for (var k = 0; k < others.Count; k++)
            {
                var key = $"{s.KeyName("other")}[{k}]";
                if (otherFiles[k] is null)
                    throw Fail.Setting(s.File, $"{key}.file", "nothing", $"a file of {others[k].Item1}'s standards, as the other species have one each");
                if (otherConc[k] is not null)
                    throw Fail.Setting(s.File, $"{key}.concentration", "both a file and inline concentrations", "one of them");
            }
            if (file is null)
                throw Fail.Setting(s.File, s.KeyName("file"), "nothing", $"a file of {species}'s own standards, since each other species has its own file");
        }
        var result = new CalibrationSettings { Model = model, File = file, OtherSpecies = others, OtherFiles = otherFiles.All(f => f is not null) && otherFiles.Count > 0 ? otherFiles.Select(f => f!).ToArray() : [] };
        if (file is not null)
        {
            if (signalUnit is not null)
                throw Fail.Setting(s.File, s.KeyName("signal_unit"), Fail.Quote(signalUnitText!), "no signal_unit with a file of standards",
                    "write the unit in the file's header instead, e.g. \"signal (mS/cm)\"");
            if (signals is not null || conc is not null)
                throw Fail.Setting(s.File, s.KeyName("file"), "both a file and inline standards", "one of them", "remove either file or signal/concentration");
            return result;
        }
        if (signals is null) throw Fail.Setting(s.File, s.KeyName("signal"), "nothing", "the signal of each standard, e.g. signal = [0.0, 0.21, 0.40]", "or name a CSV of standards with file = \"standards.csv\"");
        if (conc is null) throw Fail.Setting(s.File, s.KeyName("concentration"), "nothing", $"the concentration of {species} in each standard, e.g. concentration = [0, 1, 2]");
        for (var k = 0; k < others.Count; k++)
            if (otherConc[k] is null)
                throw Fail.Setting(s.File, $"{s.KeyName("other")}[{k}].concentration", "nothing", $"the concentration of {others[k].Item1} in each standard");
        var standards = new CalibrationStandards(signals, conc.Select(unit.ToInternal).ToArray(),
            others.Select((o, k) => new CalibrationOther(o.Item1, o.Item2, otherConc[k]!)).ToArray()) { SignalUnit = signalUnit };
        return result with { Standards = standards, Curve = CalibrationCurve.FromStandards(standards, model, s.File, s.Prefix) };
    }
}
