using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// A run's signal turned into the concentration (mol/L) of the species the signal follows.
/// <see cref="RelativeSystematicUncertainty"/> is the relative standard uncertainty of the concentration scale
/// from the conversion's constants (reported beside, not mixed into, fit statistics).
/// </summary>
public sealed record ConvertedRun(
    Trace Concentration,
    string Species,
    double Coefficient,
    double RelativeSystematicUncertainty,
    IReadOnlyList<KeyValuePair<string, string>> ConstantsUsed,
    IReadOnlyList<Warning> Warnings)
{
    /// <summary>Each uncertain conversion input (series.toml key) and its relative contribution to <see cref="RelativeSystematicUncertainty"/>.</summary>
    public IReadOnlyList<KeyValuePair<string, double>> UncertaintyBudget { get; init; } = [];
    /// <summary>Per-point standard error of the concentration (mol/L) when the conversion gives one (calibration curves); else null.</summary>
    public double[]? StdErrors { get; init; }
}

/// <summary>The Signal stage's front door: picks the conversion named by signal.kind.</summary>
public static class Conversion
{
    /// <summary>Signal → concentration for one run (see <see cref="SignalModel"/> for the conversions and their sources).</summary>
    public static ConvertedRun ToConcentration(RunExport export, PlanRow row, SignalSettings settings, string configFile = "series.toml")
    {
        var s = settings.Source == configFile ? settings : settings with { Source = configFile };
        var result = RunConversion.Convert(export, row, s);
        var used = new List<KeyValuePair<string, string>>
        {
            new("conversion", s.Kind),
            new("channel", export.Channel(s.Channel).Name),
        };
        if (s.ReferenceChannel is { } r) used.Add(new("reference channel", r));
        used.AddRange(result.Model.ConstantsUsed);
        return new ConvertedRun(result.Concentration, s.Species, s.Coefficient, result.Model.RelativeSystematicUncertainty, used, result.Warnings)
        {
            UncertaintyBudget = result.Model.Budget,
            StdErrors = result.StdErrors,
        };
    }

    /// <summary>
    /// Concentration → signal for one run: what the instrument would record for a concentration trace of the followed
    /// species (used by simulation). Values are in the signal's internal unit (AU, L, Pa, S/m).
    /// </summary>
    public static Trace ToSignal(Trace concentration, PlanRow row, SignalSettings settings, Trace? temperature = null) =>
        RunConversion.ToSignal(concentration, row, settings, temperature);
}
