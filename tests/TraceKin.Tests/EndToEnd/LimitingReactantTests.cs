using TraceKin.Analysis;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.EndToEnd;

/// <summary>
/// The plate demo's scenario run for 300 s instead of 120 s (written by `tracekin simulate` from the Michaelis–Menten
/// law, Vmax = 1.0·10⁻⁷ mol/(L·s), Km = 0.50 mmol/L, as in sample-traces/teal-lactonase-plate/truth.json): the
/// low-substrate wells then use 3–6 % of their substrate, a curvature too small to see in the noise. With
/// rates.limiting_reactant the product's end level comes from [S]0 and the 95 % intervals hold the true Vmax and Km.
/// </summary>
public class LimitingReactantTests
{
    private static string LongerPlate(RepoPaths.TempDir dir, bool limiting)
    {
        var series = Path.Combine(dir.Path, "plate");
        Directory.CreateDirectory(series);
        var sample = RepoPaths.Sample("teal-lactonase-plate");
        foreach (var f in new[] { "plan.csv", "series.toml" }) File.Copy(Path.Combine(sample, f), Path.Combine(series, f));
        // The demo's series.toml sets rates.limiting_reactant; the test writes its own choice.
        var lines = File.ReadAllLines(Path.Combine(series, "series.toml")).Where(l => !l.TrimStart().StartsWith("limiting_reactant", StringComparison.Ordinal)).ToList();
        Assert.Contains("[rates]", lines);
        if (limiting) lines.Insert(lines.IndexOf("[rates]") + 1, "limiting_reactant = \"S\"");
        File.WriteAllLines(Path.Combine(series, "series.toml"), lines);
        var code = TraceKin.Cli.Program.BuildRoot().Parse(["simulate", series, "-k", "1e-7", "--saturation", "S=0.5", "--coefficient", "S=-1",
            "--coefficient", "P=1", "--duration", "300", "--interval", "2", "--noise", "0.001", "--baseline-drift", "2e-5", "--seed", "21", "--force"]).Invoke();
        Assert.Equal(0, code);
        return series;
    }

    [Fact]
    public void A_known_end_level_keeps_Vmax_and_Km_inside_their_intervals_on_longer_runs()
    {
        using var dir = new RepoPaths.TempDir();
        var result = SeriesRunner.Analyse(LongerPlate(dir, limiting: true), new AnalysisOptions { Workers = 2 });
        Assert.Empty(result.Rejected);
        var sat = result.Findings!.Saturation!;
        Assert.Equal("saturation", sat.Preferred);
        Assert.InRange(1.0e-7, sat.Vmax.Ci95Low, sat.Vmax.Ci95High);
        Assert.InRange(5.0e-4, sat.Km.Ci95Low, sat.Km.Ci95High);
        Assert.All(result.Runs.Where(r => r.Plan.Role != "blank"), r => Assert.StartsWith("integrated law", r.Rates.Headline.Method));
    }

    [Fact]
    public void Without_a_known_end_level_the_series_says_which_product_runs_got_a_straight_line_rate()
    {
        using var dir = new RepoPaths.TempDir();
        var plain = SeriesRunner.Analyse(LongerPlate(dir, limiting: false), new AnalysisOptions { Workers = 2 });
        var note = Assert.Single(plain.Warnings, w => w.Code == "product-end-unknown");
        Assert.Contains("rates.limiting_reactant", note.Message);
        // the runs it names are those whose chosen law is zero order, and only sample runs
        var named = plain.Runs.Where(r => r.Plan.Role != "blank" && r.Rates.ChosenLaw?.Law == "zero order").ToList();
        Assert.NotEmpty(named);
        Assert.Contains($"{named.Count} of 24 product run(s)", note.Message);
        Assert.True(TraceKin.Reports.WarningTiers.IsNote(note));

        using var dir2 = new RepoPaths.TempDir();
        var known = SeriesRunner.Analyse(LongerPlate(dir2, limiting: true), new AnalysisOptions { Workers = 2 });
        Assert.DoesNotContain(known.Warnings, w => w.Code == "product-end-unknown");
    }

    [Theory]
    [InlineData("T", "an [X]0 column")]
    [InlineData("S", "only for a product curve")]
    public void A_limiting_reactant_the_plan_lacks_or_on_a_reactant_curve_is_one_located_setting_problem(string species, string expected)
    {
        using var dir = new RepoPaths.TempDir();
        var series = LongerPlate(dir, limiting: false);
        var toml = File.ReadAllLines(Path.Combine(series, "series.toml")).ToList();
        toml.Insert(toml.IndexOf("[rates]") + 1, $"limiting_reactant = \"{species}\"");
        // the reactant case: the signal follows S itself, falling
        if (species == "S") toml = toml.Select(l => l.StartsWith("coefficient = 1", StringComparison.Ordinal) ? "coefficient = -1"
            : l.StartsWith("species = \"P\"", StringComparison.Ordinal) ? "species = \"S\"" : l).ToList();
        File.WriteAllLines(Path.Combine(series, "series.toml"), toml);
        var result = SeriesRunner.Analyse(series, new AnalysisOptions { Workers = 2 });
        var bad = Assert.Single(result.Rejected);
        Assert.Equal("series.toml", bad.File);
        Assert.Equal(toml.IndexOf($"limiting_reactant = \"{species}\"") + 1, bad.Line);
        Assert.Contains(expected, bad.Expected);
        Assert.Empty(result.Runs);
    }

    [Fact]
    public void A_run_without_the_limiting_reactant_is_rejected_at_its_plan_row_and_the_others_analysed()
    {
        using var dir = new RepoPaths.TempDir();
        var series = LongerPlate(dir, limiting: true);
        var plan = File.ReadAllLines(Path.Combine(series, "plan.csv"));
        plan[1] = string.Join(',', plan[1].Split(',').Select((c, i) => i == 3 ? "" : c));
        File.WriteAllLines(Path.Combine(series, "plan.csv"), plan);
        var result = SeriesRunner.Analyse(series, new AnalysisOptions { Workers = 2 });
        var bad = Assert.Single(result.Rejected);
        Assert.Contains("plan.csv", bad.File);
        Assert.Equal(2, bad.Line);
        Assert.Contains("[S]0", bad.Expected);
        Assert.Equal(31, result.Runs.Count);
    }
}
