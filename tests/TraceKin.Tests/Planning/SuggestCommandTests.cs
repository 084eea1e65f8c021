using TraceKin.Cli;
using TraceKin.Cli.Commands;
using TraceKin.Setup;
using TraceKin.Tests.Support;
using Xunit;

namespace TraceKin.Tests.Planning;

/// <summary>`tracekin suggest` end to end: on the bundled (invented) sample series analysed here, and for a new study.</summary>
public sealed class SuggestCommandTests : IDisposable
{
    private readonly RepoPaths.TempDir _dir = new();
    public void Dispose() => _dir.Dispose();

    private (int Code, string Out, string Error) Suggest(SuggestOptions o)
    {
        var output = new StringWriter();
        var error = new StringWriter();
        var code = SuggestCommand.Run(o, output, error);
        return (code, output.ToString(), error.ToString());
    }

    [Fact]
    public void New_study_of_the_hyperbola_writes_the_two_D_optimal_levels_into_plan_csv()
    {
        // Duggleby 1979 (J. Theor. Biol. 81, 671; from memory): half the runs at Smax, half at Km·Smax/(2·Km + Smax);
        // the derivation is checked in SaturationDesignTests.
        var outDir = Path.Combine(_dir.Path, "new");
        var (code, text, error) = Suggest(new SuggestOptions(null, new DirectoryInfo(outDir), 6)
        {
            Law = "saturation", Guesses = ["Vmax=1e-5", "Km=2 mmol/L"], Noise = 1e-7, Ranges = ["S=0.1..10 mmol/L"],
        });
        Assert.True(code == ExitCodes.Ok, error);
        var plan = Plan.FromFile(Path.Combine(outDir, "plan.csv"));
        var s = plan.Rows.Select(r => r.InitialConcentrations["S"]).Order().ToArray();
        Assert.Equal(6, s.Length);
        var low = 2e-3 * 10e-3 / (2 * 2e-3 + 10e-3);
        Assert.All(s[..3], x => Assert.InRange(x / low, 0.99, 1.01));
        Assert.All(s[3..], x => Assert.InRange(x / 10e-3, 0.99, 1.01));
        Assert.Equal(["N1", "N2", "N3", "N4", "N5", "N6"], plan.Rows.Select(r => r.Run));
        Assert.Contains("Why:", text);
    }

    [Fact]
    public void On_the_analysed_sample_the_plan_continues_the_ids_with_the_series_columns()
    {
        var sample = RepoPaths.Sample("violet-complex-acid");
        var analysed = Path.Combine(_dir.Path, "violet");
        Assert.Equal(ExitCodes.Ok, AnalyseCommand.Run(new DirectoryInfo(sample), new DirectoryInfo(analysed), plots: false, workers: 2, error: new StringWriter()));
        var outDir = Path.Combine(_dir.Path, "next");
        var (code, text, error) = Suggest(new SuggestOptions(new DirectoryInfo(analysed), new DirectoryInfo(outDir), 4)
        {
            Plan = new FileInfo(Path.Combine(sample, "plan.csv")), Ranges = ["complex=0.1..1.5", "H+=25..400"],
        });
        Assert.True(code == ExitCodes.Ok, error);
        var written = File.ReadAllText(Path.Combine(outDir, "plan.csv"));
        Assert.StartsWith(File.ReadLines(Path.Combine(sample, "plan.csv")).First() + "\n", written);
        var plan = Plan.FromText(written, "plan.csv");
        Assert.Equal(["R9", "R10", "R11", "R12"], plan.Rows.Select(r => r.Run));
        Assert.All(plan.Rows, r => Assert.InRange(r.InitialConcentrations["complex"], 0.1e-3 * 0.999, 1.5e-3 * 1.001));
        Assert.All(plan.Rows, r => Assert.InRange(r.InitialConcentrations["H+"], 25e-3 * 0.999, 400e-3 * 1.001));
        Assert.Contains("Simulated median 95 % interval width (200 draws", text);
        Assert.True(File.Exists(Path.Combine(outDir, "suggestion.txt")));
    }

    [Fact]
    public void A_series_folder_is_analysed_in_memory_and_planned_on_without_writing_into_it()
    {
        using var copy = RepoPaths.CopyOf(RepoPaths.Sample("violet-complex-acid"));
        var before = Directory.GetFiles(copy.Path).Order(StringComparer.Ordinal).ToArray();
        var outDir = Path.Combine(_dir.Path, "from-folder");
        var (code, text, error) = Suggest(new SuggestOptions(new DirectoryInfo(copy.Path), new DirectoryInfo(outDir), 2)
        {
            Ranges = ["complex=0.1..1.5"], Criterion = "variance:n(complex)",
        });
        Assert.True(code == ExitCodes.Ok, error);
        Assert.Equal(before, Directory.GetFiles(copy.Path).Order(StringComparer.Ordinal).ToArray());
        var plan = Plan.FromFile(Path.Combine(outDir, "plan.csv"));
        Assert.Equal(["R9", "R10"], plan.Rows.Select(r => r.Run));
        // [H+]0 has no range: held at the series' median level, 100 mmol/L.
        Assert.All(plan.Rows, r => Assert.Equal(0.1, r.InitialConcentrations["H+"], 9));
        Assert.Contains("smallest variance of n(complex)", text);
    }

    [Fact]
    public void A_criterion_naming_no_parameter_of_the_law_is_refused_naming_the_option()
    {
        var (code, _, error) = Suggest(new SuggestOptions(null, new DirectoryInfo(Path.Combine(_dir.Path, "c")), 4)
        {
            Law = "saturation", Guesses = ["Vmax=1e-5", "Km=2 mmol/L"], Noise = 1e-7, Ranges = ["S=0.1..10 mmol/L"], Criterion = "variance:Ea",
        });
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains("[--criterion]", error);
    }

    [Fact]
    public void A_bad_option_is_one_located_message_and_exit_1_with_nothing_written()
    {
        var outDir = Path.Combine(_dir.Path, "bad");
        var (code, _, error) = Suggest(new SuggestOptions(null, new DirectoryInfo(outDir), 4)
        {
            Law = "saturation", Guesses = ["Vmax=1e-5", "Km=-2"], Noise = 1e-7, Ranges = ["S=0.1..10 mmol/L"],
        });
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains("[--guess Km]", error);
        Assert.DoesNotContain("   at ", error);
        Assert.False(Directory.Exists(outDir));
    }
}

/// <summary>The written plan reads back through the plan reader whatever the computer's language (de-DE decimal
/// commas must not leak into the file; common practice, no source).</summary>
public class SuggestedPlanTests
{
    [Theory]
    [InlineData("de-DE")]
    [InlineData("fr-FR")]
    public void Plan_text_uses_a_decimal_point_under_any_culture_and_continues_ids(string culture)
    {
        var old = System.Globalization.CultureInfo.CurrentCulture;
        try
        {
            System.Globalization.CultureInfo.CurrentCulture = new System.Globalization.CultureInfo(culture);
            var runs = new[] { new TraceKin.Planning.RunConditions(new Dictionary<string, double> { ["A"] = 1.25e-3, ["B"] = 0.5 }, 313.15) };
            var header = "run,file,temperature (°C),[A]0 (mmol/L),[B]0 (mol/L),operator\nW1,w1.csv,25,1,0.5,LK\nW2,w2.csv,25,2,0.5,LK\n";
            var text = TraceKin.Planning.SuggestedPlan.Text(runs, ["W1", "W2", "X/7"], ["w1.csv", "w2.csv", "w3.csv"], ["A", "B"], header);
            Assert.Equal("run,file,temperature (°C),[A]0 (mmol/L),[B]0 (mol/L),operator\nW3,w3-2.csv,40,1.25,0.5,\n", text);
            var plan = Plan.FromText(text, "plan.csv");
            Assert.Equal(1.25e-3, plan.Rows[0].InitialConcentrations["A"], 12);
            Assert.Equal(313.15, plan.Rows[0].TemperatureK!.Value, 9);
        }
        finally { System.Globalization.CultureInfo.CurrentCulture = old; }
    }
}
