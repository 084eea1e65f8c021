using static TraceKin.Reports.JsonNumbers;
using System.Text.Json;
using TraceKin.Fitting;
using TraceKin.Series;

namespace TraceKin.Reports;

/// <summary>
/// The Series stage's model results inside summary.json, as a separate block of top-level fields: "chosenLaw", "design",
/// "powerLaw", "saturation", "otherLaws" (only when a competing law without a block of its own was fitted), "temperature",
/// "arrhenius", "eyring", "globalFit" (documented in docs/formats.md). Absent results are null.
/// </summary>
public static class SeriesModelsJson
{
    public static void Write(Utf8JsonWriter w, SeriesFindings? f)
    {
        w.WriteString("chosenLaw", f?.ChosenLaw);
        if (f?.Design is { } d)
        {
            w.WriteStartObject("design");
            w.WriteStartArray("species");
            foreach (var s in d.Species) w.WriteStringValue(s);
            w.WriteEndArray();
            Num(w, "conditionNumber", d.ConditionNumber);
            w.WriteBoolean("separable", d.Separable);
            w.WriteStartArray("confounded");
            foreach (var set in d.Confounded)
            {
                w.WriteStartArray();
                foreach (var s in set) w.WriteStringValue(s);
                w.WriteEndArray();
            }
            w.WriteEndArray();
            w.WriteEndObject();
        }
        else w.WriteNull("design");

        if (f is { PowerLawFit: not null } || f?.LogLogOrders.Count > 0)
        {
            w.WriteStartObject("powerLaw");
            Orders(w, "logLogOrders", f!.LogLogOrders);
            if (f.RoundedOrders is { } ro)
            {
                w.WriteStartObject("roundedOrders");
                foreach (var (sp, v) in ro.OrderBy(kv => kv.Key, StringComparer.Ordinal)) Num(w, sp, v);
                w.WriteEndObject();
            }
            else w.WriteNull("roundedOrders");
            w.WriteStartArray("orderVerdicts");
            foreach (var v in f.OrderVerdicts)
            {
                w.WriteStartObject();
                w.WriteString("species", v.Species);
                Num(w, "order", v.Order);
                Num(w, "simpleValue", v.SimpleValue);
                w.WriteString("verdict", v.Verdict switch
                {
                    OrderVerdictKind.Equivalent => "equivalent",
                    OrderVerdictKind.ConsistentButImprecise => "consistent-but-imprecise",
                    _ => "different",
                });
                Num(w, "margin", v.Margin);
                Pair(w, "ci90", v.Ci90Low, v.Ci90High);
                Num(w, "pLower", v.PLower);
                Num(w, "pUpper", v.PUpper);
                w.WriteString("text", v.Text);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            RateConstant(w, "rateConstantAtFittedOrders", f.RateConstantAtFittedOrders);
            w.WriteStartArray("curvature");
            foreach (var c in f.Curvature)
            {
                w.WriteStartObject();
                w.WriteString("species", c.Species);
                Num(w, "quadratic", c.Quadratic);
                Num(w, "stdError", c.StdError);
                w.WriteNumber("dof", c.Dof);
                Num(w, "pValue", c.PValue);
                w.WriteBoolean("significant", c.Significant);
                Num(w, "localOrderAtLowest", c.LocalOrderAtLowest);
                Num(w, "localOrderAtHighest", c.LocalOrderAtHighest);
                w.WriteBoolean("relevant", c.Relevant);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            FitStats(w, "fit", f.PowerLawFit);
            w.WriteEndObject();
        }
        else w.WriteNull("powerLaw");

        if (f?.Saturation is { } s0)
        {
            w.WriteStartObject("saturation");
            w.WriteString("substrate", s0.Substrate);
            Est(w, "vmax", s0.Vmax);
            Est(w, "km", s0.Km);
            Orders(w, "coReactantOrders", s0.CoReactantOrders);
            Num(w, "aiccPowerLaw", s0.AiccPowerLaw);
            Num(w, "aiccSaturation", s0.AiccSaturation);
            Num(w, "evidenceRatio", s0.EvidenceRatio);
            w.WriteString("preferred", s0.Preferred);
            if (s0.CrossCheck is { } cc)
            {
                w.WriteStartObject("doubleReciprocal");
                Num(w, "vmax", cc.Vmax);
                Num(w, "km", cc.Km);
                w.WriteString("note", "cross-check only (1/v0 against 1/[S]0 line); not an estimate");
                w.WriteEndObject();
            }
            else w.WriteNull("doubleReciprocal");
            FitStats(w, "fit", s0.Fit);
            w.WriteEndObject();
        }
        else w.WriteNull("saturation");

        // Competing laws without a block of their own (SeriesLaws): written only when there is one, in registry order.
        if (f?.OtherLaws is { Count: > 0 } others)
        {
            w.WriteStartArray("otherLaws");
            foreach (var l in others)
            {
                w.WriteStartObject();
                w.WriteString("law", l.Law);
                w.WriteString("formula", l.Formula);
                w.WriteStartArray("estimates");
                foreach (var est in l.Estimates)
                {
                    w.WriteStartObject();
                    w.WriteString("name", est.Name);
                    EstimateFields(w, est.Value, est.StdError, est.Unit, est.Dof, est.Ci95Low, est.Ci95High, est.Method);
                    w.WriteEndObject();
                }
                w.WriteEndArray();
                Num(w, "aiccPowerLaw", l.AiccPowerLaw);
                Num(w, "aicc", l.Aicc);
                Num(w, "evidenceRatio", l.EvidenceRatio);
                w.WriteBoolean("usedInstead", l.UsedInstead);
                FitStats(w, "fit", l.Fit);
                w.WriteEndObject();
            }
            w.WriteEndArray();
        }

        var t = f?.Temperature;
        if (t is not null)
        {
            w.WriteStartObject("temperature");
            w.WriteStartArray("groups");
            foreach (var g in t.Groups)
            {
                w.WriteStartObject();
                Num(w, "temperature", g.TemperatureK);
                w.WriteStartArray("runs");
                foreach (var r in g.Runs) w.WriteStringValue(r);
                w.WriteEndArray();
                RateConstant(w, "rateConstant", g.RateConstant);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteEndObject();
        }
        else w.WriteNull("temperature");

        if (t?.Arrhenius is { } a)
        {
            w.WriteStartObject("arrhenius");
            Est(w, "activationEnergy", a.ActivationEnergy);
            Est(w, "preExponential", a.PreExponential);
            Est(w, "rateConstantAtReference", a.RateConstantAtReference);
            Num(w, "referenceTemperature", a.ReferenceTemperatureK);
            Num(w, "correlation", a.Correlation);
            Num(w, "correlationLnAEa", a.CorrelationLnAEa);
            if (a.LinearCheck is { } lc) Est(w, "linearCheck", lc);
            else w.WriteNull("linearCheck");
            FitStats(w, "fit", a.Fit);
            w.WriteEndObject();
        }
        else w.WriteNull("arrhenius");

        if (t?.Eyring is { } e)
        {
            w.WriteStartObject("eyring");
            Est(w, "enthalpyOfActivation", e.EnthalpyOfActivation);
            Est(w, "entropyOfActivation", e.EntropyOfActivation);
            Est(w, "gibbsEnergyOfActivation", e.GibbsEnergyOfActivation);
            Num(w, "temperature", e.AtTemperatureK);
            Num(w, "correlation", e.Correlation);
            FitStats(w, "fit", e.Fit);
            w.WriteEndObject();
        }
        else w.WriteNull("eyring");

        if (f?.GlobalFit is { } gf)
        {
            w.WriteStartObject("globalFit");
            Orders(w, "orders", gf.Orders);
            w.WriteStartArray("rateConstants");
            foreach (var (group, k) in gf.RateConstants)
            {
                w.WriteStartObject();
                w.WriteString("group", group);
                RateConstant(w, "rateConstant", k);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteNumber("runs", gf.Runs);
            FitStats(w, "fit", gf.Fit);
            w.WriteEndObject();
        }
        else w.WriteNull("globalFit");
    }


    private static void RateConstant(Utf8JsonWriter w, string name, Series.RateConstant? k)
    {
        if (k is null) { w.WriteNull(name); return; }
        w.WriteStartObject(name);
        EstimateFields(w, k.Value, k.StdError, k.Unit, k.Dof, k.Ci95Low, k.Ci95High, k.Method);
        Num(w, "lawChoiceStdError", k.LawChoiceStdError);
        w.WriteEndObject();
    }

    private static void Est(Utf8JsonWriter w, string name, Estimate e)
    {
        w.WriteStartObject(name);
        EstimateFields(w, e.Value, e.StdError, e.Unit, e.Dof, e.Ci95Low, e.Ci95High, e.Method);
        w.WriteEndObject();
    }

    private static void FitStats(Utf8JsonWriter w, string name, FitResult? f)
    {
        if (f is null) { w.WriteNull(name); return; }
        w.WriteStartObject(name);
        w.WriteString("model", f.Model);
        w.WriteString("exit", f.Exit.ToString());
        w.WriteBoolean("converged", f.Converged);
        w.WriteNumber("points", f.PointCount);
        w.WriteNumber("dof", f.DegreesOfFreedom);
        Num(w, "chiSquare", f.ChiSquare);
        Num(w, "reducedChiSquare", f.ReducedChiSquare);
        Num(w, "aicc", f.AicC);
        w.WriteEndObject();
    }
}
