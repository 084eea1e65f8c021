using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// Temperature dependence from the initial-rate route: k per temperature group at the series' orders
/// (<see cref="FixedOrderRateConstant"/>), then the Arrhenius and Eyring laws fitted on those k by weighted nonlinear
/// least squares (weights 1/se(k)², relative). Needs at least three temperatures (one degree of freedom).
/// </summary>
internal static class TemperatureAnalysis
{
    public const string ExtrapolationCaution =
        "Arrhenius and Eyring parameters describe only the measured temperature range; extrapolating k outside it (for example for thermal-safety or scale-up decisions) needs independent data at those temperatures and the judgement of a qualified, licensed professional";

    public static TemperatureFindings Analyse(IReadOnlyList<RunPoint> runs, TemperatureGroups groups, IReadOnlyDictionary<string, double> orders,
        bool rounded, ModelSettings settings, List<Warning> warnings)
    {
        var list = new List<TemperatureGroup>();
        for (var g = 0; g < groups.Count; g++)
        {
            if (groups.Temperatures[g] is null) continue;
            var members = runs.Where((_, i) => groups.Index[i] == g).ToList();
            var kg = FixedOrderRateConstant.Fit(members, orders, warnings, rounded ? "rounded" : "fitted", groups.Names[g]);
            if (kg is null) continue;
            list.Add(new TemperatureGroup(members.Average(r => r.TemperatureK!.Value), members.Select(r => r.RunId).ToArray(), kg));
        }
        if (list.Count < 3)
        {
            warnings.Add(new Warning("too-few-temperatures", "series", $"{list.Count} temperature(s) with a rate constant; Arrhenius and Eyring fits need at least 3"));
            return new TemperatureFindings(list, null, null);
        }
        var t = list.Select(x => x.TemperatureK).ToArray();
        var k = list.Select(x => x.RateConstant.Value).ToArray();
        var se = list.Select(x => x.RateConstant.StdError).ToArray();
        var w = se.All(s => s > 0 && double.IsFinite(s)) ? se.Select(s => 1 / (s * s)).ToArray() : null;
        if (w is null)
            warnings.Add(new Warning("arrhenius-unweighted", "series", "some temperature's k has no standard error; the Arrhenius and Eyring fits weight every temperature equally"));
        var arrhenius = Arrhenius.Fit(t, k, w, settings.ReferenceTemperatureK, list[0].RateConstant.Unit, warnings);
        var eyring = Eyring.Fit(t, k, w, settings.EyringTemperatureK, warnings);
        if (arrhenius is not null || eyring is not null)
            warnings.Add(new Warning("extrapolation-caution", "series", ExtrapolationCaution));
        return new TemperatureFindings(list, arrhenius, eyring);
    }
}
