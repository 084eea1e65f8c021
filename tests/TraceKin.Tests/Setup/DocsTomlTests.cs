using TraceKin.Analysis;
using System.Text;
using TraceKin.Setup;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Setup;

/// <summary>
/// The series.toml examples of the docs are read as series.toml is read, so an example with a misspelt or removed key
/// fails here; a plan.csv example shown beside one must also agree with it (names, per-run parameter columns).
/// </summary>
public sealed class DocsTomlTests
{
    private static readonly string[] Documents = ["docs/formats.md", "docs/tutorial.md"];

    /// <summary>Fenced blocks of a document: (language, info string, text, 1-based line of the first text line).</summary>
    public static List<(string Lang, string Info, string Text, int Line)> Fences(string markdown)
    {
        var result = new List<(string, string, string, int)>();
        var lines = markdown.Replace("\r\n", "\n").Split('\n');
        string? info = null;
        var block = new StringBuilder();
        var start = 0;
        for (var i = 0; i < lines.Length; i++)
        {
            var t = lines[i].TrimStart();
            if (t.StartsWith("```", StringComparison.Ordinal))
            {
                if (info is null) { info = t[3..].Trim(); block.Clear(); start = i + 2; continue; }
                result.Add((info.Split(' ', 2)[0], info, block.ToString(), start));
                info = null;
                continue;
            }
            if (info is not null) block.Append(lines[i]).Append('\n');
        }
        return result;
    }

    public static TheoryData<string, int> TomlBlocks()
    {
        var d = new TheoryData<string, int>();
        foreach (var doc in Documents)
            foreach (var f in Fences(File.ReadAllText(Path.Combine(RepoPaths.Root, doc))).Where(f => f.Lang == "toml"))
                d.Add(doc, f.Line);
        return d;
    }

    [Fact]
    public void The_docs_hold_series_toml_examples_to_check()
    {
        Assert.True(TomlBlocks().Count() >= 3);
    }

    [Theory]
    [MemberData(nameof(TomlBlocks))]
    public void Each_toml_example_reads_as_series_toml(string doc, int line)
    {
        var text = Fences(File.ReadAllText(Path.Combine(RepoPaths.Root, doc))).Single(f => f.Lang == "toml" && f.Line == line).Text;
        var ex = Record.Exception(() => SeriesConfig.FromText(text, "series.toml"));
        Assert.True(ex is null, $"{doc} line {line}: {ex?.Message}");
    }

    [Fact]
    public void The_tutorial_plan_and_series_toml_agree()
    {
        var fences = Fences(File.ReadAllText(Path.Combine(RepoPaths.Root, "docs/tutorial.md")));
        var plan = fences.Single(f => f.Info.Contains("file=my-series/plan.csv"));
        var toml = fences.Single(f => f.Info.Contains("file=my-series/series.toml"));
        SeriesCheck.Check(SeriesConfig.FromText(toml.Text, "series.toml"), Plan.FromText(plan.Text, "plan.csv"));
    }

    [Fact]
    public void The_per_run_plan_example_agrees_with_the_gas_series_toml_example()
    {
        var fences = Fences(File.ReadAllText(Path.Combine(RepoPaths.Root, "docs/formats.md")));
        var plan = Plan.FromText(fences.Single(f => f.Lang == "csv" && f.Text.Contains("barometric_pressure")).Text, "plan.csv");
        var config = SeriesConfig.FromText(fences.Single(f => f.Lang == "toml" && f.Text.Contains("gas_volume") && f.Text.Contains("barometric_pressure")).Text, "series.toml");
        SeriesCheck.Check(config, plan);
        // The plan's per-run pressure is used (1 kPa = 1000 Pa, SI Brochure), the series value elsewhere.
        Assert.Equal(100420, plan.Rows[0].Conditions["barometric_pressure"].Value, 6);
        Assert.Equal(100420, TraceKin.Signal.RunConditions.Apply(config.Signal, plan.Rows[0]).BarometricPressure!.Value, 6);
    }
}
