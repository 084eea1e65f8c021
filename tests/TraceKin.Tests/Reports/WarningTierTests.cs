using System.Text.RegularExpressions;
using TraceKin.Cli;
using TraceKin.Cli.Commands;
using TraceKin.Reports;
using TraceKin.Tests.Support;
using TraceKin.Traces;

namespace TraceKin.Tests.Reports;

// Which tier each warning belongs to, and where each tier appears: problems loud at the top of the report, notes
// folded, every one of them in the log. Robustness of the report's layout (no source needed); the series are the
// bundled invented demos.
public sealed class WarningTierTests : IDisposable
{
    private readonly RepoPaths.TempDir _dir = new();

    public void Dispose() => _dir.Dispose();

    [Theory]
    [InlineData("rate-unresolved", false)]
    [InlineData("rate-wrong-sign", false)]
    [InlineData("unresolved-runs", false)]
    [InlineData("file-not-in-plan", false)]
    [InlineData("absorbance-above-linear-range", false)]
    [InlineData("outside-standards", false)]
    [InlineData("a-code-nobody-placed", false)]
    [InlineData("rate-imprecise", true)]
    [InlineData("initial-rate-disagreement", true)]
    [InlineData("saturation-beyond-range", true)]
    [InlineData("extrapolation-caution", true)]
    public void A_warning_is_a_note_only_when_its_code_is_placed_there(string code, bool note) =>
        Assert.Equal(note, WarningTiers.IsNote(new Warning(code, "R1", "text")));

    private (AngleSharp.Html.Dom.IHtmlDocument Report, string[] Log) Analyse(string sample)
    {
        var outDir = Path.Combine(_dir.Path, sample);
        Assert.Equal(ExitCodes.Ok, AnalyseCommand.Run(new DirectoryInfo(RepoPaths.Sample(sample)), new DirectoryInfo(outDir), plots: false, workers: 2, error: new StringWriter()));
        var (doc, errors) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(outDir, ReportHtml.FileName)));
        Assert.Empty(errors);
        return (doc, File.ReadAllLines(Path.Combine(outDir, AnalyseCommand.LogFile)));
    }

    [Theory]
    [InlineData("violet-complex-acid")]
    [InlineData("amber-ester-warmth")]
    public void A_clean_demo_shows_no_needs_attention_and_logs_every_note(string sample)
    {
        var (doc, log) = Analyse(sample);
        var attention = doc.GetElementById("attention")!;
        Assert.Equal("all-clear", attention.ClassName);
        Assert.DoesNotContain("Needs attention", doc.Body!.TextContent, StringComparison.Ordinal);
        Assert.Null(doc.GetElementById("warnings"));
        Assert.Null(doc.GetElementById("rejected"));
        // Every note is inside the folded block, and each one is also a "note:" line of the log.
        var notes = doc.QuerySelectorAll("#attention li");
        Assert.All(notes, li => Assert.Equal("DETAILS", li.Closest("details")?.TagName));
        var noteLines = log.Where(l => l.Contains("] note: ", StringComparison.Ordinal)).ToList();
        Assert.Equal(notes.Length, noteLines.Count);
        foreach (var li in notes)
        {
            var where = li.QuerySelector(".where")!.TextContent;
            Assert.Contains(noteLines, l => l.Contains($"note: {where}: ", StringComparison.Ordinal));
        }
        Assert.DoesNotContain(log, l => l.Contains("problem: ", StringComparison.Ordinal));
    }

    [Fact]
    public void The_temperature_demo_folds_its_caution_the_rate_disagreement_and_the_candidate_fit_that_failed()
    {
        var (doc, _) = Analyse("amber-ester-warmth");
        var codes = doc.QuerySelectorAll("#notes li[data-code]").Select(li => li.GetAttribute("data-code")).ToHashSet();
        Assert.Contains("extrapolation-caution", codes);
        Assert.Contains("initial-rate-disagreement", codes);
        Assert.Contains("candidate-fit-not-converged", codes);
        Assert.Null(doc.QuerySelector("#notes[open]"));
        Assert.Matches(new Regex(@"^Notes \(\d+\)"), doc.QuerySelector("#notes > summary")!.TextContent);
    }

    [Fact]
    public void A_warning_of_one_well_of_a_plate_names_the_well_in_the_report_and_the_log()
    {
        var (doc, log) = Analyse("teal-lactonase-plate");
        // Every run of this demo reads plate.csv: its runs' warnings name the well, "A1 (plate.csv)", never the file alone.
        var wheres = doc.QuerySelectorAll("#attention li .where").Select(e => e.TextContent).ToList();
        Assert.NotEmpty(wheres);
        Assert.DoesNotContain("plate.csv", wheres);
        Assert.Contains(wheres, w => Regex.IsMatch(w, @"^[A-H]\d{1,2} \(plate\.csv\)$"));
        Assert.DoesNotContain(log, l => l.Contains("note: plate.csv: ", StringComparison.Ordinal) || l.Contains("problem: plate.csv: ", StringComparison.Ordinal));
        Assert.Contains(log, l => Regex.IsMatch(l, @"(note|problem): [A-H]\d{1,2} \(plate\.csv\): "));
    }

    [Fact]
    public void A_warning_of_a_run_with_its_own_file_names_the_file_alone()
    {
        var (_, log) = Analyse("amber-ester-warmth");
        Assert.DoesNotContain(log, l => Regex.IsMatch(l, @"(note|problem): \S+ \(\S+\.csv\): "));
    }

    [Fact]
    public void A_problem_is_shown_loud_before_the_notes_and_logged_as_a_warning()
    {
        using var series = RepoPaths.CopyOf(RepoPaths.Sample("violet-complex-acid"));
        File.WriteAllText(Path.Combine(series.Path, "stray.csv"), "time (s),A530\n0,0.1\n"); // invented: a file the plan does not name
        var outDir = Path.Combine(_dir.Path, "out");
        AnalyseCommand.Run(new DirectoryInfo(series.Path), new DirectoryInfo(outDir), plots: false, workers: 2, error: new StringWriter());
        var (doc, _) = ReportHtmlTests.Parse(File.ReadAllText(Path.Combine(outDir, ReportHtml.FileName)));
        Assert.Equal("needs-attention", doc.GetElementById("attention")!.ClassName);
        var problem = Assert.Single(doc.QuerySelectorAll("#warnings li.warning"));
        Assert.Equal("file-not-in-plan", problem.GetAttribute("data-code"));
        Assert.StartsWith("Problems (1)", doc.QuerySelector("#warnings h3")!.TextContent, StringComparison.Ordinal);
        Assert.Contains(File.ReadAllLines(Path.Combine(outDir, AnalyseCommand.LogFile)), l => l.Contains("[WRN] problem: ", StringComparison.Ordinal) && l.Contains("stray.csv", StringComparison.Ordinal));
    }
}
