using System.Text.Json;
using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

// File names derived from run ids: safe characters, bounded length, unique in a series (robustness, no source needed).
public class RunFileNamesTests
{
    private static readonly System.Text.RegularExpressions.Regex Safe = new("^run-[A-Za-z0-9_-][A-Za-z0-9._-]{0,79}\\.png$");

    [Fact]
    public void A_plain_run_id_keeps_its_name()
    {
        var names = RunFileNames.For(["R1", "run_2", "T-25.0"]);
        Assert.Equal("run-R1.png", names.PlotFile("R1"));
        Assert.Equal("run-run_2.png", names.PlotFile("run_2"));
        Assert.Equal("run-T-25.0.png", names.PlotFile("T-25.0"));
    }

    [Theory]
    [InlineData("a/b")]
    [InlineData("..")]
    [InlineData("../../etc/passwd")]
    [InlineData(".hidden")]
    [InlineData("tab\there")]
    [InlineData("bell\u0007and\u001bescape")]
    [InlineData("new\nline")]
    [InlineData("back\\slash:colon*star?")]
    [InlineData("Lösung ü")]
    [InlineData("")]
    [InlineData(" ")]
    [InlineData("-R1")]
    public void An_id_with_unsafe_characters_gives_a_safe_name_that_is_not_hidden(string id)
    {
        var name = RunFileNames.For([id]).PlotFile(id);
        Assert.Matches(Safe, name);
        Assert.Equal(name, Path.GetFileName(name));
    }

    [Fact]
    public void A_255_character_id_gives_a_name_of_at_most_88_characters_ending_in_a_hash_of_the_id()
    {
        var id = new string('x', 255);
        var name = RunFileNames.For([id]).PlotFile(id);
        Assert.True(name.Length <= 88, name);
        Assert.Matches(Safe, name);
        Assert.EndsWith("-" + Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(id)))[..8] + ".png", name);
    }

    [Fact]
    public void Two_long_ids_with_the_same_beginning_get_different_names()
    {
        var a = new string('y', 200) + "A";
        var b = new string('y', 200) + "B";
        var names = RunFileNames.For([a, b]);
        Assert.NotEqual(names.PlotFile(a), names.PlotFile(b));
    }

    [Fact]
    public void Ids_that_sanitise_alike_or_differ_only_in_case_get_distinct_names_in_plan_order()
    {
        string[] ids = ["a_b", "a/b", "a b", "A_B", "a_b-2"];
        var names = RunFileNames.For(ids);
        var files = ids.Select(names.PlotFile).ToList();
        Assert.Equal(files.Count, files.Distinct(StringComparer.OrdinalIgnoreCase).Count());
        Assert.Equal("run-a_b.png", files[0]);
        Assert.Equal("run-A_B-2.png", files[3]); // the first free suffix in plan order
        Assert.All(files, f => Assert.Matches(Safe, f));
        // The same plan gives the same names.
        Assert.Equal(files, ids.Select(RunFileNames.For(ids).PlotFile));
    }

    [Fact]
    public void A_run_with_a_255_character_id_gets_its_plot_and_summary_json_names_it()
    {
        using var series = RepoPaths.CopyOf(RepoPaths.Sample("violet-complex-acid"));
        using var outDir = new RepoPaths.TempDir();
        var longId = new string('L', 250) + "/ünï";
        var plan = Path.Combine(series.Path, "plan.csv");
        File.WriteAllText(plan, File.ReadAllText(plan).Replace("\nR1,", $"\n{longId},", StringComparison.Ordinal).Replace("\nR2,", "\nR/2,", StringComparison.Ordinal));

        var code = TraceKin.Cli.Program.BuildRoot().Parse(["analyse", series.Path, "--out", outDir.Path, "--workers", "2"]).Invoke();

        Assert.Equal(0, code);
        using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir.Path, "summary.json")));
        var runs = doc.RootElement.GetProperty("runs").EnumerateArray().ToDictionary(r => r.GetProperty("id").GetString()!, r => r.GetProperty("plotFile").GetString()!);
        Assert.Equal(8, runs.Count);
        Assert.Empty(SchemaCheck.Check(doc.RootElement));
        Assert.Equal("plots/run-R3.png", runs["R3"]);
        Assert.True(runs[longId].Length <= "plots/".Length + 88);
        Assert.Equal(8, runs.Values.Distinct().Count());
        foreach (var file in runs.Values)
        {
            Assert.Matches(Safe, Path.GetFileName(file));
            Assert.True(File.Exists(Path.Combine(outDir.Path, file)), file);
        }
        Assert.Equal(runs.Values.Select(Path.GetFileName).Order(StringComparer.Ordinal),
            Directory.EnumerateFiles(Path.Combine(outDir.Path, "plots"), "run-*.png").Select(Path.GetFileName).Order(StringComparer.Ordinal));
    }

    [Fact]
    public void With_no_plots_summary_json_has_a_null_plot_file_for_each_run()
    {
        using var outDir = new RepoPaths.TempDir();
        Assert.Equal(0, TraceKin.Cli.Program.BuildRoot().Parse(["analyse", RepoPaths.Sample("violet-complex-acid"), "--out", outDir.Path, "--no-plots"]).Invoke());
        using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir.Path, "summary.json")));
        Assert.All(doc.RootElement.GetProperty("runs").EnumerateArray(), r => Assert.Equal(JsonValueKind.Null, r.GetProperty("plotFile").ValueKind));
        Assert.False(Directory.Exists(Path.Combine(outDir.Path, "plots")));
    }
}
