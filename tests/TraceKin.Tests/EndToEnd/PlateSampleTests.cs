using System.Collections.Concurrent;
using System.Text.Json;
using TraceKin.Analysis;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.EndToEnd;

/// <summary>
/// Round trip on the bundled plate demo: its export was written by `tracekin simulate` from the Michaelis–Menten law
/// with known Vmax and Km (sample-traces/teal-lactonase-plate/truth.json); the analysis must prefer the saturation
/// law and hold both true values inside its 95 % intervals.
/// </summary>
public class PlateSampleTests
{
    private static readonly string Sample = RepoPaths.Sample("teal-lactonase-plate");

    [Fact]
    public void Plate_demo_prefers_the_saturation_law_and_its_intervals_hold_the_true_Vmax_and_Km()
    {
        using var truth = JsonDocument.Parse(File.ReadAllText(Path.Combine(Sample, "truth.json")));
        var parsed = new ConcurrentBag<string>();
        var result = SeriesRunner.Analyse(Sample, new AnalysisOptions { Workers = 2, ExportParsed = parsed.Add });

        Assert.Empty(result.Rejected);
        Assert.Equal(32, result.Runs.Count);
        Assert.Equal(["plate.csv"], parsed.ToArray());
        var sat = result.Findings!.Saturation!;
        Assert.Equal("saturation", sat.Preferred);
        Assert.Equal("saturation", result.Findings.ChosenLaw);
        var vmax = truth.RootElement.GetProperty("vmax").GetProperty("value").GetDouble();
        var km = truth.RootElement.GetProperty("km").GetProperty("value").GetDouble() / 1000;   // mmol/L → mol/L
        Assert.InRange(vmax, sat.Vmax.Ci95Low, sat.Vmax.Ci95High);
        Assert.InRange(km, sat.Km.Ci95Low, sat.Km.Ci95High);
        // eight substrate levels in triplicate; the blanks are not grouped
        Assert.Equal(8, result.Replicates.Count);
        Assert.All(result.Replicates, g => Assert.Equal(3, g.Runs.Count));
        Assert.All(result.Replicates, g => Assert.True(g.StdDev > 0 && g.MeanStdError > 0));
        var html = TraceKin.Reports.ReportHtml.Render(result, null);
        Assert.Contains("<section id=\"replicates\">", html);
        Assert.Contains("A1, A2, A3", html);
    }
}
