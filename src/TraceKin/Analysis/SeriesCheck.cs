using TraceKin.Signal;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Analysis;

/// <summary>
/// What series.toml and plan.csv must agree on before any run is read: every species series.toml names exists as an
/// [X]0 column (a product may be left out: it starts at zero), every per-run parameter column of plan.csv is one the
/// conversion uses, and each parameter the conversion needs is given by series.toml or by every row of the plan.
/// A disagreement is one located problem that lists what does exist. Channel names are checked per run, against
/// each export (<see cref="RunExport.Channel(string?, string)"/>).
/// </summary>
internal static class SeriesCheck
{
    public static void Check(SeriesConfig config, Plan plan)
    {
        var s = config.Signal;
        var known = plan.Species;
        string Existing() => known.Count == 0 ? "none: plan.csv has no [X]0 column" : string.Join(", ", known);
        void Species(string key, string? name, bool mayBeAbsent)
        {
            if (name is null || mayBeAbsent || known.Contains(name, StringComparer.Ordinal)) return;
            throw Fail.Setting(config.File, key, Fail.Quote(name), $"a species with an [X]0 column in {plan.File} (there: {Existing()})",
                $"add a column \"[{name}]0 (mmol/L)\" to {plan.File}, or correct the name");
        }

        // A product (positive coefficient) absent from the plan starts at zero; a reactant must have its [X]0.
        Species("signal.species", s.Species, s.Coefficient > 0);
        for (var i = 0; i < s.Absorbers.Count; i++)
            Species($"signal.absorber[{i}].species", s.Absorbers[i].Species, s.Absorbers[i].Coefficient > 0);
        if (s.Calibration is { } cal)
            for (var i = 0; i < cal.OtherSpecies.Count; i++)
                Species($"signal.calibration.other[{i}].species", cal.OtherSpecies[i].Species, cal.OtherSpecies[i].Coefficient > 0);
        foreach (var sp in config.Model.Species ?? [])
            Species("model.species", sp, false);
        Species("model.substrate", config.Model.Substrate, false);
        Species("rates.limiting_reactant", config.Rates.LimitingReactant, false);
        if (config.Rates.LimitingReactant is { } limiting && s.Coefficient < 0)
            throw Fail.Setting(config.File, "rates.limiting_reactant", Fail.Quote(limiting),
                $"a limiting reactant only for a product curve (signal.coefficient > 0; here {s.Coefficient.ToString(System.Globalization.CultureInfo.InvariantCulture)}, a reactant, whose own [X]0 already sets its change)",
                "remove rates.limiting_reactant");

        // rates.laws listing only laws these settings never fit would leave every run without a law.
        if (config.Rates.Laws is { } laws
            && Rates.IntegratedLawFitter.NeverFitted(laws, config.Rates.Drift, config.Rates.LimitingReactant is not null) is { } never
            && never.Count == laws.Count)
            throw Fail.Setting(config.File, "rates.laws", "[" + string.Join(", ", laws.Select(l => Fail.Quote(l))) + "]",
                "at least one law these settings fit: " + string.Join("; ", never.Select(x => $"{x.Law}: {x.Why}")),
                "list a law these settings fit, or change rates.drift or rates.limiting_reactant");

        var used = RunConditions.UsedBy(s);
        foreach (var (name, column) in plan.ConditionColumns)
            if (!used.Contains(name))
                throw Fail.At(plan.File, plan.HeaderLine, column.Column, Fail.Quote(column.Header),
                    used.Count == 0
                        ? $"no per-run parameter column: signal.kind = \"{s.Kind}\"{(s.Calibration is null ? "" : " with a calibration")} uses none"
                        : $"a per-run parameter that signal.kind = \"{s.Kind}\" uses: {string.Join(", ", used)}",
                    "remove the column, or check signal.kind");

        if (s.Kind == "gas_volume")
        {
            Needed(config, plan, "barometric_pressure", s.BarometricPressure, "the barometric pressure", "kPa");
            Needed(config, plan, "solution_volume", s.SolutionVolume, "the volume of the reacting solution", "mL");
        }
    }

    /// <summary>A parameter given by series.toml, or by a plan.csv column filled in on every row.</summary>
    private static void Needed(SeriesConfig config, Plan plan, string name, double? seriesValue, string what, string unit)
    {
        if (seriesValue is not null) return;
        if (!plan.ConditionColumns.TryGetValue(name, out var column))
            throw Fail.Setting(config.File, $"signal.{name}", "nothing", $"{what}: signal.{name} in series.toml or a column \"{name} ({unit})\" in {plan.File}");
        foreach (var row in plan.Rows)
            if (!row.Conditions.ContainsKey(name))
                throw Fail.At(plan.File, row.ConditionLines.GetValueOrDefault(name, row.Line), row.ConditionCells.GetValueOrDefault(name, column.Column), "an empty cell", $"{what} for run {Fail.Quote(row.Run)}, since series.toml sets no signal.{name}");
    }
}
