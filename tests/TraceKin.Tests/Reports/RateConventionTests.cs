using System.Text.Json;
using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Setup;
using TraceKin.Simulation;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

/// <summary>
/// summary.json states the rate convention: ν recorded, and for |ν| ≠ 1 the headline k also for the species' own
/// rate of change. Round trip on an invented series 2 X → products with rate (1/ν)·d[X]/dt = k·[X], k = 0.002 1/s:
/// then −d[X]/dt = 2k·[X] (rate of reaction, IUPAC Gold Book, doi:10.1351/goldbook.R05156).
/// </summary>
public class RateConventionTests
{
    private static JsonElement Summary(double coefficient, out SeriesResult result)
    {
        using var dir = new RepoPaths.TempDir();
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"), "run,file,temperature (°C),[X]0 (mmol/L)\nR1,r1.csv,25,1\nR2,r2.csv,25,2\nR3,r3.csv,25,3\n");
        var toml = $"[signal]\nkind = \"absorbance\"\nspecies = \"X\"\ncoefficient = {coefficient}\nmolar_absorptivity = 300\n[model]\nspecies = [\"X\"]\n";
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"), toml);
        var config = SeriesConfig.FromText(toml, "series.toml");
        var plan = Plan.FromFile(Path.Combine(dir.Path, "plan.csv"));
        var law = new SimulatedLaw(0.002, new Dictionary<string, double> { ["X"] = 1 }, new Dictionary<string, double> { ["X"] = coefficient });
        foreach (var row in plan.Rows)
            File.WriteAllText(Path.Combine(dir.Path, row.File), SampleWriter.ExportText(row, config, law, new SamplingPlan(600, 2, 0.0002, 5)));
        result = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1 });
        using var ms = new MemoryStream();
        SummaryJson.WriteTo(result, ms);
        return JsonDocument.Parse(ms.ToArray()).RootElement.Clone();
    }

    [Fact]
    public void With_nu_minus_two_summary_records_nu_and_gives_k_for_minus_dX_dt_as_twice_k()
    {
        var json = Summary(-2, out var result);
        Assert.Empty(result.Rejected);
        var conv = json.GetProperty("rateConvention");
        Assert.Equal(-2, conv.GetProperty("coefficient").GetDouble());
        Assert.Equal("(1/ν)·d[X]/dt", conv.GetProperty("rate").GetString());
        var k = json.GetProperty("rateConstant").GetProperty("value").GetDouble();
        Assert.InRange(k, 0.002 * 0.97, 0.002 * 1.03);
        var alt = conv.GetProperty("rateConstantForSpeciesRate");
        Assert.Equal("rate = −d[X]/dt", alt.GetProperty("convention").GetString());
        Assert.Equal(2 * k, alt.GetProperty("value").GetDouble());
        Assert.InRange(alt.GetProperty("value").GetDouble(), 0.004 * 0.97, 0.004 * 1.03);
        Assert.Empty(SchemaCheck.Check(json));
    }

    [Fact]
    public void With_nu_minus_one_the_two_conventions_agree_and_no_second_k_is_written()
    {
        var json = Summary(-1, out _);
        var conv = json.GetProperty("rateConvention");
        Assert.Equal(-1, conv.GetProperty("coefficient").GetDouble());
        Assert.Equal(JsonValueKind.Null, conv.GetProperty("rateConstantForSpeciesRate").ValueKind);
    }
}
