using System.Globalization;
using TraceKin.Analysis;
using TraceKin.Setup;
using TraceKin.Simulation;
using TraceKin.Tests.Support;
using TraceKin.Traces;

namespace TraceKin.Tests.Signal;

/// <summary>A gas collector zeroed after mixing: the gas lost before the zero is extrapolated back to mixing.</summary>
public class GasZeroTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    // CODATA 2018 R = 8.314462618 J/(mol·K) (TestData/constants/constants.md).
    private const double R = 8.314462618;
    // IAPWS-IF97 Table 35: p_s(300 K) = 0.353658941e-2 MPa (TestData/iapws/water-saturation.md).
    private const double WaterAt300K = 3536.58941;

    private const string Toml = "[signal]\nkind = \"gas_volume\"\nspecies = \"A\"\ncoefficient = -1\nbarometric_pressure = 100.5\npressure_unit = \"kPa\"\n" +
                                "solution_volume = 50\nzeroed_after_mixing = true\n";

    [Fact]
    public void Gas_formed_before_the_zero_is_recovered_when_the_early_volume_is_quadratic_in_time()
    {
        using var dir = new RepoPaths.TempDir();
        // Invented: gas volume since mixing V(t) = 0.05·t + 2e-5·t² mL; the syringe is zeroed at 20 s, the first sample.
        static double V(double t) => 0.05 * t + 2e-5 * t * t;
        var times = Enumerable.Range(0, 29).Select(i => 20.0 + 10 * i).ToArray();
        var readings = times.Select(t => V(t) - V(20)).ToArray();
        File.WriteAllText(Path.Combine(dir.Path, "g1.csv"),
            "mixed at: 0 s\ntime (s),volume (mL)\n" + string.Join("\n", times.Select((t, i) => string.Format(Inv, "{0},{1:R}", t, readings[i]))) + "\n");
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"), "run,file,temperature (°C),[A]0 (mmol/L)\nG1,g1.csv,26.85,20\n");
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"), Toml);

        var result = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1, Retention = TraceRetention.Full });

        Assert.True(result.Rejected.Count == 0, string.Join("; ", result.Rejected.Select(p => p.Message)));
        var run = result.Runs.Single();
        for (var i = 0; i < times.Length; i++)
        {
            // The quadratic through the early readings is exact here, so at mixing it reads −V(20) = −1.008 mL; the gas
            // since mixing is reading + 1.008 mL. Dalton + perfect gas: n = (p_bar − p_H2O)·V/(R·T); [A] = [A]0 − n/V_soln.
            var n = (100500 - WaterAt300K) * (readings[i] + 1.008) * 1e-6 / (R * 300);
            Assert.Equal(0.020 - n / 0.050, run.Converted.Concentration.Values[i], 1e-11);
        }
        var zero = run.Converted.ConstantsUsed.Single(kv => kv.Key == "V_zero").Value;
        Assert.Contains("extrapolated to mixing", zero);
        Assert.StartsWith("-0.001008", zero);
    }

    [Fact]
    public void A_simulated_series_zeroed_at_its_first_sample_comes_back_close_to_the_truth()
    {
        using var dir = new RepoPaths.TempDir();
        const string planText = "run,file,temperature (°C),[A]0 (mmol/L)\nZ1,z1.csv,25,20\nZ2,z2.csv,25,40\n";
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"), planText);
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"), Toml);
        var config = SeriesConfig.FromText(Toml, "series.toml");
        var law = new SimulatedLaw(2e-3, new Dictionary<string, double> { ["A"] = 1 }, new Dictionary<string, double> { ["A"] = -1 });
        var plan = Plan.FromText(planText, "plan.csv");
        foreach (var row in plan.Rows)
            File.WriteAllText(Path.Combine(dir.Path, row.File), SampleWriter.ExportText(row, config, law, new SamplingPlan(600, 5, 0, 3, DeadTime: 15)));

        var result = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1, Retention = TraceRetention.Full });

        Assert.True(result.Rejected.Count == 0, string.Join("; ", result.Rejected.Select(p => p.Message)));
        foreach (var row in plan.Rows)
        {
            var c = result.Runs.Single(r => r.Id == row.Run).Converted.Concentration;
            var a0 = row.InitialConcentrations["A"];
            // First order: [A] = [A]0·exp(−k·t) (closed-form integrated law, common practice, no source). By 15 s, 3 % of
            // [A]0 has reacted; a quadratic over the first 75 s misses only the cubic term, (k·t)³/6 ≈ 6e-4 at most.
            for (var i = 0; i < c.Count; i++)
                Assert.True(Math.Abs(a0 * Math.Exp(-2e-3 * c.Times[i]) - c.Values[i]) < 1e-3 * a0, $"{row.Run} at {c.Times[i]} s");
            Assert.True(a0 - c.Values[0] > 0.02 * a0, "the first sample already shows the gas lost before the zero");
        }
    }

    [Fact]
    public void An_export_that_does_not_state_the_moment_of_mixing_cannot_be_extrapolated_and_says_so()
    {
        using var dir = new RepoPaths.TempDir();
        File.WriteAllText(Path.Combine(dir.Path, "g1.csv"), "time (s),volume (mL)\n" + string.Join("\n", Enumerable.Range(0, 10).Select(i => $"{10 * i},{0.5 * i}")) + "\n");
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"), "run,file,temperature (°C),[A]0 (mmol/L)\nG1,g1.csv,25,20\n");
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"), Toml);

        var p = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1 }).Rejected.Single();

        Assert.Equal(("signal.zeroed_after_mixing", 8), (p.Key, p.Line));
        Assert.Contains("mixed at", p.Hint);
    }

    [Fact]
    public void A_zero_offset_together_with_zeroed_after_mixing_is_an_error_at_its_key()
    {
        var ex = Assert.Throws<InputException>(() => SeriesConfig.FromText(Toml + "zero_offset = 0.2\n", "series.toml"));
        Assert.Equal("signal.zero_offset", ex.Problem.Key);
        Assert.True(ex.Problem.Line > 0);
    }

    [Fact]
    public void Zeroed_after_mixing_with_another_kind_is_an_error_at_its_key()
    {
        var ex = Assert.Throws<InputException>(() => SeriesConfig.FromText("[signal]\nkind = \"absorbance\"\nzeroed_after_mixing = true\n", "series.toml"));
        Assert.Equal("signal.zeroed_after_mixing", ex.Problem.Key);
    }
}
