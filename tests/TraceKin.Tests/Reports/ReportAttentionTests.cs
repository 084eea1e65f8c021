using TraceKin.Tests.Support;
using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

/// <summary>A series with a broken export, an unplanned file and hostile text: what a reader must see first.</summary>
public sealed class ReportAttentionTests : IDisposable
{
    private readonly string _series = RepoPaths.NewTempDir("tracekin-bad-series");
    private readonly string _out = RepoPaths.NewTempDir("tracekin-bad-out");

    public ReportAttentionTests()
    {
        RepoPaths.CopyDir(RepoPaths.Sample("violet-complex-acid"), _series);
        // Invented for this test: run R9 names an export whose line 6 holds text where a number belongs, and
        // R2's operator cell holds markup that must come out as text.
        var plan = File.ReadAllText(Path.Combine(_series, "plan.csv")).Replace("R2,r2.csv,25.0,0.40,100,MK", "R2,r2.csv,25.0,0.40,100,\"<img src=x onerror=alert(1)>\"");
        File.WriteAllText(Path.Combine(_series, "plan.csv"), plan.TrimEnd() + "\nR9,r9.csv,25.0,0.40,100,JS\n");
        File.WriteAllText(Path.Combine(_series, "r9.csv"), "run: R9\ntemperature: 25.00 °C\ntime (s),A530\n0,0.60\n0.5,0.59\n1,zero point five\n1.5,0.58\n");
        File.WriteAllText(Path.Combine(_series, "stray.csv"), "time (s),A530\n0,0.1\n");
        AnalysedSample.Analyse(_series, _out, plots: false);
    }

    public void Dispose()
    {
        Directory.Delete(_series, recursive: true);
        Directory.Delete(_out, recursive: true);
    }

    [Fact]
    public void Rejected_file_and_warning_are_shown_in_the_attention_section_before_the_results()
    {
        var (doc, errors) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(_out, ReportHtml.FileName)));
        Assert.Empty(errors);
        var sections = doc.QuerySelectorAll("main > section").Select(s => s.Id).ToList();
        Assert.Equal("attention", sections[0]);
        Assert.Equal("needs-attention", doc.GetElementById("attention")!.ClassName);

        var problems = doc.QuerySelectorAll("#attention #rejected li.problem");
        var problem = Assert.Single(problems);
        // The located message: file, 1-based line number (line 6 of r9.csv), what was found.
        Assert.Contains("r9.csv, line 6", problem.TextContent);
        Assert.Contains("zero point five", problem.TextContent);

        var warning = Assert.Single(doc.QuerySelectorAll("#attention #warnings li.warning[data-code=file-not-in-plan]"));
        Assert.Contains("stray.csv", warning.TextContent);
        Assert.Contains("Rejected inputs (1)", doc.QuerySelector("#rejected h3")!.TextContent);

        // The good runs are still analysed and reported.
        Assert.Equal(8, doc.QuerySelectorAll("[data-quantity=initial-rate]").Length);
        Assert.Null(doc.QuerySelector("[data-run=R9][data-quantity=initial-rate]"));
    }

    [Fact]
    public void User_text_is_escaped_and_never_becomes_markup()
    {
        var html = File.ReadAllText(Path.Combine(_out, ReportHtml.FileName));
        var (doc, _) = ReportHtmlTests.Parse(html);
        Assert.Empty(doc.QuerySelectorAll("img"));
        Assert.Contains("&lt;img src=x onerror=alert(1)&gt;", html);
        var row = doc.QuerySelector("#runs tr[data-run=R2]")!;
        Assert.Contains(row.Children, td => td.TextContent == "<img src=x onerror=alert(1)>");
    }

    [Fact]
    public void Report_is_written_even_when_series_toml_is_rejected()
    {
        var series = RepoPaths.NewTempDir("tracekin-bad-toml");
        var outDir = RepoPaths.NewTempDir("tracekin-bad-toml-out");
        try
        {
            RepoPaths.CopyDir(RepoPaths.Sample("violet-complex-acid"), series);
            // Invented: a misspelt key on line 2 must be rejected, not silently defaulted.
            File.WriteAllText(Path.Combine(series, "series.toml"), "[signal]\nmolar_absorbtivity = 1480\n");
            AnalysedSample.Analyse(series, outDir, plots: true);
            var (doc, errors) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(outDir, ReportHtml.FileName)));
            Assert.Empty(errors);
            var problem = Assert.Single(doc.QuerySelectorAll("#rejected li.problem"));
            Assert.Contains("signal.molar_absorbtivity", problem.TextContent);
            Assert.Contains("could not be read", doc.GetElementById("settings")!.TextContent);
            Assert.Contains("No run was analysed", doc.GetElementById("runs")!.TextContent);
        }
        finally
        {
            Directory.Delete(series, recursive: true);
            Directory.Delete(outDir, recursive: true);
        }
    }

    [Fact]
    public void Escape_replaces_the_five_html_special_characters()
    {
        Assert.Equal("a &lt;b&gt; &amp; &quot;c&quot; &#39;d&#39;", Html.Escape("a <b> & \"c\" 'd'"));
        Assert.Equal("x\uFFFDy", Html.Escape("x\u0001y"));
    }
}
