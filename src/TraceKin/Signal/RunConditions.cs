using TraceKin.Setup;

namespace TraceKin.Signal;

/// <summary>
/// A run's own conversion parameters: plan.csv columns (<see cref="Plan.ConditionNames"/>) override the series.toml
/// values for that run only, and every constant the conversion prints says which of the two it came from.
/// </summary>
internal static class RunConditions
{
    /// <summary>The plan.csv parameter columns a conversion kind reads; any other parameter column is an error for that kind.</summary>
    public static IReadOnlyList<string> UsedBy(SignalSettings s) => SignalKinds.Find(s.Kind)?.PlanConditions(s) ?? [];

    /// <summary>The series settings with this run's plan values in place of the series values.</summary>
    public static SignalSettings Apply(SignalSettings s, PlanRow row)
    {
        var c = row.Conditions;
        if (c.Count == 0) return s;
        double? Get(string name) => c.TryGetValue(name, out var v) ? v.Value : null;
        return s with
        {
            BarometricPressure = Get("barometric_pressure") ?? s.BarometricPressure,
            Blank = Get("blank") ?? s.Blank,
            PathLength = Get("path_length") ?? s.PathLength,
            SolutionVolume = Get("solution_volume") ?? s.SolutionVolume,
            ZeroOffset = Get("zero_offset") ?? s.ZeroOffset,
            Temperature = Get("gas_temperature") ?? s.Temperature,
        };
    }

    /// <summary>Where the run's value of a parameter came from: its plan.csv cell, else the series.toml key.</summary>
    public static string Source(PlanRow row, string name, string key) =>
        row.Conditions.TryGetValue(name, out var c) ? c.Source : key;
}
