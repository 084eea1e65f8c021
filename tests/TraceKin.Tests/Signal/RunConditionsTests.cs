using System.Globalization;
using TraceKin.Analysis;
using TraceKin.Setup;
using TraceKin.Simulation;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Signal;

/// <summary>
/// Conversion parameters given per run in plan.csv: each run converted with its own value (checked against a hand
/// computation), the source of each value stated, and a simulated gas series with per-run barometric pressure
/// recovered exactly.
/// </summary>
public class RunConditionsTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    // CODATA 2018: R = 8.314462618 J/(mol·K) (TestData/constants/constants.md).
    private const double R = 8.314462618;
    // IAPWS-IF97 Table 35 check value: p_s(300 K) = 0.353658941e-2 MPa (TestData/iapws/water-saturation.md).
    private const double WaterAt300K = 3536.58941;

    private static SeriesResult Analyse(string dir) => SeriesRunner.Analyse(dir, new AnalysisOptions { Workers = 1, Retention = TraceRetention.Full });

    private static string Rejections(SeriesResult r) => string.Join("; ", r.Rejected.Select(p => p.Message));

    private static void Write(string dir, string name, string text) => File.WriteAllText(Path.Combine(dir, name), text);

    [Fact]
    public void Each_gas_run_is_converted_with_its_own_barometric_pressure_and_zero_offset()
    {
        using var dir = new RepoPaths.TempDir();
        var volumes = new[] { 0.5, 2.5, 4.5, 6.5, 8.5 }; // mL
        foreach (var f in new[] { "g1.csv", "g2.csv" })
            Write(dir.Path, f, "time (s),volume (mL)\n" + string.Join("\n", volumes.Select((v, i) => string.Format(Inv, "{0},{1}", 30 * i, v))) + "\n");
        // 26.85 °C = 300 K; the second run takes the series' barometric pressure and zero offset.
        Write(dir.Path, "plan.csv", "run,file,temperature (°C),[A]0 (mmol/L),barometric_pressure (kPa),zero_offset (mL)\n" +
                                    "G1,g1.csv,26.85,20,99.10,0.5\nG2,g2.csv,26.85,20,,\n");
        Write(dir.Path, "series.toml", "[signal]\nkind = \"gas_volume\"\nspecies = \"A\"\ncoefficient = -1\npressure_unit = \"kPa\"\n" +
                                       "barometric_pressure = 101.8\nsolution_volume = 50\nzero_offset = 0\n");

        var result = Analyse(dir.Path);

        Assert.True(result.Rejected.Count == 0, Rejections(result));
        foreach (var (run, pb, zero) in new[] { ("G1", 99100.0, 0.5), ("G2", 101800.0, 0.0) })
        {
            var r = result.Runs.Single(x => x.Id == run);
            for (var i = 0; i < volumes.Length; i++)
            {
                // Dalton + perfect gas: n = (p_bar − p_H2O)·V/(R·T), V in m³; [A] = [A]0 − n/V_solution (docs/methods.md).
                var n = (pb - WaterAt300K) * (volumes[i] - zero) * 1e-6 / (R * 300);
                var expected = 0.020 - n / 0.050;
                Assert.Equal(expected, r.Converted.Concentration.Values[i], 1e-10);
            }
            var source = r.Converted.ConstantsUsed.Single(kv => kv.Key == "p_bar").Value;
            Assert.Contains(run == "G1" ? "plan.csv line 2" : "signal.barometric_pressure", source);
        }
        // The report lists the constants per group of runs, each value with its source.
        var html = TraceKin.Reports.ReportHtml.Render(result, null);
        Assert.Contains("Used for run(s) G1:", html);
        Assert.Contains("99100 Pa (plan.csv line 2, column &quot;barometric_pressure (kPa)&quot;)", html);
        Assert.Contains("101800 Pa (signal.barometric_pressure)", html);
    }

    [Fact]
    public void Each_absorbance_run_is_converted_with_its_own_blank_and_path_length()
    {
        using var dir = new RepoPaths.TempDir();
        var absorbance = new[] { 0.80, 0.65, 0.52, 0.42, 0.35 };
        foreach (var f in new[] { "a1.csv", "a2.csv" })
            Write(dir.Path, f, "time (s),A\n" + string.Join("\n", absorbance.Select((a, i) => string.Format(Inv, "{0},{1}", 20 * i, a))) + "\n");
        Write(dir.Path, "plan.csv", "run,file,temperature (°C),[A]0 (mmol/L),blank (AU),path_length (mm)\nW1,a1.csv,25,1,0.031,5\nW2,a2.csv,25,1,,\n");
        Write(dir.Path, "series.toml", "[signal]\nkind = \"absorbance\"\nspecies = \"A\"\nmolar_absorptivity = 1500\npath_length = 1\nblank = 0.05\n");

        var result = Analyse(dir.Path);

        Assert.True(result.Rejected.Count == 0, Rejections(result));
        foreach (var (run, blank, l) in new[] { ("W1", 0.031, 0.5), ("W2", 0.05, 1.0) })
        {
            var r = result.Runs.Single(x => x.Id == run);
            for (var i = 0; i < absorbance.Length; i++)
                // Beer–Lambert, A − A_blank = ε·l·c (IUPAC Gold Book, "Beer–Lambert law").
                Assert.Equal((absorbance[i] - blank) / (1500 * l), r.Converted.Concentration.Values[i], 1e-15);
            Assert.Contains(run == "W1" ? "plan.csv line 2" : "signal.blank", r.Converted.ConstantsUsed.Single(kv => kv.Key == "blank").Value);
        }
    }

    [Fact]
    public void A_simulated_gas_series_with_barometric_pressure_per_run_recovers_its_concentrations_exactly()
    {
        using var dir = new RepoPaths.TempDir();
        const string planText = "run,file,temperature (°C),[A]0 (mmol/L),barometric_pressure (kPa),gas_temperature (°C)\n" +
                                "P1,p1.csv,25,20,99.10,23.5\nP2,p2.csv,25,40,101.35,24.0\nP3,p3.csv,25,30,102.80,22.0\n";
        const string toml = "[signal]\nkind = \"gas_volume\"\nspecies = \"A\"\ncoefficient = -1\nsolution_volume = 50\n";
        Write(dir.Path, "plan.csv", planText);
        Write(dir.Path, "series.toml", toml);
        var plan = Plan.FromText(planText, "plan.csv");
        var config = SeriesConfig.FromText(toml, "series.toml");
        var law = new SimulatedLaw(2e-3, new Dictionary<string, double> { ["A"] = 1 }, new Dictionary<string, double> { ["A"] = -1 });
        var sampling = new SamplingPlan(600, 5, 0, 11);
        foreach (var row in plan.Rows)
            Write(dir.Path, row.File, SampleWriter.ExportText(row, config, law, sampling));

        var result = Analyse(dir.Path);

        Assert.True(result.Rejected.Count == 0, Rejections(result));
        foreach (var row in plan.Rows)
        {
            var c = result.Runs.Single(r => r.Id == row.Run).Converted.Concentration;
            var truth = RateLawSimulator.Integrate(law, row.InitialConcentrations, row.TemperatureK, c.Times)["A"];
            // The export holds volumes to 9 significant digits (a relative rounding of at most 5e-9), so the amount of A
            // consumed is recovered to 5e-9 of itself, which is less than 5e-9·[A]0.
            for (var i = 0; i < truth.Length; i++)
                Assert.True(Math.Abs(truth[i] - c.Values[i]) <= 5e-9 * row.InitialConcentrations["A"], $"{row.Run} at {c.Times[i]} s: {truth[i]} against {c.Values[i]}");
        }

        // The same exports read with one series-wide pressure (the mean) miss by far more: the test can fail.
        Write(dir.Path, "plan.csv", "run,file,temperature (°C),[A]0 (mmol/L)\nP1,p1.csv,25,20\nP2,p2.csv,25,40\nP3,p3.csv,25,30\n");
        Write(dir.Path, "series.toml", toml + "pressure_unit = \"kPa\"\nbarometric_pressure = 101.0833\n");
        var mean = Analyse(dir.Path);
        var p1 = mean.Runs.Single(r => r.Id == "P1").Converted.Concentration;
        var t1 = RateLawSimulator.Integrate(law, plan.Rows[0].InitialConcentrations, 298.15, p1.Times)["A"];
        Assert.True(Math.Abs(t1[^1] - p1.Values[^1]) > 1e-4 * 0.020);
    }

    [Fact]
    public void A_parameter_column_the_conversion_does_not_use_is_located_at_its_header()
    {
        using var dir = new RepoPaths.TempDir();
        Write(dir.Path, "a1.csv", "time (s),A\n0,0.8\n10,0.7\n20,0.6\n30,0.5\n");
        Write(dir.Path, "plan.csv", "run,file,[A]0 (mmol/L),barometric_pressure (kPa)\nW1,a1.csv,1,101.2\n");
        Write(dir.Path, "series.toml", "[signal]\nkind = \"absorbance\"\nspecies = \"A\"\nmolar_absorptivity = 1500\n");

        var p = Analyse(dir.Path).Rejected.Single();

        Assert.Equal(("plan.csv", 1, 24), (p.File, p.Line, p.Column));
        Assert.Contains("blank, path_length", p.Expected);
    }

    [Fact]
    public void A_gas_series_with_a_pressure_column_left_empty_and_no_series_pressure_is_located_at_the_empty_cell()
    {
        using var dir = new RepoPaths.TempDir();
        Write(dir.Path, "g1.csv", "time (s),volume (mL)\n0,0\n10,1\n20,2\n30,3\n");
        Write(dir.Path, "plan.csv", "run,file,temperature (°C),[A]0 (mmol/L),barometric_pressure (kPa)\nG1,g1.csv,25,20,99.1\nG2,g1.csv,25,20,\n");
        Write(dir.Path, "series.toml", "[signal]\nkind = \"gas_volume\"\nspecies = \"A\"\nsolution_volume = 50\n");

        var p = Analyse(dir.Path).Rejected.Single();

        Assert.Equal(("plan.csv", 3, 17), (p.File, p.Line, p.Column));
    }
}
