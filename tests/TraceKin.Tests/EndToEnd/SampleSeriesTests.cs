using System.Text.Json;
using TraceKin.Analysis;
using TraceKin.Cli;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.EndToEnd;

/// <summary>
/// Round trip on the bundled demo series: its exports were written by `tracekin simulate` from a known law
/// (sample-traces/violet-complex-acid/truth.json: orders 1 and 1, k = 0.35 L/(mol·s)); analysis must recover it.
/// </summary>
public class SampleSeriesTests
{
    private static readonly string Sample = RepoPaths.Sample("violet-complex-acid");

    [Fact]
    public void Sample_series_recovers_true_orders_within_0_05_and_k_within_3_percent()
    {
        using var truth = JsonDocument.Parse(File.ReadAllText(Path.Combine(Sample, "truth.json")));
        var result = SeriesRunner.Analyse(Sample, new AnalysisOptions { Workers = 2 });

        Assert.Empty(result.Rejected);
        Assert.Equal(8, result.Runs.Count);
        var findings = result.Findings!;
        foreach (var order in truth.RootElement.GetProperty("orders").EnumerateObject())
        {
            var found = findings.Orders.Single(o => o.Species == order.Name);
            Assert.InRange(found.Value, order.Value.GetDouble() - 0.05, order.Value.GetDouble() + 0.05);
        }
        var k = truth.RootElement.GetProperty("rateConstant").GetProperty("value").GetDouble();
        Assert.InRange(findings.RateConstant!.Value, k * 0.97, k * 1.03);
        Assert.Equal("L/(mol·s)", findings.RateConstant.Unit);
    }

    [Fact]
    public void Analyse_command_writes_every_output_and_exits_zero()
    {
        using var outDir = new RepoPaths.TempDir();
        var code = Program.BuildRoot().Parse(["analyse", Sample, "--out", outDir.Path]).Invoke();

        Assert.Equal(ExitCodes.Ok, code);
        using var summary = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir.Path, "summary.json")));
        var runs = summary.RootElement.GetProperty("runs");
        Assert.Equal(8, runs.GetArrayLength());
        foreach (var run in runs.EnumerateArray())
        {
            var rate = run.GetProperty("initialRate");
            Assert.True(rate.GetProperty("value").GetDouble() > 0);
            Assert.True(rate.GetProperty("stdError").GetDouble() > 0);
            Assert.Equal("mol/(L·s)", rate.GetProperty("unit").GetString());
            Assert.True(rate.GetProperty("windowEnd").GetDouble() > rate.GetProperty("windowStart").GetDouble());
        }
        Assert.Equal(2, summary.RootElement.GetProperty("orders").GetArrayLength());
        var csv = File.ReadAllLines(Path.Combine(outDir.Path, "runs.csv"));
        Assert.Equal(9, csv.Length);
        foreach (var id in Enumerable.Range(1, 8))
            AssertPng(Path.Combine(outDir.Path, "plots", $"run-R{id}.png"));
        AssertPng(Path.Combine(outDir.Path, "plots", "orders.png"));
        Assert.True(File.Exists(Path.Combine(outDir.Path, "tracekin.log")));
    }

    [Fact]
    public void Usage_error_exits_with_code_one()
    {
        var code = Program.BuildRoot().Parse(["analyse", "/no/such/folder", "--out", Path.GetTempPath()]).Invoke();
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Equal(ExitCodes.Usage, Program.BuildRoot().Parse(["analyse"]).Invoke());
    }

    private static void AssertPng(string path)
    {
        var bytes = File.ReadAllBytes(path);
        Assert.True(bytes.Length > 5000, $"{path} is only {bytes.Length} bytes");
        Assert.Equal(new byte[] { 0x89, (byte)'P', (byte)'N', (byte)'G' }, bytes[..4]);
    }
}
