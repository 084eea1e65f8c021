using System.Collections;
using System.Globalization;
using System.Reflection;
using TraceKin.Analysis;
using TraceKin.Series;

namespace TraceKin.Reports;

/// <summary>
/// report.html: one self-contained page per series that a chemist can open or print. Plots are embedded as PNG data
/// URIs (the bytes <see cref="SeriesOutputs"/> drew and wrote into plots/ in the same pass, handed over in memory as
/// <see cref="ReportPlots"/>), so the file needs no network and no script.
/// Problems come first (rejected files, problem warnings, failed chosen fits, outputs that could not be written; notes
/// folded below them), then results, runs, plots, settings with their source, method notes, cautions and the inputs'
/// SHA-256 (as taken when the inputs were read). No time stamps: the same inputs give the same bytes.
/// </summary>
public static class ReportHtml
{
    public const string FileName = "report.html";

    /// <summary>Findings properties drawn by dedicated sections; any other property is rendered generically.</summary>
    private static readonly HashSet<string> KnownFindings =
    [
        nameof(SeriesFindings.Orders), nameof(SeriesFindings.RateConstant), nameof(SeriesFindings.RateConstantAtFittedOrders),
        nameof(SeriesFindings.RoundedOrders), nameof(SeriesFindings.OrderVerdicts), nameof(SeriesFindings.Saturation), nameof(SeriesFindings.PerRunK), nameof(SeriesFindings.PairRatios), nameof(SeriesFindings.PairCount),
        nameof(SeriesFindings.OrderFit), nameof(SeriesFindings.RunsUsed), nameof(SeriesFindings.Warnings),
        nameof(SeriesFindings.OtherLaws),
    ];

    /// <summary>Writes report.html into <paramref name="outDir"/>; <paramref name="plots"/> null leaves the plots out (analyse --no-plots).</summary>
    public static void Write(SeriesResult result, string outDir, ReportPlots? plots) =>
        AtomicFile.Write(Path.Combine(outDir, FileName), stream => WriteTo(result, plots, stream), root: outDir);

    /// <summary>The page streamed to <paramref name="stream"/> as UTF-8 (no byte order mark), never held whole in memory.</summary>
    public static void WriteTo(SeriesResult result, ReportPlots? plots, Stream stream)
    {
        using var writer = new StreamWriter(stream, new System.Text.UTF8Encoding(false), 1 << 16, leaveOpen: true);
        Render(result, plots, new Html(writer));
        writer.Flush();
    }

    /// <summary>The page as text; <paramref name="plots"/> null leaves the plots out (analyse --no-plots).</summary>
    public static string Render(SeriesResult r, ReportPlots? plots)
    {
        var h = new Html();
        Render(r, plots, h);
        return h.ToString();
    }

    private static void Render(SeriesResult r, ReportPlots? plots, Html h)
    {
        h.Raw("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
            .Raw("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
            .Element("title", $"{r.Name} — TraceKin series report")
            .Raw("<style>\n").Raw(ReportStyle.Css).Raw("</style>\n</head>\n<body>\n<main>\n");

        h.Raw("<header>\n").Element("p", $"TraceKin {r.ToolVersion} · series report", "class=\"kicker\"").Element("h1", r.Name);
        if (r.Config is { Description.Length: > 0 } c) h.Element("p", c.Description, "class=\"description\"");
        h.Element("p", $"{r.Runs.Count} run(s) analysed, {r.Rejected.Count} input(s) rejected.", "class=\"counts\"");
        h.Raw("</header>\n");

        Attention(h, r);
        Results(h, r);
        Runs(h, r);
        Replicates(h, r);
        LawFits(h, r);
        Plots(h, r, plots);
        Settings(h, r);
        Notes(h, "methods", "Method notes", ReportNotes.MethodsFor(r.Config));
        Notes(h, "cautions", "Cautions", ReportNotes.Cautions);
        Provenance(h, r);
        h.Raw("</main>\n</body>\n</html>\n");
    }

    private static void Attention(Html h, SeriesResult r)
    {
        var all = WarningTiers.All(r);
        var unconverged = WarningTiers.Unconverged(r);
        var problems = all.Where(w => !WarningTiers.IsNote(w)).ToList();
        var notes = all.Where(WarningTiers.IsNote).ToList();
        var failedChosen = unconverged.Where(f => f.Chosen).ToList();
        var failedCandidates = unconverged.Where(f => !f.Chosen).ToList();
        var orderFitBad = r.Findings?.OrderFit is { Converged: false };
        var clear = WarningTiers.Clear(r);
        h.Raw($"<section id=\"attention\" class=\"{(clear ? "all-clear" : "needs-attention")}\">\n");
        h.Element("h2", clear ? "Checks" : "Needs attention");
        if (clear)
            h.Element("p", "No input was rejected and nothing needs attention" + (notes.Count + failedCandidates.Count > 0 ? "; the notes below record choices and alternatives." : "."));
        if (r.Rejected.Count > 0)
        {
            h.Raw("<div id=\"rejected\" class=\"box rejected\">\n").Element("h3", $"Rejected inputs ({r.Rejected.Count}) — not part of the results");
            h.Raw("<ul>\n");
            foreach (var p in r.Rejected)
            {
                var where = p.File + (p.Line > 0 ? $", line {p.Line}" : "") + (p.Column > 0 ? $", column {p.Column}" : "") + (p.Key is null ? "" : $", setting {p.Key}");
                h.Raw("<li class=\"problem\">").Raw("<span class=\"where\">").Text(where).Raw("</span>: found ").Text(p.Found)
                    .Raw("; expected ").Text(p.Expected).Raw(".");
                if (!string.IsNullOrWhiteSpace(p.Hint)) h.Raw(" <span class=\"hint\">Hint: ").Text(p.Hint).Raw("</span>");
                h.Raw("</li>\n");
            }
            h.Raw("</ul>\n</div>\n");
        }
        if (problems.Count > 0 || failedChosen.Count > 0 || orderFitBad)
        {
            h.Raw("<div id=\"warnings\" class=\"box warnings\">\n").Element("h3", $"Problems ({problems.Count + failedChosen.Count + (orderFitBad ? 1 : 0)})");
            var total = problems.Count + failedChosen.Count + (orderFitBad ? 1 : 0);
            if (total > MaxAttentionItems)
            {
                // Many problems (a large batch): one line per kind first, with its count and the first runs it hit, so
                // the page's first screen still says what went wrong; the whole list folded below it.
                h.Raw("<ul class=\"by-kind\">\n");
                foreach (var g in problems.Select(w => (w.Code, w.Where, w.Message)).Concat(failedChosen.Select(f => ("fit-not-converged", f.Run, f.Message + ".")))
                    .GroupBy(x => x.Item1).OrderByDescending(g => g.Count()))
                {
                    var first = g.First();
                    var runs = string.Join(", ", g.Take(5).Select(x => x.Item2)) + (g.Count() > 5 ? $" and {g.Count() - 5} more" : "");
                    h.Raw($"<li class=\"warning\" {Html.Attr("data-code", g.Key)}>").Raw("<span class=\"where\">").Text($"{g.Count()} × {g.Key}").Raw("</span>: ")
                        .Text($"{runs}. First: {first.Item3}").Raw("</li>\n");
                }
                if (orderFitBad) WarningItem(h, "warning flagged-fit", "fit-not-converged", "orders", "the order fit did not converge; its numbers are not results.");
                h.Raw("</ul>\n<details class=\"all-problems\">\n").Element("summary", $"Every problem, one line each ({total})");
            }
            h.Raw("<ul>\n");
            foreach (var w in problems) WarningItem(h, "warning", w.Code, w.Where, w.Message);
            foreach (var f in failedChosen) WarningItem(h, "warning flagged-fit", "fit-not-converged", f.Run, f.Message + ".");
            if (orderFitBad && total <= MaxAttentionItems) WarningItem(h, "warning flagged-fit", "fit-not-converged", "orders", "the order fit did not converge; its numbers are not results.");
            h.Raw("</ul>\n");
            if (total > MaxAttentionItems) h.Raw("</details>\n");
            h.Raw("</div>\n");
        }
        if (notes.Count > 0 || failedCandidates.Count > 0)
        {
            // Folded: these leave the results standing, and a reader opens them when the choice matters.
            h.Raw("<details id=\"notes\" class=\"box notes\">\n").Element("summary", $"Notes ({notes.Count + failedCandidates.Count}): choices made, alternatives not chosen, cautions");
            h.Raw("<ul>\n");
            foreach (var w in notes) WarningItem(h, "note", w.Code, w.Where, w.Message);
            foreach (var f in failedCandidates) WarningItem(h, "note", "candidate-fit-not-converged", f.Run, f.Message + ".");
            h.Raw("</ul>\n</details>\n");
        }
        h.Raw("</section>\n");
    }

    /// <summary>Problems listed one by one on the first screen; beyond, one line per kind and the full list folded.</summary>
    public const int MaxAttentionItems = 25;

    private static void WarningItem(Html h, string cls, string code, string where, string message)
    {
        h.Raw($"<li class=\"{cls}\" {Html.Attr("data-code", code)}><span class=\"where\">").Text(where).Raw("</span>: ").Text(message);
        if (!code.StartsWith("fit-", StringComparison.Ordinal) && !code.StartsWith("candidate-", StringComparison.Ordinal))
            h.Raw(" <span class=\"code\">").Text(code).Raw("</span>");
        h.Raw("</li>\n");
    }

    private static void Results(Html h, SeriesResult r)
    {
        h.Raw("<section id=\"results\">\n").Element("h2", "Series results");
        var f = r.Findings;
        if (f is null || (f.Orders.Count == 0 && f.RateConstant is null))
        {
            h.Element("p", "No orders or rate constant could be determined from the analysed runs (see the checks above).", "class=\"none\"");
            if (f is not null) Extras(h, f);
            h.Raw("</section>\n");
            return;
        }
        Headline(h, f);
        if (f.Orders.Count > 0)
        {
            h.Element("h3", "Reaction orders in " + string.Join(", ", f.Orders.Select(o => o.Species)));
            h.Raw("<table class=\"results orders\">\n<thead><tr><th>species</th><th>order n ± SE</th><th>95 % interval</th><th>dof</th><th>method</th></tr></thead>\n<tbody>\n");
            foreach (var o in f.Orders)
            {
                var sp = Html.Attr("data-species", o.Species);
                h.Raw("<tr>").Element("td", o.Species, "class=\"name\"")
                    .Raw($"<td class=\"num\" data-quantity=\"order\" {sp} {Exact(o.Value, o.StdError)}>").Text(ReportNumber.Measured(o.Value, o.StdError)).Raw("</td>")
                    .Raw($"<td class=\"num\" data-quantity=\"order-ci\" {sp}>").Text(ReportNumber.Interval(o.Value, o.StdError, o.Ci95Low, o.Ci95High)).Raw("</td>")
                    .Raw($"<td class=\"num\">{o.Dof.ToString(CultureInfo.InvariantCulture)}</td>").Element("td", o.Method).Raw("</tr>\n");
            }
            h.Raw("</tbody>\n</table>\n");
            foreach (var v in f.OrderVerdicts)
                h.Element("p", v.Text + ".", $"class=\"note verdict\" data-verdict=\"{v.Verdict}\"");
            if (f.RoundedOrders is { Count: > 0 } ro)
                h.Element("p", "Every order is equivalent to a simple value within the practical margin, so the headline k is computed at the rounded orders: " +
                    string.Join(", ", ro.OrderBy(kv => kv.Key, StringComparer.Ordinal).Select(kv => $"n({kv.Key}) = {kv.Value.ToString(CultureInfo.InvariantCulture)}")) + ".", "class=\"note\"");
        }
        if (f.RateConstant is { } k || f.RateConstantAtFittedOrders is not null)
        {
            h.Element("h3", "Rate constant");
            h.Raw("<table class=\"results rate-constants\">\n<thead><tr><th></th><th>k ± SE</th><th>95 % interval</th><th>unit</th><th>dof</th><th>method</th></tr></thead>\n<tbody>\n");
            if (f.RateConstant is { } head) RateConstantRow(h, "k (headline)", "rate-constant", head);
            if (f.RateConstantAtFittedOrders is { } fitted && !ReferenceEquals(fitted, f.RateConstant) && fitted != f.RateConstant)
                RateConstantRow(h, "k at the fitted orders", "rate-constant-fitted", fitted);
            h.Raw("</tbody>\n</table>\n");
        }
        if (f.PairRatios.Count > 0)
        {
            h.Element("h3", "Orders from pairs of runs");
            h.Raw("<table class=\"results pairs\">\n<thead><tr><th>runs</th><th>species</th><th>[X]0 ratio</th><th>v0 ratio</th><th>order ± SE</th></tr></thead>\n<tbody>\n");
            foreach (var p in f.PairRatios.Take(SummaryJson.ListedPairRatios))
                h.Raw("<tr>").Element("td", $"{p.RunA} / {p.RunB}").Element("td", p.Species)
                    .Element("td", ReportNumber.Plain(p.ConcentrationRatio), "class=\"num\"").Element("td", ReportNumber.Plain(p.RateRatio), "class=\"num\"")
                    .Element("td", ReportNumber.Measured(p.Order, p.StdError), "class=\"num\"").Raw("</tr>\n");
            h.Raw("</tbody>\n</table>\n");
            // A long table says little the orders do not: the first pairs here, every listed pair in the CSV table.
            if (f.PairRatios.Count > SummaryJson.ListedPairRatios)
                h.Raw("<p class=\"note\">").Text(f.PairCount > f.PairRatios.Count
                        ? FormattableString.Invariant($"The first {SummaryJson.ListedPairRatios} pairs in plan order, of {f.PairRatios.Count} listed ({f.PairCount} in all); every listed pair is in ")
                        : FormattableString.Invariant($"The first {SummaryJson.ListedPairRatios} pairs in plan order, of {f.PairRatios.Count}; every pair is in "))
                    .Raw($"<a href=\"{PairRatiosCsv.FileName}\">{PairRatiosCsv.FileName}</a>").Text(".").Raw("</p>\n");
        }
        if (f.Saturation is { } sat) LawChoice(h, f, sat);
        foreach (var other in f.OtherLaws) OtherLaw(h, f, other);
        Extras(h, f);
        if (f.OrderFit is { } fit)
        {
            h.Element("h3", "Order fit in detail");
            h.Element("pre", fit.ToReport(), "class=\"fit-report\"");
        }
        h.Raw("</section>\n");
    }

    /// <summary>
    /// The first lines a chemist reads: the rate law with its constant, interval and unit, and the temperature
    /// dependence when the series has one. A constant whose interval is wider than its value is "not determined".
    /// </summary>
    private static void Headline(Html h, SeriesFindings f)
    {
        // The orders the headline k belongs to: the rounded ones when k was computed at them, else the fitted ones.
        string Power(string species, string n) => $"[{species}]^{n}";
        var orders = f.Orders.Select(o => (o.Species, N: f.RoundedOrders is { } ro && ro.TryGetValue(o.Species, out var rn)
            ? rn.ToString(CultureInfo.InvariantCulture) : ReportNumber.Plain(o.Value, 3))).ToList();
        string law;
        var constants = new List<string>();
        if (f.ChosenLaw == "saturation" && f.Saturation is { } sat)
        {
            var others = sat.CoReactantOrders.Select(o => "·" + Power(o.Species, ReportNumber.Plain(o.Value, 3)));
            law = $"v = Vmax·[{sat.Substrate}]/(Km + [{sat.Substrate}])" + string.Concat(others);
            constants.Add(ReportNumber.Result("Vmax", sat.Vmax.Value, sat.Vmax.StdError, sat.Vmax.Unit, sat.Vmax.Ci95Low, sat.Vmax.Ci95High));
            constants.Add(ReportNumber.Result("Km", sat.Km.Value, sat.Km.StdError, sat.Km.Unit, sat.Km.Ci95Low, sat.Km.Ci95High));
        }
        else if (f.OtherLaws.FirstOrDefault(l => l.Law == f.ChosenLaw) is { } other)
        {
            law = other.Formula;
            constants.AddRange(other.Estimates.Select(e => ReportNumber.Result(e.Name, e.Value, e.StdError, e.Unit, e.Ci95Low, e.Ci95High)));
        }
        else if (orders.Count > 0)
        {
            law = "v = k·" + string.Join("·", orders.Select(o => Power(o.Species, o.N)));
            if (f.RateConstant is { } k) constants.Add(ReportNumber.Result("k", k.Value, k.StdError, k.Unit, k.Ci95Low, k.Ci95High));
            else if (f.Temperature is { Groups.Count: > 0 }) constants.Add("k depends on temperature (below)");
        }
        else return;
        h.Raw("<p id=\"rate-law\" class=\"headline\">").Text(string.Join(", ", [law, .. constants])).Raw("</p>\n");
        var temperature = new List<string>();
        if (f.Temperature?.Arrhenius is { } a)
            temperature.Add(ReportNumber.Result("Ea", a.ActivationEnergy.Value, a.ActivationEnergy.StdError, a.ActivationEnergy.Unit, a.ActivationEnergy.Ci95Low, a.ActivationEnergy.Ci95High));
        if (f.Temperature?.Eyring is { } e)
        {
            temperature.Add(ReportNumber.Result("ΔH‡", e.EnthalpyOfActivation.Value, e.EnthalpyOfActivation.StdError, e.EnthalpyOfActivation.Unit, e.EnthalpyOfActivation.Ci95Low, e.EnthalpyOfActivation.Ci95High));
            // ΔS‡ may lie near zero, so its size is no test of whether it is known: printed with its interval as it is.
            temperature.Add("ΔS‡ = " + ReportNumber.Estimate(e.EntropyOfActivation.Value, e.EntropyOfActivation.StdError, e.EntropyOfActivation.Unit, e.EntropyOfActivation.Ci95Low, e.EntropyOfActivation.Ci95High));
        }
        if (temperature.Count > 0) h.Raw("<p id=\"temperature-dependence\" class=\"headline\">").Text(string.Join("; ", temperature)).Raw("</p>\n");
    }

    private static void RateConstantRow(Html h, string label, string quantity, RateConstant k) =>
        h.Raw("<tr>").Element("td", label, "class=\"name\"")
            .Raw($"<td class=\"num\" data-quantity=\"{quantity}\" {Exact(k.Value, k.StdError)}>")
            .Text(ReportNumber.Determined(k.Value, k.Ci95Low, k.Ci95High) ? ReportNumber.Measured(k.Value, k.StdError) : "not determined").Raw("</td>")
            .Raw($"<td class=\"num\" data-quantity=\"{quantity}-ci\">").Text(ReportNumber.Interval(k.Value, k.StdError, k.Ci95Low, k.Ci95High)).Raw("</td>")
            .Element("td", k.Unit).Raw($"<td class=\"num\">{k.Dof.ToString(CultureInfo.InvariantCulture)}</td>").Element("td", k.Method).Raw("</tr>\n");

    /// <summary>
    /// Power law or saturation, in our words: the difference in AICc, the Akaike weights of the two laws (Burnham &amp;
    /// Anderson 2002, eq. 2.14), one sentence with the rule that decided, then Vmax and Km ("not determined" when their
    /// interval is wider than the value) and the saturation fit itself, folded.
    /// </summary>
    private static void LawChoice(Html h, SeriesFindings f, Series.SaturationFindings sat)
    {
        var ci = CultureInfo.InvariantCulture;
        h.Raw("<div id=\"law-choice\" class=\"extra\">\n").Element("h3", $"Power law or saturation in {sat.Substrate}");
        var delta = sat.AiccPowerLaw - sat.AiccSaturation;
        var wSat = 1 / (1 + Math.Exp(-delta / 2));
        h.Element("p", string.Format(ci,
            "The {0} has the lower AICc, by {1} (AICc of the power law minus that of the saturation law v0 = Vmax·[{2}]0/(Km + [{2}]0): {3}); on the rates alone that gives the saturation law an Akaike weight of {4} and the power law {5}.",
            delta >= 0 ? "saturation law" : "power law", ReportNumber.Plain(Math.Abs(delta), 3), sat.Substrate, ReportNumber.Plain(delta, 3),
            ReportNumber.Plain(wSat, 2), ReportNumber.Plain(1 - wSat, 2)));
        var rule = string.Format(ci,
            "Rule: the saturation law is used when its AICc is the lower and its Km lies below {0} times the largest [{1}]0 measured (beyond that the series never approaches saturation). Used here: the {2} law.",
            Series.SaturationAnalysis.KmBeyondRange.ToString(ci), sat.Substrate, f.ChosenLaw);
        h.Element("p", rule, "class=\"note\"");
        h.Element("p", ReportNumber.Result("Vmax", sat.Vmax.Value, sat.Vmax.StdError, sat.Vmax.Unit, sat.Vmax.Ci95Low, sat.Vmax.Ci95High) + "; " +
            ReportNumber.Result("Km", sat.Km.Value, sat.Km.StdError, sat.Km.Unit, sat.Km.Ci95Low, sat.Km.Ci95High) + ".");
        foreach (var o in sat.CoReactantOrders)
            h.Element("p", $"In the saturation law, n({o.Species}) = {ReportNumber.Measured(o.Value, o.StdError)} (95 % interval {ReportNumber.Interval(o.Value, o.StdError, o.Ci95Low, o.Ci95High)}).");
        if (sat.CrossCheck is { } dr)
            h.Element("p", $"Double-reciprocal line (display only, never the result): Vmax ≈ {ReportNumber.Plain(dr.Vmax)}, Km ≈ {ReportNumber.Plain(dr.Km)} mol/L.", "class=\"note\"");
        h.Raw("<details><summary>The saturation fit in detail</summary>\n").Element("pre", sat.Fit.ToReport(), "class=\"fit-report\"").Raw("</details>\n");
        h.Raw("</div>\n");
    }

    /// <summary>
    /// A competing law without a section of its own (<see cref="SeriesFindings.OtherLaws"/>): the AICc comparison with
    /// the power law and its Akaike weight (Burnham &amp; Anderson 2002, eq. 2.14), its estimates, and its fit, folded.
    /// </summary>
    private static void OtherLaw(Html h, SeriesFindings f, Series.CompetingLawFindings l)
    {
        var ci = CultureInfo.InvariantCulture;
        h.Raw($"<div class=\"extra\" {Html.Attr("data-law", l.Law)}>\n").Element("h3", $"Power law or {l.Law} law");
        var delta = l.AiccPowerLaw - l.Aicc;
        var w = 1 / (1 + Math.Exp(-delta / 2));
        h.Element("p", string.Format(ci,
            "The {0} has the lower AICc, by {1} (AICc of the power law minus that of {2}: {3}); on the rates alone that gives the {4} law an Akaike weight of {5} and the power law {6}. Used here: the {7} law.",
            delta >= 0 ? $"{l.Law} law" : "power law", ReportNumber.Plain(Math.Abs(delta), 3), l.Formula, ReportNumber.Plain(delta, 3), l.Law,
            ReportNumber.Plain(w, 2), ReportNumber.Plain(1 - w, 2), f.ChosenLaw));
        if (l.Estimates.Count > 0)
            h.Element("p", string.Join("; ", l.Estimates.Select(e => ReportNumber.Result(e.Name, e.Value, e.StdError, e.Unit, e.Ci95Low, e.Ci95High))) + ".");
        h.Raw($"<details><summary>The {l.Law} fit in detail</summary>\n").Element("pre", l.Fit.ToReport(), "class=\"fit-report\"").Raw("</details>\n");
        h.Raw("</div>\n");
    }

    /// <summary>Round-trip values as attributes, so a reader (or a test) can get the exact numbers behind the printed text.</summary>
    private static string Exact(double value, double se) =>
        $"data-value=\"{R(value)}\" data-std-error=\"{R(se)}\"";

    private static string R(double v) => double.IsFinite(v) ? v.ToString("R", CultureInfo.InvariantCulture) : "";

    /// <summary>
    /// Results the Series stage adds beyond orders and k (e.g. temperature dependence) are drawn generically: an estimate
    /// (a record with Value and StdError) as value ± SE with its unit and interval, anything else as a small table.
    /// </summary>
    private static void Extras(Html h, SeriesFindings f)
    {
        foreach (var p in typeof(SeriesFindings).GetProperties(BindingFlags.Public | BindingFlags.Instance).OrderBy(p => p.MetadataToken))
        {
            if (KnownFindings.Contains(p.Name) || p.GetIndexParameters().Length > 0) continue;
            var v = p.GetValue(f);
            if (v is null || v is ICollection { Count: 0 }) continue;
            h.Raw($"<div class=\"extra\" {Html.Attr("data-finding", p.Name)}>\n").Element("h3", Heading(p.Name, f));
            if (v is IReadOnlyList<Series.Order> orders)
            {
                // Orders always name their species.
                h.Raw("<table class=\"results\">\n<thead><tr><th>species</th><th>order n ± SE</th><th>95 % interval</th><th>method</th></tr></thead>\n<tbody>\n");
                foreach (var o in orders)
                    h.Raw("<tr>").Element("td", o.Species, "class=\"name\"").Element("td", ReportNumber.Measured(o.Value, o.StdError), "class=\"num\"")
                        .Element("td", ReportNumber.Interval(o.Value, o.StdError, o.Ci95Low, o.Ci95High), "class=\"num\"").Element("td", o.Method).Raw("</tr>\n");
                h.Raw("</tbody>\n</table>\n</div>\n");
                continue;
            }
            Generic(h, v, 0);
            h.Raw("</div>\n");
        }
    }

    /// <summary>The generic rendering of one Series result, as HTML (used for results without a dedicated section).</summary>
    internal static string RenderGeneric(object? value)
    {
        var h = new Html();
        Generic(h, value, 0);
        return h.ToString();
    }

    private static void Generic(Html h, object? v, int depth)
    {
        switch (v)
        {
            case null: h.Element("p", "not available"); return;
            case string s: h.Element("p", s); return;
            case double or float or int or long or bool: h.Element("p", Scalar(v)); return;
        }
        if (depth > 3) { h.Element("p", v.ToString()); return; }
        if (v is Fitting.FitResult fit) { h.Element("pre", fit.ToReport(), "class=\"fit-report\""); return; }
        if (v is IEnumerable e and not string)
        {
            var items = e.Cast<object?>().ToList();
            if (items.Count > 0 && items.All(i => i is not null && Estimate(i) is null && !IsScalar(i)))
            {
                var props = Props(items[0]!.GetType());
                h.Raw("<table class=\"generic\">\n<thead><tr>");
                foreach (var p in props) h.Element("th", Words(p.Name));
                h.Raw("</tr></thead>\n<tbody>\n");
                foreach (var item in items)
                {
                    h.Raw("<tr>");
                    foreach (var p in props) h.Element("td", Cell(p.GetValue(item)));
                    h.Raw("</tr>\n");
                }
                h.Raw("</tbody>\n</table>\n");
            }
            else
            {
                h.Raw("<ul>\n");
                foreach (var item in items) h.Element("li", Cell(item));
                h.Raw("</ul>\n");
            }
            return;
        }
        if (Estimate(v) is { } est) { h.Element("p", est, "class=\"num estimate\""); return; }
        h.Raw("<table class=\"generic\">\n<tbody>\n");
        foreach (var p in Props(v.GetType()))
        {
            var pv = p.GetValue(v);
            if (pv is null) continue;
            h.Raw("<tr>").Element("th", Words(p.Name), "scope=\"row\"");
            if (IsScalar(pv) || Estimate(pv) is not null) h.Element("td", Cell(pv));
            else { h.Raw("<td>"); Generic(h, pv, depth + 1); h.Raw("</td>"); }
            h.Raw("</tr>\n");
        }
        h.Raw("</tbody>\n</table>\n");
    }

    private static PropertyInfo[] Props(Type t) =>
        t.GetProperties(BindingFlags.Public | BindingFlags.Instance).Where(p => p.GetIndexParameters().Length == 0 && p.Name != "EqualityContract")
            .OrderBy(p => p.MetadataToken).ToArray();

    private static bool IsScalar(object? v) => v is null or string or double or float or int or long or bool or Enum;

    private static string Cell(object? v) => IsScalar(v) ? Scalar(v) : Estimate(v!) ?? (v is IEnumerable e ? string.Join("; ", e.Cast<object?>().Select(Cell)) : v!.ToString() ?? "");

    private static string Scalar(object? v) => v switch
    {
        null => "—",
        bool b => b ? "yes" : "no",
        double d => ReportNumber.Plain(d),
        float f => ReportNumber.Plain(f),
        IFormattable x => x.ToString(null, CultureInfo.InvariantCulture),
        _ => v.ToString() ?? "",
    };

    /// <summary>"value ± SE unit (95 %: low to high)" for any record with Value and StdError, else null.</summary>
    private static string? Estimate(object v)
    {
        var t = v.GetType();
        if (t.GetProperty("Value")?.GetValue(v) is not double value || t.GetProperty("StdError")?.GetValue(v) is not double se) return null;
        // A size (k, Ea, A, Vmax, Km, ΔH‡, ΔG‡) with an interval wider than itself is not a result; ΔS‡ may lie near zero.
        if (v is Estimate { Name: not "ΔS‡" } or RateConstant && t.GetProperty("Ci95Low")?.GetValue(v) is double l0 && t.GetProperty("Ci95High")?.GetValue(v) is double h0
            && !ReportNumber.Determined(value, l0, h0))
            return ReportNumber.Result("", value, se, t.GetProperty("Unit")?.GetValue(v) as string, l0, h0).TrimStart();
        var text = ReportNumber.Measured(value, se);
        if (t.GetProperty("Unit")?.GetValue(v) is string { Length: > 0 } unit) text += " " + unit;
        if (t.GetProperty("Ci95Low")?.GetValue(v) is double lo && t.GetProperty("Ci95High")?.GetValue(v) is double hi)
            text += $" (95 % interval {ReportNumber.Interval(value, se, lo, hi)})";
        if (t.GetProperty("Method")?.GetValue(v) is string { Length: > 0 } m) text += $"; {m}";
        return text;
    }

    private static string Words(string pascal) => SettingsProvenance.Snake(pascal).Replace('_', ' ');

    /// <summary>Section headings in the trade's words, naming the species where a result is about them.</summary>
    private static string Heading(string property, SeriesFindings f)
    {
        var species = string.Join(", ", f.Orders.Select(o => o.Species));
        return property switch
        {
            nameof(SeriesFindings.LogLogOrders) => $"Orders in {species} from the log–log line (cross-check)",
            nameof(SeriesFindings.PowerLawFit) => "The power-law fit in detail",
            nameof(SeriesFindings.Design) => $"How well the runs separate the orders in {species}",
            nameof(SeriesFindings.Curvature) => $"Shape of ln v0 against ln [X]0 for {species} (curvature and local order)",
            nameof(SeriesFindings.Temperature) => "Temperature dependence: k per temperature, Arrhenius and Eyring",
            nameof(SeriesFindings.GlobalFit) => "Global fit of every run's time course",
            nameof(SeriesFindings.ChosenLaw) => "Rate law used",
            _ => Words(property),
        };
    }

    private static void Runs(Html h, SeriesResult r)
    {
        h.Raw("<section id=\"runs\">\n").Element("h2", "Runs");
        if (r.Runs.Count == 0)
        {
            h.Element("p", "No run was analysed.", "class=\"none\"");
            h.Raw("</section>\n");
            return;
        }
        var species = r.Plan?.Species ?? r.Runs.SelectMany(x => x.Plan.InitialConcentrations.Keys).Distinct().Order(StringComparer.Ordinal).ToList();
        var scales = species.ToDictionary(s => s, s => RunPlot.ConcentrationScale(r.Runs.Select(x => x.Plan.InitialConcentrations.GetValueOrDefault(s, 0)).ToArray()));
        var extra = r.Runs.SelectMany(x => x.Plan.Extra.Keys).Distinct().ToList();
        var kUnit = r.Findings?.RateConstant?.Unit ?? "";
        var used = new HashSet<string>(r.Findings?.RunsUsed ?? [], StringComparer.Ordinal);
        var units = r.Runs.Select(x => x.Rates.Headline.Unit).Distinct().ToList();
        var rateUnit = units.Count == 1 ? units[0] : "";

        if (r.Findings?.PerRunK is { Count: >= MinHistogramRuns } ks) KHistogram(h, ks, kUnit);
        h.Element("p", "Initial conditions are taken from plan.csv; the rate columns come from each run's headline estimate.", "class=\"note\"");
        h.Raw("<table class=\"runs\">\n<thead><tr><th>run</th><th>file</th><th>T (°C)</th>");
        foreach (var s in species) h.Element("th", $"[{s}]0 ({scales[s].Unit})");
        foreach (var e in extra) h.Element("th", e);
        h.Element("th", "v0 ± SE" + (rateUnit.Length > 0 ? $" ({rateUnit})" : ""));
        h.Raw("<th>dof</th><th>method</th><th>window (s)</th>");
        var hasK = r.Findings?.PerRunK.Count > 0;
        if (hasK) h.Element("th", "k for this run" + (kUnit.Length > 0 ? $" ({kUnit})" : ""));
        h.Raw("<th>warnings</th></tr></thead>\n<tbody>\n");
        bool Flagged(RunResult run) => run.Warnings.Any(w => !WarningTiers.IsNote(w)) || run.Rates.Fits.Any(f => f.Chosen && !f.Fit.Converged);
        // A large series lists the runs that need attention (flagged, or left out of the order fit) first, then the
        // others in plan order up to MaxListedRuns; runs.csv holds every run.
        var listed = r.Runs.Count <= MaxListedRuns ? r.Runs
            : r.Runs.Where(x => Flagged(x) || (used.Count > 0 && !used.Contains(x.Id)))
                .Concat(r.Runs.Where(x => !(Flagged(x) || (used.Count > 0 && !used.Contains(x.Id))))).Take(MaxListedRuns).ToList();
        // k of the listed runs only (a table of every run's k is a megabyte at 20,000 runs; runs.csv has them all).
        var listedIds = new HashSet<string>(listed.Select(x => x.Id), StringComparer.Ordinal);
        var perRunK = hasK ? r.Findings!.PerRunK.Where(k => listedIds.Contains(k.RunId)).ToDictionary(k => k.RunId) : [];
        foreach (var run in listed)
        {
            var flagged = Flagged(run);
            var cls = (flagged ? "flagged" : "") + (used.Count > 0 && !used.Contains(run.Id) ? " not-used" : "");
            h.Raw($"<tr {Html.Attr("data-run", run.Id)}{(cls.Trim().Length > 0 ? $" class=\"{cls.Trim()}\"" : "")}>")
                .Element("td", run.Id, "class=\"name\"").Element("td", run.File)
                .Element("td", run.Plan.TemperatureK is { } tk ? ReportNumber.Plain(tk - 273.15) : "—", "class=\"num\"");
            foreach (var s in species)
                h.Element("td", run.Plan.InitialConcentrations.TryGetValue(s, out var c) ? ReportNumber.Plain(c * scales[s].Factor) : "—", "class=\"num\"");
            foreach (var e in extra) h.Element("td", run.Plan.Extra.GetValueOrDefault(e, ""));
            var v = run.Rates.Headline;
            h.Raw($"<td class=\"num\" data-quantity=\"initial-rate\" {Html.Attr("data-run", run.Id)} {Exact(v.Value, v.StdError)}>")
                .Text(ReportNumber.Measured(v.Value, v.StdError) + (rateUnit.Length == 0 ? " " + v.Unit : "")).Raw("</td>")
                .Raw($"<td class=\"num\">{v.Dof.ToString(CultureInfo.InvariantCulture)}</td>").Element("td", v.Method)
                .Element("td", $"{ReportNumber.Plain(v.WindowStart)} – {ReportNumber.Plain(v.WindowEnd)}", "class=\"num\"");
            if (hasK)
                h.Element("td", perRunK.TryGetValue(run.Id, out var k) ? ReportNumber.Measured(k.Value, k.StdError) : "—", "class=\"num\"");
            h.Element("td", run.Warnings.Count == 0 ? "" : string.Join("; ", run.Warnings.Select(w => w.Message)), run.Warnings.Count > 0 ? "class=\"warn-cell\"" : "");
            h.Raw("</tr>\n");
        }
        h.Raw("</tbody>\n</table>\n");
        if (listed.Count < r.Runs.Count)
            h.Raw("<p class=\"note\">").Text($"{listed.Count} of {r.Runs.Count} runs listed (those that need attention first); every run is in ")
                .Raw("<a href=\"runs.csv\">runs.csv</a>").Text(".").Raw("</p>\n");
        if (used.Count > 0 && r.Runs.Any(x => !used.Contains(x.Id)))
            h.Element("p", "Rows marked as not used were left out of the order fit.", "class=\"note\"");
        h.Raw("</section>\n");
    }

    /// <summary>Runs up to which the report lists every run, every fit and every export's hash; beyond, it lists the
    /// runs that need attention first and links the tables that hold the rest, so the page stays small.</summary>
    public const int MaxListedRuns = 200;

    /// <summary>Fewest runs for which the distribution of k per run is drawn.</summary>
    public const int MinHistogramRuns = 20;

    /// <summary>
    /// The distribution of k per run as a bar table: 20 equal bins between the 1st and 99th percentiles (runs beyond
    /// them counted apart, so one wild run does not squeeze the rest into a bin), with the median and the spread
    /// 1.4826·MAD (a normal distribution's SD; Rousseeuw &amp; Croux 1993, from memory). A narrow, single-peaked
    /// distribution says the rate law holds across the conditions; a skewed or two-peaked one says it does not.
    /// </summary>
    private static void KHistogram(Html h, IReadOnlyList<Series.RunRateConstant> ks, string unit)
    {
        var v = ks.Select(k => k.Value).Where(double.IsFinite).Order().ToArray();
        if (v.Length < MinHistogramRuns) return;
        // Linear interpolation between order statistics (Hyndman & Fan 1996, definition 7, from memory).
        double Q(double p) => MathNet.Numerics.Statistics.SortedArrayStatistics.QuantileCustom(v, p, MathNet.Numerics.Statistics.QuantileDefinition.R7);
        var (lo, hi) = (Q(0.01), Q(0.99));
        var (median, mad) = Fitting.RobustScale.MedianAndScaleInPlace((double[])v.Clone());
        h.Raw("<figure class=\"k-distribution\">\n");
        h.Element("figcaption", $"k for each run ({v.Length} runs{(unit.Length > 0 ? $", {unit}" : "")}): median {ReportNumber.Plain(median)}, spread 1.4826·MAD {ReportNumber.Plain(mad)}");
        if (!(hi > lo))
        {
            h.Element("p", "Every run gives the same k to the digits shown.", "class=\"note\"");
            h.Raw("</figure>\n");
            return;
        }
        const int bins = 20;
        var counts = new int[bins];
        int below = 0, above = 0;
        foreach (var x in v)
        {
            if (x < lo) { below++; continue; }
            if (x > hi) { above++; continue; }
            counts[Math.Min(bins - 1, (int)((x - lo) / (hi - lo) * bins))]++;
        }
        var max = Math.Max(1, counts.Max());
        h.Raw("<table class=\"hist\">\n<thead><tr><th>k from</th><th>to</th><th>runs</th><th></th></tr></thead>\n<tbody>\n");
        if (below > 0) h.Raw("<tr>").Element("td", "", "class=\"num\"").Element("td", ReportNumber.Plain(lo), "class=\"num\"").Element("td", below.ToString(CultureInfo.InvariantCulture), "class=\"num\"").Raw("<td></td></tr>\n");
        for (var b = 0; b < bins; b++)
        {
            var width = (100.0 * counts[b] / max).ToString("0.#", CultureInfo.InvariantCulture);
            h.Raw("<tr>").Element("td", ReportNumber.Plain(lo + (hi - lo) * b / bins), "class=\"num\"").Element("td", ReportNumber.Plain(lo + (hi - lo) * (b + 1) / bins), "class=\"num\"")
                .Element("td", counts[b].ToString(CultureInfo.InvariantCulture), "class=\"num\"")
                .Raw($"<td class=\"bar\"><span style=\"width:{width}%\"></span></td></tr>\n");
        }
        if (above > 0) h.Raw("<tr>").Element("td", ReportNumber.Plain(hi), "class=\"num\"").Element("td", "", "class=\"num\"").Element("td", above.ToString(CultureInfo.InvariantCulture), "class=\"num\"").Raw("<td></td></tr>\n");
        h.Raw("</tbody>\n</table>\n</figure>\n");
    }

    /// <summary>Runs planned alike: the spread of their rates beside the fits' own standard errors, outliers named.</summary>
    private static void Replicates(Html h, SeriesResult r)
    {
        if (r.Replicates.Count == 0) return;
        var unit = r.Runs.Select(x => x.Rates.Headline.Unit).FirstOrDefault() ?? "";
        h.Raw("<section id=\"replicates\">\n").Element("h2", "Replicates");
        h.Element("p", "Runs planned with the same conditions. A spread well above the runs' own standard errors means variation between wells or vessels that no single fit sees. An outlying run has a modified z-score beyond ±3.5 (Iglewicz and Hoaglin; docs/methods.md, \"Replicates\").", "class=\"note\"");
        h.Raw("<table class=\"runs\">\n<thead><tr><th>runs</th><th>conditions</th>").Element("th", $"mean v0 ({unit})").Element("th", $"SD of v0 ({unit})")
            .Element("th", $"mean SE of v0 ({unit})").Raw("<th>SD / mean SE</th><th>outlying</th></tr></thead>\n<tbody>\n");
        foreach (var g in r.Replicates)
        {
            h.Raw(g.Outliers.Count > 0 ? "<tr class=\"flagged\">" : "<tr>").Element("td", string.Join(", ", g.Runs)).Element("td", g.Conditions())
                .Element("td", ReportNumber.Plain(g.Mean), "class=\"num\"").Element("td", ReportNumber.Plain(g.StdDev, 2), "class=\"num\"")
                .Element("td", ReportNumber.Plain(g.MeanStdError, 2), "class=\"num\"")
                .Element("td", g.MeanStdError > 0 ? ReportNumber.Plain(g.StdDev / g.MeanStdError, 2) : "—", "class=\"num\"")
                .Element("td", string.Join(", ", g.Outliers.Select(o => $"{o.Run} (z = {ReportNumber.Plain(o.Score, 2)})"))).Raw("</tr>\n");
        }
        h.Raw("</tbody>\n</table>\n</section>\n");
    }

    private static void LawFits(Html h, SeriesResult r)
    {
        var withFits = r.Runs.Where(x => x.Rates.Fits.Count > 0).ToList();
        if (withFits.Count == 0) return;
        h.Raw("<section id=\"law-fits\">\n").Element("h2", "Integrated-law fits");
        if (r.Config?.Rates.Laws is { } imposed)
            h.Element("p", $"rates.laws restricted the fits to {string.Join(", ", imposed)}: each run's chosen law is the best of these (by AICc, " +
                "with their drift variants as rates.drift says), imposed rather than chosen among every law.", "class=\"note\"");
        // Folded: the chosen law of each run is in the runs table above; this is every candidate, for whoever checks.
        var count = withFits.Sum(x => x.Rates.Fits.Count);
        if (r.Runs.Count > MaxListedRuns)
        {
            h.Raw("<p>").Text($"Every candidate fit of the {r.Runs.Count} runs (the chosen one marked) is in ")
                .Raw("<a href=\"law-fits.csv\">law-fits.csv</a>").Text(" and its parameters in ").Raw("<a href=\"law-parameters.csv\">law-parameters.csv</a>")
                .Text(", one row each (docs/formats.md, \"Per-run tables\").").Raw("</p>\n</section>\n");
            return;
        }
        h.Raw("<details class=\"fits\">\n").Element("summary", $"Every candidate fit of every run ({count} fits in {withFits.Count} runs; the chosen one is marked)");
        h.Raw("<table class=\"fits\">\n<thead><tr><th>run</th><th>model</th><th>chosen</th><th>converged</th><th>parameters (value ± SE)</th><th>reduced χ²</th><th>AICc</th></tr></thead>\n<tbody>\n");
        foreach (var run in withFits)
            foreach (var f in run.Rates.Fits)
            {
                // A run kept without its fits' parameters (a series planned beyond MaxListedRuns runs of which some were
                // rejected) points to the table that has them.
                var pars = f.Fit.Parameters.Count == 0 ? "in " + RunTables.ParametersFile
                    : string.Join("; ", f.Fit.Parameters.Select(p => $"{p.Name} = {ReportNumber.Measured(p.Value, p.StdError)}{(p.Varied ? "" : " (fixed)")}"));
                h.Raw(f.Fit.Converged ? "<tr>" : "<tr class=\"flagged\">").Element("td", run.Id).Element("td", f.Law).Element("td", f.Chosen ? "yes" : "")
                    .Element("td", f.Fit.Converged ? "yes" : $"no ({f.Fit.Exit})").Element("td", f.Fit.Converged ? pars : "not a result")
                    .Element("td", ReportNumber.Plain(f.Fit.ReducedChiSquare), "class=\"num\"").Element("td", ReportNumber.Plain(f.Fit.AicC, 6), "class=\"num\"").Raw("</tr>\n");
            }
        h.Raw("</tbody>\n</table>\n</details>\n</section>\n");
    }

    /// <summary>Runs up to which every run plot is embedded in the page.</summary>
    public const int MaxEmbeddedRunPlots = 50;

    private static void Plots(Html h, SeriesResult r, ReportPlots? plots)
    {
        h.Raw("<section id=\"plots\">\n").Element("h2", "Plots");
        if (plots is null)
        {
            h.Element("p", "Plots were not drawn for this analysis (analyse --no-plots).", "class=\"none\"");
            h.Raw("</section>\n");
            return;
        }
        var figures = new List<(string File, string Caption)>();
        var names = r.Plan is { } plan ? RunFileNames.For(plan) : RunFileNames.For(r.Runs.Select(x => x.Id));
        if (Directory.Exists(plots.PlotDir))
        {
            var runFiles = r.Runs.Select(x => (File: names.PlotFile(x.Id), Caption: $"Run {x.Id} ({x.File}): concentration, early window, fit, initial-rate tangent and residuals")).ToList();
            var runNames = new HashSet<string>(runFiles.Select(x => x.File), StringComparer.Ordinal);
            var seriesFiles = plots.SeriesFiles.Where(f => !runNames.Contains(f)).Select(f => (File: f, Caption: SeriesCaption(f)));
            figures.AddRange(seriesFiles);
            figures.AddRange(runFiles);
        }
        // Up to MaxEmbeddedRunPlots run plots travel inside the page; beyond that the page links them from the
        // plots folder next to it, so a batch of a thousand runs does not make a page of a hundred megabytes.
        var embedRuns = r.Runs.Count <= MaxEmbeddedRunPlots;
        // A large series shows inline only the plots of runs that need attention (a problem-tier warning: unresolved,
        // wrong sign, …); the others are listed as links, folded, so the page stays short and opens quickly.
        var attention = new HashSet<string>(StringComparer.Ordinal);
        var folded = new List<(string File, string Caption)>();
        if (!embedRuns)
        {
            foreach (var run in r.Runs)
                if (run.Warnings.Any(w => !WarningTiers.IsNote(w)) || !run.Rates.IsResolved) attention.Add(names.PlotFile(run.Id));
            h.Element("p", $"The {r.Runs.Count} run plots are in the plots folder next to this page (embedded only for up to {MaxEmbeddedRunPlots} runs): the {attention.Count} of runs that need attention are shown below, the others are linked at the end; keep the folder with the page.", "class=\"note\"");
        }
        var shown = 0;
        foreach (var (file, caption) in figures)
        {
            var linked = !embedRuns && file.StartsWith("run-", StringComparison.Ordinal);
            // A link in plots/ is not ours (TraceKin never writes one): its target is neither embedded nor linked.
            if (linked && !plots.OnDisk(file)) continue;
            if (linked && !attention.Contains(file))
            {
                folded.Add((file, caption));
                continue;
            }
            if (linked)
            {
                h.Raw($"<figure class=\"plot\" {Html.Attr("data-file", file)}>\n<img loading=\"lazy\" alt=\"{Html.Escape(caption)}\" {Html.Attr("src", "plots/" + file)}>\n")
                    .Element("figcaption", caption).Raw("</figure>\n");
                shown++;
                continue;
            }
            // The bytes drawn and written in this pass (a run plot a watch pass did not redraw: read from plots/).
            if (plots.Embed(file) is not { } png) continue;
            h.Raw($"<figure class=\"plot\" {Html.Attr("data-file", file)}>\n<img alt=\"{Html.Escape(caption)}\" src=\"data:image/png;base64,")
                .Raw(Convert.ToBase64String(png)).Raw("\">\n").Element("figcaption", caption).Raw("</figure>\n");
            shown++;
        }
        if (folded.Count > 0)
        {
            h.Raw($"<details id=\"other-run-plots\"><summary>Plots of the other {folded.Count} runs (links)</summary>\n<ul class=\"run-plot-links\">\n");
            foreach (var (file, caption) in folded)
                h.Raw("<li>").Raw($"<a {Html.Attr("href", "plots/" + file)}>").Text(caption).Raw("</a></li>\n");
            h.Raw("</ul>\n</details>\n");
            shown += folded.Count;
        }
        if (shown == 0) h.Element("p", "No plot files were found in the output's plots folder.", "class=\"none\"");
        h.Raw("</section>\n");
    }

    private static string SeriesCaption(string file) => file switch
    {
        OrderPlot.FileName => "Orders: ln v0 against ln [X]0 with the fitted lines",
        _ => Words(System.Text.RegularExpressions.Regex.Replace(Path.GetFileNameWithoutExtension(file), "[^A-Za-z0-9]+", " ")).Trim() + " (series plot)",
    };

    private static void Settings(Html h, SeriesResult r)
    {
        h.Raw("<section id=\"settings\">\n").Element("h2", "Settings used");
        if (r.Config is null)
        {
            h.Element("p", "series.toml could not be read (see the rejected inputs above).", "class=\"none\"");
        }
        else
        {
            var rows = SettingsProvenance.Rows(r.Config);
            // What the chemist wrote first; then every default in effect, smaller (many apply only to other signal kinds).
            foreach (var (title, group, cls) in new[]
            {
                ("Written in series.toml", rows.Where(x => x.Source != "default").ToList(), "settings"),
                ("Defaults in effect", rows.Where(x => x.Source == "default").ToList(), "settings defaults"),
            })
            {
                if (group.Count == 0) continue;
                h.Element("h3", title);
                h.Raw($"<table class=\"{cls}\">\n<thead><tr><th>setting</th><th>value</th><th>from</th></tr></thead>\n<tbody>\n");
                foreach (var s in group)
                    h.Raw($"<tr class=\"source-{(s.Source == "default" ? "default" : "file")}\">").Element("td", s.Key, "class=\"name\"").Element("td", s.Value).Element("td", s.Source).Raw("</tr>\n");
                h.Raw("</tbody>\n</table>\n");
            }
            h.Element("p", "Initial concentrations and temperatures come from plan.csv (see the runs table). Values are shown in the units the analysis used.", "class=\"note\"");
        }
        var groups = r.Runs.GroupBy(x => string.Join("\n", x.Converted.ConstantsUsed.Select(kv => kv.Key + "\u0001" + kv.Value)), StringComparer.Ordinal).ToList();
        if (groups.Count > 0)
        {
            h.Element("h3", "Conversion constants");
            foreach (var g in groups)
            {
                var ids = g.Select(x => x.Id).ToList();
                h.Element("p", groups.Count == 1 ? "Used for every run:" : $"Used for run(s) {string.Join(", ", ids)}:", "class=\"note\"");
                h.Raw("<table class=\"constants\">\n<tbody>\n");
                foreach (var kv in g.First().Converted.ConstantsUsed)
                    h.Raw("<tr>").Element("th", kv.Key, "scope=\"row\"").Element("td", kv.Value).Raw("</tr>\n");
                var sys = g.First().Converted.RelativeSystematicUncertainty;
                if (sys > 0) h.Raw("<tr>").Element("th", "relative systematic uncertainty of the scale", "scope=\"row\"").Element("td", ReportNumber.Plain(sys, 2)).Raw("</tr>\n");
                h.Raw("</tbody>\n</table>\n");
            }
        }
        h.Raw("</section>\n");
    }

    private static void Notes(Html h, string id, string title, IReadOnlyList<(string Topic, string Note)> notes)
    {
        h.Raw($"<section id=\"{id}\">\n").Element("h2", title).Raw("<dl>\n");
        foreach (var (topic, note) in notes) h.Element("dt", topic).Element("dd", note);
        h.Raw("</dl>\n</section>\n");
    }

    private static void Provenance(Html h, SeriesResult r)
    {
        h.Raw("<section id=\"provenance\">\n").Element("h2", "Inputs and software");
        h.Raw("<p>").Text($"TraceKin {r.ToolVersion}. Series folder: {Path.GetFileName(Path.TrimEndingDirectorySeparator(r.Folder))}. ")
            .Text("SHA-256 of each input lets a reader check that a file is the one analysed (e.g. sha256sum FILE).").Raw("</p>\n");
        h.Raw("<table class=\"hashes\">\n<thead><tr><th>file</th><th>role</th><th>SHA-256</th></tr></thead>\n<tbody>\n");
        (string File, string Role)[] setup = r.Config?.Plate is { } plate
            ? [(r.Config.File, "settings"), .. plate.Maps.Select(m => (m, "plate map"))]
            : [(r.Config?.File ?? SeriesRunner.ConfigFile, "settings"), (r.Plan?.File ?? SeriesRunner.PlanFile, "plan")];
        foreach (var (file, role) in setup)
        {
            // Hashed by the analysis from the bytes it parsed: the file is not read again here.
            var hash = r.SetupHashes.GetValueOrDefault(file, "not recorded");
            h.Raw("<tr>").Element("td", file).Element("td", role + " (hashed when read)").Element("td", hash, "class=\"hash\"").Raw("</tr>\n");
        }
        if (r.Runs.Count <= MaxListedRuns)
            foreach (var run in r.Runs)
                h.Raw("<tr>").Element("td", run.File).Element("td", $"export of run {run.Id}").Element("td", run.InputSha256, "class=\"hash\"").Raw("</tr>\n");
        h.Raw("</tbody>\n</table>\n");
        if (r.Runs.Count > MaxListedRuns)
            h.Element("p", $"The SHA-256 of each of the {r.Runs.Count} exports is in summary.json (runs[].sha256).", "class=\"note\"");
        h.Raw("</section>\n");
    }
}
