using System.Globalization;
using TraceKin.Series;

namespace TraceKin.Planning;

/// <summary>
/// What limits the current design, in plain sentences: species spanning too narrow a range of starting concentrations,
/// starting concentrations that move together (<see cref="OrderDesign.Check"/>), a single temperature level or too narrow
/// a temperature span, and a saturation series that never approaches saturation or never goes below Km.
/// </summary>
internal static class DesignWeaknesses
{
    /// <summary>Span (largest/smallest [X]0) below which an order is poorly pinned: a span of about a decade is the usual aim
    /// (common practice, no source); below 3× it is said.</summary>
    public const double NarrowSpan = 3;

    /// <summary>Temperature span (K) below which Ea is poorly pinned (common practice, no source).</summary>
    public const double NarrowTemperatureSpan = 20;

    public static IReadOnlyList<string> Of(IReadOnlyList<RunPoint> runs, DesignLaw law, double[] theta)
    {
        var list = new List<string>();
        if (runs.Count == 0) return list;
        var ci = CultureInfo.InvariantCulture;
        foreach (var sp in law.Species)
        {
            var v = runs.Select(r => r.InitialConcentrations.GetValueOrDefault(sp)).Where(x => x > 0).ToArray();
            if (v.Length == 0) continue;
            var span = v.Max() / v.Min();
            var levels = v.Distinct().Count();
            if (span < 1 + 1e-9) list.Add($"[{sp}]0 never varies: its order is not measured at all.");
            else if (span < NarrowSpan)
                list.Add(string.Format(ci, "[{0}]0 spans only {1:0.##}× ({2} level(s)); an order is pinned by the spread of ln[X]0, and a span of about ten times is the usual aim.", sp, span, levels));
            else if (levels < 3 && law is PowerLawDesign)
                list.Add($"[{sp}]0 has only {levels} levels: a curved log–log plot (an order that changes with concentration) cannot be seen.");
        }
        var species = law.Species.Where(sp => runs.All(r => r.InitialConcentrations.GetValueOrDefault(sp) > 0)).ToList();
        var groups = TemperatureGroups.Of(runs);
        if (species.Count > 1)
        {
            var check = OrderDesign.Check(runs, species, groups.Index);
            if (!check.Separable)
                foreach (var set in check.Confounded)
                    list.Add($"The starting concentrations of {string.Join(" and ", set)} move together: their effects cannot be told apart.");
            else if (check.ConditionNumber > OrderDesign.StrongCollinearity)
                list.Add(string.Format(ci, "The starting concentrations are strongly collinear (condition number {0:G3}, above {1}): vary the species independently.", check.ConditionNumber, OrderDesign.StrongCollinearity));
        }
        var temps = runs.Where(r => r.TemperatureK is not null).Select(r => r.TemperatureK!.Value).ToArray();
        if (law.HasTemperature || groups.Count > 1)
        {
            if (groups.Count == 1) list.Add("All runs are at one temperature: the activation energy is not measured.");
            else if (temps.Length > 0 && temps.Max() - temps.Min() < NarrowTemperatureSpan)
                list.Add(string.Format(ci, "The temperatures span only {0:0.#} K ({1} level(s)); Ea is pinned by the spread of 1/T.", temps.Max() - temps.Min(), groups.Count));
            if (groups.Count is > 1 and < 3) list.Add($"Only {groups.Count} temperature levels: the Arrhenius fit needs at least 3.");
        }
        if (law is SaturationDesign s)
        {
            var km = theta[1];
            var x = runs.Select(r => r.InitialConcentrations.GetValueOrDefault(s.Substrate)).Where(c => c > 0).ToArray();
            if (x.Length > 0 && x.Max() < 2 * km)
                list.Add(string.Format(ci, "The largest [{0}]0 is {1:0.##}× Km: the rate never approaches Vmax, so Vmax and Km are correlated and poorly pinned.", s.Substrate, x.Max() / km));
            if (x.Length > 0 && x.Min() > km)
                list.Add(string.Format(ci, "No run has [{0}]0 below Km: the rising part of the curve, which fixes Km, is not measured.", s.Substrate));
        }
        return list;
    }
}
