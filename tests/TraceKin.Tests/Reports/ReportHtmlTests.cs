using TraceKin.Tests.Support;
using System.Text.Json;
using AngleSharp.Dom;
using AngleSharp.Html.Dom;
using AngleSharp.Html.Dom.Events;
using AngleSharp.Html.Parser;
using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

public sealed class ReportHtmlTests(AnalysedSample sample) : IClassFixture<AnalysedSample>
{
    /// <summary>Parses with AngleSharp's HTML5 parser (WHATWG tree construction) and collects every parse error it reports.</summary>
    public static (IHtmlDocument Doc, List<string> Errors) Parse(string html)
    {
        var errors = new List<string>();
        var parser = new HtmlParser();
        parser.Error += (_, e) =>
        {
            if (e is HtmlErrorEvent he) errors.Add($"{he.Position.Line}:{he.Position.Column} {he.Message}");
        };
        return (parser.ParseDocument(html), errors);
    }

    private IHtmlDocument Report() => Parse(File.ReadAllText(sample.ReportPath)).Doc;

    [Fact]
    public void Report_is_well_formed_html5_with_every_section()
    {
        var (doc, errors) = Parse(File.ReadAllText(sample.ReportPath));
        Assert.Empty(errors);
        Assert.Equal("violet-complex-acid", doc.QuerySelector("h1")!.TextContent);
        foreach (var id in new[] { "attention", "results", "runs", "plots", "settings", "methods", "cautions", "provenance" })
            Assert.NotNull(doc.GetElementById(id));
        Assert.Contains("UTF-8", doc.CharacterSet, StringComparison.OrdinalIgnoreCase);
    }

    [Fact]
    public void Every_order_rate_constant_and_initial_rate_shown_matches_summary_json()
    {
        // The printed text is checked against summary.json through the same rounding rule (ReportNumber), and the exact
        // round-trip value behind each cell must equal the JSON number bit for bit.
        using var json = JsonDocument.Parse(File.ReadAllText(sample.SummaryPath));
        var root = json.RootElement;
        var doc = Report();

        var orders = root.GetProperty("orders").EnumerateArray().ToDictionary(o => o.GetProperty("species").GetString()!);
        var orderCells = doc.QuerySelectorAll("[data-quantity=order]");
        Assert.Equal(orders.Count, orderCells.Length);
        Assert.Equal(2, orderCells.Length);
        foreach (var cell in orderCells)
        {
            var o = orders[cell.GetAttribute("data-species")!];
            AssertEstimate(cell, o);
            var ci = doc.QuerySelector($"[data-quantity=order-ci][data-species=\"{cell.GetAttribute("data-species")}\"]")!;
            Assert.Equal(ReportNumber.Interval(o.GetProperty("value").GetDouble(), o.GetProperty("stdError").GetDouble(),
                o.GetProperty("ci95")[0].GetDouble(), o.GetProperty("ci95")[1].GetDouble()), ci.TextContent);
        }

        var fittedK = root.GetProperty("powerLaw") is { ValueKind: JsonValueKind.Object } pl ? pl.GetProperty("rateConstantAtFittedOrders") : default;
        foreach (var (quantity, k) in new[] { ("rate-constant", root.GetProperty("rateConstant")), ("rate-constant-fitted", fittedK) })
        {
            var cell = doc.QuerySelector($"[data-quantity={quantity}]");
            if (k.ValueKind is JsonValueKind.Null or JsonValueKind.Undefined) { Assert.Null(cell); continue; }
            Assert.NotNull(cell);
            AssertEstimate(cell, k);
            Assert.Equal(ReportNumber.Interval(k.GetProperty("value").GetDouble(), k.GetProperty("stdError").GetDouble(),
                k.GetProperty("ci95")[0].GetDouble(), k.GetProperty("ci95")[1].GetDouble()), doc.QuerySelector($"[data-quantity={quantity}-ci]")!.TextContent);
            Assert.Equal(k.GetProperty("unit").GetString(), cell.ParentElement!.Children[3].TextContent);
        }
        Assert.NotNull(doc.QuerySelector("[data-quantity=rate-constant]"));

        var runs = root.GetProperty("runs").EnumerateArray().ToDictionary(r => r.GetProperty("id").GetString()!);
        var rateCells = doc.QuerySelectorAll("[data-quantity=initial-rate]");
        Assert.Equal(8, rateCells.Length);
        Assert.Equal(runs.Count, rateCells.Length);
        foreach (var cell in rateCells)
            AssertEstimate(cell, runs[cell.GetAttribute("data-run")!].GetProperty("initialRate"));
        // The runs table states the rate unit once, in its header.
        Assert.Contains(runs["R1"].GetProperty("initialRate").GetProperty("unit").GetString()!,
            doc.QuerySelectorAll("#runs th").Select(th => th.TextContent).Single(t => t.StartsWith("v0", StringComparison.Ordinal)));
    }

    private static void AssertEstimate(IElement cell, JsonElement expected)
    {
        var value = expected.GetProperty("value").GetDouble();
        var se = expected.GetProperty("stdError").GetDouble();
        Assert.Equal(ReportNumber.Measured(value, se), cell.TextContent);
        Assert.Equal(value, double.Parse(cell.GetAttribute("data-value")!, System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal(se, double.Parse(cell.GetAttribute("data-std-error")!, System.Globalization.CultureInfo.InvariantCulture));
    }

    [Fact]
    public void Every_plot_is_embedded_as_a_png_data_uri_identical_to_the_written_file()
    {
        var imgs = Report().QuerySelectorAll("#plots figure.plot");
        // 8 run plots + the order plot; any further series plot in plots/ is embedded too.
        var pngs = Directory.GetFiles(Path.Combine(sample.OutDir, "plots"), "*.png");
        Assert.Equal(pngs.Length, imgs.Length);
        Assert.True(imgs.Length >= 9, $"expected at least 9 plots, found {imgs.Length}");
        foreach (var fig in imgs)
        {
            var src = fig.QuerySelector("img")!.GetAttribute("src")!;
            const string prefix = "data:image/png;base64,";
            Assert.StartsWith(prefix, src);
            var bytes = Convert.FromBase64String(src[prefix.Length..]);
            Assert.Equal(File.ReadAllBytes(Path.Combine(sample.OutDir, "plots", fig.GetAttribute("data-file")!)), bytes);
            Assert.False(string.IsNullOrWhiteSpace(fig.QuerySelector("img")!.GetAttribute("alt")));
        }
    }

    [Fact]
    public void Report_makes_no_network_reference_and_needs_no_script()
    {
        var html = File.ReadAllText(sample.ReportPath);
        var doc = Parse(html).Doc;
        Assert.Empty(doc.QuerySelectorAll("script, link, iframe, object, embed, base"));
        foreach (var el in doc.QuerySelectorAll("[src], [href], [srcset], [action]"))
            foreach (var attr in el.Attributes.Where(a => a.Name is "src" or "href" or "srcset" or "action"))
            {
                var v = attr.Value.Trim();
                Assert.False(v.StartsWith("//", StringComparison.Ordinal) || v.Contains("://", StringComparison.Ordinal),
                    $"<{el.LocalName} {attr.Name}=\"{v[..Math.Min(60, v.Length)]}\"> would reach the network");
            }
        var css = string.Concat(doc.QuerySelectorAll("style").Select(s => s.TextContent));
        Assert.DoesNotContain("@import", css);
        Assert.DoesNotContain("url(", css);
    }

    [Fact]
    public void Report_has_a_print_stylesheet_with_page_margins_and_unsplit_rows_and_figures()
    {
        var css = string.Concat(Report().QuerySelectorAll("style").Select(s => s.TextContent));
        Assert.Contains("@media print", css);
        Assert.Matches(@"@page\s*\{\s*margin:", css);
        Assert.Matches(@"tr, figure[^{]*\{[^}]*break-inside: avoid", css);
        Assert.Matches(@"figure\.plot img \{[^}]*max-width: 100%", css);
    }

    [Fact]
    public void Same_inputs_give_the_same_bytes_and_no_time_stamp()
    {
        var again = RepoPaths.NewTempDir("tracekin-report-again");
        try
        {
            AnalysedSample.Analyse(RepoPaths.Sample("violet-complex-acid"), again, plots: true);
            Assert.Equal(File.ReadAllBytes(sample.ReportPath), File.ReadAllBytes(Path.Combine(again, ReportHtml.FileName)));
        }
        finally { Directory.Delete(again, recursive: true); }
        var text = Report().Body!.TextContent;
        Assert.DoesNotMatch(@"\b20\d\d-\d\d-\d\d\b", text);
        Assert.DoesNotMatch(@"\b\d\d:\d\d:\d\d\b", text);
    }

    [Fact]
    public void Report_without_plots_is_still_written_with_every_result_but_no_image()
    {
        var path = Path.Combine(sample.NoPlotsDir, ReportHtml.FileName);
        Assert.True(File.Exists(path));
        Assert.False(Directory.Exists(Path.Combine(sample.NoPlotsDir, "plots")));
        var (doc, errors) = Parse(File.ReadAllText(path));
        Assert.Empty(errors);
        Assert.Empty(doc.QuerySelectorAll("img"));
        Assert.Contains("--no-plots", doc.GetElementById("plots")!.TextContent);
        Assert.Equal(8, doc.QuerySelectorAll("[data-quantity=initial-rate]").Length);
        Assert.Equal(2, doc.QuerySelectorAll("[data-quantity=order]").Length);
    }

    [Fact]
    public void Settings_table_says_which_values_came_from_series_toml_and_which_are_defaults()
    {
        var rows = Report().QuerySelectorAll("#settings table.settings tbody tr")
            .ToDictionary(tr => tr.Children[0].TextContent, tr => (Value: tr.Children[1].TextContent, Source: tr.Children[2].TextContent));
        // The sample's series.toml sets ε = 1480 L/(mol·cm) and leaves rates.window_end out.
        Assert.Equal(("1480 L/(mol·cm)", "series.toml"), rows["signal.molar_absorptivity"]);
        Assert.Equal(("0.045", "series.toml"), rows["signal.blank"]);
        Assert.Equal("default", rows["rates.window_end"].Source);
        Assert.Equal("default", rows["ingest.delimiter"].Source);
        // The conversion constants shown are exactly those the Signal stage reports it used (all runs share them here).
        var constants = Report().QuerySelectorAll("#settings table.constants tr").Select(tr => (tr.Children[0].TextContent, tr.Children[1].TextContent)).ToList();
        Assert.Equal(sample.Result.Runs[0].Converted.ConstantsUsed.Select(kv => (kv.Key, kv.Value)).ToList(), constants);
        Assert.NotEmpty(constants);
    }

    [Fact]
    public void Provenance_lists_the_version_and_the_sha256_of_every_input()
    {
        var doc = Report();
        var prov = doc.GetElementById("provenance")!;
        Assert.Contains($"TraceKin {sample.Result.ToolVersion}", prov.TextContent);
        var hashes = prov.QuerySelectorAll("tbody tr").ToDictionary(tr => tr.Children[0].TextContent, tr => tr.Children[2].TextContent);
        foreach (var run in sample.Result.Runs)
            Assert.Equal(Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(File.ReadAllBytes(Path.Combine(RepoPaths.Sample("violet-complex-acid"), run.File)))), hashes[run.File]);
        Assert.Matches("^[0-9a-f]{64}$", hashes["plan.csv"]);
        Assert.Matches("^[0-9a-f]{64}$", hashes["series.toml"]);
    }

    [Fact]
    public void Cautions_cover_pressure_extrapolation_and_reagents_and_defer_to_local_rules()
    {
        var text = Report().GetElementById("cautions")!.TextContent;
        Assert.Contains("closed vessel", text);
        Assert.Contains("extrapolate", text);
        Assert.Contains("safety data sheet", text);
        Assert.Contains("Local codes", text);
    }

    [Fact]
    public void Beyond_fifty_runs_only_the_runs_that_need_attention_are_shown_and_the_rest_are_linked_from_the_plots_folder()
    {
        // 8 sample runs repeated under new names up to 56 (round trip on the invented sample): the page stays
        // small, every run still has its figure, and each links its file in plots/, which is there.
        var runs = Enumerable.Range(0, 7).SelectMany(k => sample.Result.Runs.Select(r => r with { Plan = r.Plan with { Run = $"{r.Id}-{k}" } })).ToList();
        var big = sample.Result with { Runs = runs };
        using var outDir = new RepoPaths.TempDir();
        var plotDir = Path.Combine(outDir.Path, "plots");
        Directory.CreateDirectory(plotDir);
        foreach (var f in Directory.EnumerateFiles(Path.Combine(sample.OutDir, "plots"), "*.png").Where(f => !Path.GetFileName(f).StartsWith("run-", StringComparison.Ordinal)))
            File.Copy(f, Path.Combine(plotDir, Path.GetFileName(f)));
        var names = RunFileNames.For(sample.Result.Plan!);
        foreach (var r in runs)
            File.Copy(Path.Combine(sample.OutDir, "plots", names.PlotFile(sample.Result.Runs[0].Id)), Path.Combine(plotDir, names.PlotFile(r.Id)));
        var (doc, errors) = Parse(ReportHtml.Render(big, ReportPlots.FromFolder(plotDir)));
        Assert.Empty(errors);
        // The runs that need attention (none in this clean sample) are shown inline; the others are linked, folded.
        var runImages = doc.QuerySelectorAll("figure.plot").Where(f => f.GetAttribute("data-file")!.StartsWith("run-", StringComparison.Ordinal))
            .Select(f => f.QuerySelector("img")!.GetAttribute("src")!).ToList();
        var runLinks = doc.QuerySelectorAll("#other-run-plots a").Select(a => a.GetAttribute("href")!).ToList();
        Assert.Empty(runImages);
        Assert.Equal(56, runLinks.Count);
        Assert.All(runLinks, src => Assert.StartsWith("plots/run-", src));
        Assert.All(runLinks, src => Assert.True(File.Exists(Path.Combine(outDir.Path, src))));
        // A run that needs attention is shown inline, the rest stay links.
        var flagged = runs.Select((r, i) => i == 3 ? r with { Warnings = [.. r.Warnings, new TraceKin.Traces.Warning("rate-unresolved", r.File, "test")] } : r).ToList();
        var (doc2, errors2) = Parse(ReportHtml.Render(big with { Runs = flagged }, ReportPlots.FromFolder(plotDir)));
        Assert.Empty(errors2);
        var inline = doc2.QuerySelectorAll("figure.plot").Where(f => f.GetAttribute("data-file")!.StartsWith("run-", StringComparison.Ordinal)).ToList();
        Assert.Single(inline);
        Assert.Equal(55, doc2.QuerySelectorAll("#other-run-plots a").Length);
        // The series plots are still embedded.
        Assert.Contains(doc.QuerySelectorAll("figure.plot img"), i => i.GetAttribute("src")!.StartsWith("data:image/png;base64,", StringComparison.Ordinal));
    }
}
