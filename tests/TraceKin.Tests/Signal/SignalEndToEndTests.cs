using TraceKin.Analysis;
using TraceKin.Setup;
using TraceKin.Simulation;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Signal;

/// <summary>
/// Each signal kind end to end: exports simulated from a known first-order law through the forward conversion
/// (invented series, fixed seed), then analysed through the backward one; the rate constant must come back.
/// </summary>
public class SignalEndToEndTests
{
    public static TheoryData<string, string, double> Series() => new()
    {
        // series.toml [signal] table, species column unit header, noise in the written signal unit
        { "kind = \"gas_volume\"\nchannel = \"volume (mL)\"\ncoefficient = -2\nbarometric_pressure = 100.6\npressure_unit = \"kPa\"\nsolution_volume = 50", "(mol/L)", 0.01 },
        { "kind = \"pressure\"\nchannel = \"pressure (kPa)\"\ngas_mole_change = 1\ninitial_pressure = 20\npressure_unit = \"kPa\"\ninitial_mole_fraction = 0.5", "(mmol/L)", 0.005 },
        { "kind = \"conductivity\"\nchannel = \"conductivity (mS/cm)\"\nkappa_initial = 2.5\nkappa_final = 0.9\nconductivity_unit = \"mS/cm\"", "(mmol/L)", 0.001 },
        { "kind = \"calibrated\"\nchannel = \"F (AU)\"\n[signal.calibration]\nmodel = \"quadratic\"\nconcentration_unit = \"mmol/L\"\nsignal = [0.010, 0.262, 0.498, 0.716, 0.921, 1.101]\nconcentration = [0, 1, 2, 3, 4, 5]", "(mmol/L)", 0.0005 },
    };

    [Theory]
    [MemberData(nameof(Series))]
    public void Rate_constant_comes_back_through_each_kind_of_signal(string signalTable, string unit, double noise)
    {
        using var dir = new RepoPaths.TempDir();
        // Concentrations scaled so every run stays in its conversion's range: mol/L for gas, mmol/L otherwise.
        var scale = unit == "(mol/L)" ? 0.01 : 1;
        var levels = new[] { 1.0, 2.0, 3.0, 4.0 }.Select(x => (x * scale).ToString(System.Globalization.CultureInfo.InvariantCulture)).ToArray();
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"),
            $"run,file,temperature (°C),[X]0 {unit}\n" + string.Join("\n", levels.Select((c, i) => $"R{i + 1},r{i + 1}.csv,25,{c}")) + "\n");
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"), "[signal]\nspecies = \"X\"\n" + signalTable + "\n[model]\nspecies = [\"X\"]\n");
        var config = SeriesConfig.FromFile(Path.Combine(dir.Path, "series.toml"));
        var plan = Plan.FromFile(Path.Combine(dir.Path, "plan.csv"));
        const double k = 0.002;
        var law = new SimulatedLaw(k, new Dictionary<string, double> { ["X"] = 1 }, new Dictionary<string, double> { ["X"] = config.Signal.Coefficient });
        foreach (var row in plan.Rows)
            File.WriteAllText(Path.Combine(dir.Path, row.File), SampleWriter.ExportText(row, config, law, new SamplingPlan(600, 2, noise, 7)));

        var result = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1 });

        Assert.Empty(result.Rejected);
        Assert.Equal(4, result.Runs.Count);
        Assert.InRange(result.Findings!.RateConstant!.Value, k * 0.97, k * 1.03);
    }
}
