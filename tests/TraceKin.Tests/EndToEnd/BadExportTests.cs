using System.Text.Json;
using TraceKin.Cli;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.EndToEnd;

/// <summary>One bad export never stops a batch: it is rejected with a located message, the rest are analysed.</summary>
public class BadExportTests
{
    [Fact]
    public void Series_with_bad_exports_analyses_the_others_lists_each_problem_and_exits_two()
    {
        using var series = RepoPaths.CopyOf(RepoPaths.Sample("violet-complex-acid"));
        using var outDir = new RepoPaths.TempDir();
        // r3: a non-numeric cell on data line 10 of the file; r5: the signal column is missing; r7: empty file.
        var r3 = File.ReadAllLines(Path.Combine(series.Path, "r3.csv"));
        var badLine = Array.FindIndex(r3, l => l.StartsWith("4.5,"));
        r3[badLine] = "4.5,0.61x3";
        File.WriteAllLines(Path.Combine(series.Path, "r3.csv"), r3);
        File.WriteAllLines(Path.Combine(series.Path, "r5.csv"), File.ReadAllLines(Path.Combine(series.Path, "r5.csv"))
            .Select(l => l.Contains(',') ? l[..l.IndexOf(',')] + ",extra (furlongs)" : l));
        File.WriteAllText(Path.Combine(series.Path, "r7.csv"), "");

        var code = Program.BuildRoot().Parse(["analyse", series.Path, "--out", outDir.Path, "--no-plots"]).Invoke();

        Assert.Equal(ExitCodes.SomeRejected, code);
        using var summary = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir.Path, "summary.json")));
        Assert.Equal(5, summary.RootElement.GetProperty("runs").GetArrayLength());
        var rejected = summary.RootElement.GetProperty("rejected").EnumerateArray().ToDictionary(e => e.GetProperty("file").GetString()!);
        Assert.Equal(["r3.csv", "r5.csv", "r7.csv"], rejected.Keys.Order());

        var cell = rejected["r3.csv"];
        Assert.Equal(badLine + 1, cell.GetProperty("line").GetInt32());
        Assert.Equal(5, cell.GetProperty("column").GetInt32());
        Assert.Contains("0.61x3", cell.GetProperty("found").GetString());
        Assert.Contains("number", cell.GetProperty("expected").GetString());
        Assert.Contains("r3.csv:" + (badLine + 1) + ":5", cell.GetProperty("message").GetString());

        Assert.True(rejected["r5.csv"].GetProperty("line").GetInt32() >= 1);
        Assert.Contains("furlongs", rejected["r5.csv"].GetProperty("found").GetString());
        Assert.Equal(1, rejected["r7.csv"].GetProperty("line").GetInt32());
        Assert.Contains("empty", rejected["r7.csv"].GetProperty("found").GetString());
        Assert.Equal(5, File.ReadAllLines(Path.Combine(outDir.Path, "runs.csv")).Length - 1);
    }
}
