using TraceKin.Fitting;
using TraceKin.Series;

namespace TraceKin.Reports;

/// <summary>
/// The Series stage's model results inside summary.json, as a separate block of top-level fields: "chosenLaw", "design",
/// "powerLaw", "saturation", "otherLaws" (only when a competing law without a block of its own was fitted), "temperature",
/// "arrhenius", "eyring", "globalFit" (documented in docs/formats.md), mapped
/// from <see cref="SeriesFindings"/> onto the records of SeriesModelRecords.cs. Absent results are null.
/// </summary>
internal static class SeriesModelsJson
{
    internal static DesignRecord? Design(SeriesFindings? f) =>
        f?.Design is { } d ? new DesignRecord(d.Species, d.ConditionNumber, d.Separable, d.Confounded.Select(set => (IReadOnlyList<string>)set.ToList()).ToList()) : null;

    internal static PowerLawRecord? PowerLaw(SeriesFindings? f)
    {
        if (f is null || (f.PowerLawFit is null && f.LogLogOrders.Count == 0)) return null;
        return new PowerLawRecord(
            LogLogOrders: Orders(f.LogLogOrders),
            RoundedOrders: f.RoundedOrders is { } ro ? SummaryJson.Numbers(ro) : null,
            OrderVerdicts: f.OrderVerdicts.Select(v => new OrderVerdictRecord(v.Species, v.Order, v.SimpleValue, v.Verdict switch
            {
                OrderVerdictKind.Equivalent => "equivalent",
                OrderVerdictKind.ConsistentButImprecise => "consistent-but-imprecise",
                _ => "different",
            }, v.Margin, [v.Ci90Low, v.Ci90High], v.PLower, v.PUpper, v.Text)).ToList(),
            RateConstantAtFittedOrders: RateConstant(f.RateConstantAtFittedOrders),
            Curvature: f.Curvature.Select(c => new CurvatureRecord(c.Species, c.Quadratic, c.StdError, c.Dof, c.PValue, c.Significant,
                c.LocalOrderAtLowest, c.LocalOrderAtHighest, c.Relevant)).ToList(),
            Fit: FitStats(f.PowerLawFit));
    }

    internal static SaturationRecord? Saturation(SeriesFindings? f) =>
        f?.Saturation is { } s0
            ? new SaturationRecord(s0.Substrate, Est(s0.Vmax), Est(s0.Km), Orders(s0.CoReactantOrders), s0.AiccPowerLaw, s0.AiccSaturation,
                s0.EvidenceRatio, s0.Preferred,
                s0.CrossCheck is { } cc ? new DoubleReciprocalRecord(cc.Vmax, cc.Km, "cross-check only (1/v0 against 1/[S]0 line); not an estimate") : null,
                FitStats(s0.Fit))
            : null;

    /// <summary>Competing laws without a block of their own (SeriesLaws), in registry order; null (left out) when none was fitted.</summary>
    internal static List<OtherLawRecord>? OtherLaws(SeriesFindings? f) =>
        f?.OtherLaws is { Count: > 0 } others
            ? others.Select(l => new OtherLawRecord(l.Law, l.Formula,
                l.Estimates.Select(e => new NamedEstimateRecord(e.Name, e.Value, e.StdError, e.Unit, e.Dof, [e.Ci95Low, e.Ci95High], e.Method)).ToList(),
                l.AiccPowerLaw, l.Aicc, l.EvidenceRatio, l.UsedInstead, FitStats(l.Fit))).ToList()
            : null;

    internal static TemperatureRecord? Temperature(SeriesFindings? f) =>
        f?.Temperature is { } t
            ? new TemperatureRecord(t.Groups.Select(g => new TemperatureGroupRecord(g.TemperatureK, g.Runs, RateConstant(g.RateConstant))).ToList())
            : null;

    internal static ArrheniusRecord? Arrhenius(SeriesFindings? f) =>
        f?.Temperature?.Arrhenius is { } a
            ? new ArrheniusRecord(Est(a.ActivationEnergy), Est(a.PreExponential), Est(a.RateConstantAtReference), a.ReferenceTemperatureK,
                a.Correlation, a.CorrelationLnAEa, a.LinearCheck is { } lc ? Est(lc) : null, FitStats(a.Fit))
            : null;

    internal static EyringRecord? Eyring(SeriesFindings? f) =>
        f?.Temperature?.Eyring is { } e
            ? new EyringRecord(Est(e.EnthalpyOfActivation), Est(e.EntropyOfActivation), Est(e.GibbsEnergyOfActivation), e.AtTemperatureK,
                e.Correlation, FitStats(e.Fit))
            : null;

    internal static GlobalFitRecord? GlobalFit(SeriesFindings? f) =>
        f?.GlobalFit is { } gf
            ? new GlobalFitRecord(Orders(gf.Orders), gf.RateConstants.Select(kv => new GroupRateConstantRecord(kv.Key, RateConstant(kv.Value))).ToList(),
                gf.Runs, FitStats(gf.Fit))
            : null;

    internal static List<OrderRecord> Orders(IReadOnlyList<Order> orders) =>
        orders.Select(o => new OrderRecord(o.Species, o.Value, o.StdError, o.Dof, [o.Ci95Low, o.Ci95High], o.LawChoiceStdError, o.Method)).ToList();

    private static RateConstantRecord? RateConstant(Series.RateConstant? k) =>
        k is null ? null : new RateConstantRecord(k.Value, k.StdError, k.Unit, k.Dof, [k.Ci95Low, k.Ci95High], k.Method, k.LawChoiceStdError);

    private static EstimateRecord Est(Estimate e) => new(e.Value, e.StdError, e.Unit, e.Dof, [e.Ci95Low, e.Ci95High], e.Method);

    private static FitStatsRecord? FitStats(FitResult? f) =>
        f is null ? null : new FitStatsRecord(f.Model, f.Exit.ToString(), f.Converged, f.PointCount, f.DegreesOfFreedom, f.ChiSquare, f.ReducedChiSquare, f.AicC);
}
