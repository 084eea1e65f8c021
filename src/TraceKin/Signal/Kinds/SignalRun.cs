using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// What a kind builds one run's conversion from: the series settings with the run's plan.csv parameters in place
/// (<see cref="RunConditions.Apply"/>), the plan row, the export when there is one (simulation has none) and its first
/// sample, with the look-ups every kind shares (initial concentrations, the gas or cell temperature, sources).
/// </summary>
public sealed class SignalRun
{
    /// <summary>The settings with this run's plan values in place of the series values.</summary>
    public SignalSettings Settings { get; }
    /// <summary>The series settings as series.toml gave them.</summary>
    public SignalSettings Series { get; }
    public PlanRow Row { get; }
    public RunExport? Export { get; }
    /// <summary>The signal channel's first sample, when there is an export and the channel has points.</summary>
    public double? First { get; }

    internal SignalRun(SignalSettings series, PlanRow row, RunExport? export)
    {
        Series = series;
        Row = row;
        Export = export;
        // plan.csv columns such as "barometric_pressure (kPa)" give this run its own parameters.
        Settings = RunConditions.Apply(series, row);
        First = export is null ? null : FirstOf(export, Settings);
    }

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    internal static string G(double v) => v.ToString("G10", Inv);

    /// <summary>Where the run's value of a parameter came from: its plan.csv cell, else the series.toml key.</summary>
    public string From(string name, string key) => RunConditions.Source(Row, name, key);

    /// <summary>The plan's [X]0 of a species, or 0.</summary>
    public double InitialOrZero(string species) => Row.InitialConcentrations.TryGetValue(species, out var c) ? c : 0;

    /// <summary>The followed species' [X]0; a product without one starts at 0; a reactant without one is an error.</summary>
    public double RequiredInitial()
    {
        var s = Settings;
        if (Row.InitialConcentrations.TryGetValue(s.Species, out var c)) return c;
        if (s.Coefficient > 0) return 0;
        throw Fail.Setting(s.Source, "signal.species", $"no [{s.Species}]0 for run {Fail.Quote(Row.Run)}",
            $"the initial concentration of {s.Species} in plan.csv (line {Row.Line})", $"add a column \"[{s.Species}]0 (mmol/L)\" to plan.csv");
    }

    /// <summary>A required key that is missing, pointing to the docs.</summary>
    public InputException Missing(string key, string expected) =>
        Fail.Setting(Settings.Source, $"signal.{key}", "nothing", expected, "see docs/formats.md, section [signal]");

    /// <summary>The gas or cell temperature: signal.temperature, else the plan's; range-checked.</summary>
    public double RunTemperature()
    {
        var s = Settings;
        var t = s.Temperature ?? Row.TemperatureK ?? throw Fail.Setting(s.Source, "signal.temperature", "nothing",
            $"the temperature of run {Fail.Quote(Row.Run)}", "add a \"temperature (°C)\" column to plan.csv or set signal.temperature");
        if (!(t > 0 && t < 1000))
            throw Fail.Setting(s.Source, "signal.temperature", $"{G(t)} K", "a temperature between 0 K and 1000 K", TemperatureHint());
        return t;
    }

    /// <summary>Where a gas or cell temperature came from: the plan's gas_temperature cell, signal.temperature, or the run's temperature.</summary>
    public string TemperatureSource() =>
        Row.Conditions.TryGetValue("gas_temperature", out var c) ? c.Source : Series.Temperature is not null ? "signal.temperature" : "plan";

    public string TemperatureHint() =>
        Settings.Temperature is null ? $"the temperature comes from plan.csv line {Row.Line}" : "check signal.temperature and temperature_unit";

    private static double? FirstOf(RunExport export, SignalSettings s)
    {
        var ch = export.Channel(s.Channel);
        return ch.Count > 0 ? ch.Values[0] : null;
    }
}
