using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// The saturation law v0 = Vmax·[S]0/(Km + [S]0)·Π[Y]0^n (<see cref="SaturationModel"/>, fitted by
/// <see cref="SaturationAnalysis"/>), for a series at one temperature (Km depends on temperature).
/// </summary>
internal sealed class SaturationLaw : ISeriesLaw
{
    public string Name => ModelSettings.Saturation;

    public bool FittedByDefault => true;

    public CompetingLawFindings? Fit(SeriesLawInput input, List<Warning> warnings)
    {
        if (input.TemperatureGroups > 1)
        {
            // Said only when the user named a substrate; by default the saturation law is simply not tried here.
            if (input.Settings.Substrate is not null)
                warnings.Add(new Warning("saturation-not-fitted", "series", "the saturation law is fitted only to a series at one temperature (Km depends on temperature)"));
            return null;
        }
        if (!input.Power.Converged) return null;
        var sat = SaturationAnalysis.Analyse(input.Runs, input.Varied, input.PowerOrders, input.Power, input.Weights, input.Settings, warnings);
        if (sat is null) return null;
        var formula = $"v = Vmax·[{sat.Substrate}]/(Km + [{sat.Substrate}])" + string.Concat(sat.CoReactantOrders.Select(o => $"·[{o.Species}]^n"));
        return new CompetingLawFindings(Name, formula, [sat.Vmax, sat.Km, .. sat.CoReactantOrders.Select(o =>
                new Estimate($"n({o.Species})", o.Value, o.StdError, "", o.Dof, o.Ci95Low, o.Ci95High, o.Method))],
            sat.Fit, sat.AiccPowerLaw, sat.AiccSaturation, sat.EvidenceRatio, sat.Preferred == Name) { Details = sat };
    }

    /// <summary>The saturation law has its own place in the findings (and its own sections in the report and summary.json).</summary>
    public SeriesFindings Attach(SeriesFindings findings, CompetingLawFindings result) =>
        findings with { Saturation = (SaturationFindings)result.Details! };
}
