using System.Globalization;
using TraceKin.Analysis;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Signal;

/// <summary>
/// Calibrated conversions × the units of the channel and of the standards (inline arrays or a file, unit declared or
/// not), each concentration checked against a hand computation. Unit factors: 1 mS/cm = 0.1 S/m, 1 µS/cm = 1e-4 S/m
/// (SI definitions, BIPM SI Brochure, 9th ed., prefixes; from memory), 1 kPa = 1000 Pa.
/// Standards: c = 0, 1, 2, 3, 4 mmol/L with signal = 0.1 + 0.5·c in the standards' unit, so a reading r (channel unit)
/// read against them gives c = (r·f_channel/f_standards − 0.1)/0.5 mmol/L.
/// </summary>
public sealed class CalibrationUnitsTests
{
    private static readonly double[] Levels = [0, 1, 2, 3, 4];

    private static readonly Dictionary<string, double> Factor = new()
    {
        ["S/m"] = 1, ["mS/cm"] = 0.1, ["µS/cm"] = 1e-4, ["AU"] = 1, ["kPa"] = 1000, ["Pa"] = 1,
    };

    public static TheoryData<string, string, string, string?, bool> Matrix()
    {
        var d = new TheoryData<string, string, string, string?, bool>();
        // kind, channel header, channel unit, declared standards unit (null: none), standards from a file
        foreach (var file in new[] { false, true })
        {
            foreach (var kind in new[] { "conductivity", "calibrated" })
                foreach (var cu in new[] { "S/m", "mS/cm", "µS/cm" })
                    foreach (var su in new string?[] { null, cu, cu == "S/m" ? "mS/cm" : "S/m" })
                        d.Add(kind, "kappa", cu, su, file);
            foreach (var su in new string?[] { null, "AU" })
            {
                d.Add("absorbance", "A", "AU", su, file);
                d.Add("calibrated", "A", "AU", su, file);
            }
            foreach (var su in new string?[] { null, "kPa", "Pa" })
                d.Add("calibrated", "p", "kPa", su, file);
        }
        return d;
    }

    [Theory]
    [MemberData(nameof(Matrix))]
    public void Concentrations_from_standards_match_the_hand_computation(string kind, string channel, string channelUnit, string? standardsUnit, bool fromFile)
    {
        using var dir = new RepoPaths.TempDir();
        var inv = CultureInfo.InvariantCulture;
        var stdUnit = standardsUnit ?? channelUnit;
        // Readings in the channel's unit chosen to fall inside the standards (signal 0.1 … 2.1 in the standards' unit).
        var fs = Factor[stdUnit]; var fc = Factor[channelUnit];
        var readings = new[] { 0.4, 0.9, 1.3, 1.8, 2.0 }.Select(sig => sig * fs / fc).ToArray();
        File.WriteAllText(Path.Combine(dir.Path, "r1.csv"),
            $"time (s),{channel} ({channelUnit})\n" + string.Join("\n", readings.Select((r, i) => string.Format(inv, "{0},{1:R}", 10 * i, r))) + "\n");
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"), "run,file,temperature (°C),[X]0 (mmol/L)\nR1,r1.csv,25,5\n");
        var signals = Levels.Select(c => 0.1 + 0.5 * c).ToArray();
        string calibration;
        if (fromFile)
        {
            var header = standardsUnit is null ? "signal" : $"signal ({standardsUnit})";
            File.WriteAllText(Path.Combine(dir.Path, "standards.csv"),
                $"{header},[X] (mmol/L)\n" + string.Join("\n", Levels.Select((c, i) => string.Format(inv, "{0:R},{1}", signals[i], c))) + "\n");
            calibration = "[signal.calibration]\nfile = \"standards.csv\"\n";
        }
        else
            calibration = "[signal.calibration]\nconcentration_unit = \"mmol/L\"\n" +
                          $"signal = [{string.Join(", ", signals.Select(v => v.ToString("R", inv)))}]\nconcentration = [0, 1, 2, 3, 4]\n" +
                          (standardsUnit is null ? "" : $"signal_unit = \"{standardsUnit}\"\n");
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"),
            $"[signal]\nkind = \"{kind}\"\nchannel = \"{channel} ({channelUnit})\"\nspecies = \"X\"\ncoefficient = -1\n" + calibration);

        var result = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1, Retention = TraceRetention.Full });

        Assert.True(result.Rejected.Count == 0, string.Join("; ", result.Rejected.Select(p => p.Message + " / " + p.Expected)));
        var conc = result.Runs.Single().Converted.Concentration.Values;
        for (var i = 0; i < readings.Length; i++)
        {
            var expected = (readings[i] * fc / fs - 0.1) / 0.5 * 1e-3; // mol/L, by hand from the formula above
            Assert.Equal(expected, conc[i], 1e-12);
        }
    }

    [Fact]
    public void A_conductivity_series_with_standards_in_millisiemens_per_centimetre_gives_the_right_concentrations()
    {
        // The case that once came out exactly ten times too small: channel and standards file both in mS/cm.
        Concentrations_from_standards_match_the_hand_computation("calibrated", "kappa", "mS/cm", "mS/cm", true);
        Concentrations_from_standards_match_the_hand_computation("conductivity", "kappa", "mS/cm", null, true);
    }

    [Fact]
    public void Standards_in_a_unit_of_another_quantity_than_the_channel_are_rejected_naming_both_units()
    {
        using var dir = new RepoPaths.TempDir();
        File.WriteAllText(Path.Combine(dir.Path, "r1.csv"), "time (s),kappa (mS/cm)\n0,1.0\n10,0.9\n20,0.8\n30,0.7\n40,0.6\n");
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"), "run,file,temperature (°C),[X]0 (mmol/L)\nR1,r1.csv,25,5\n");
        File.WriteAllText(Path.Combine(dir.Path, "standards.csv"), "signal (kPa),[X] (mmol/L)\n0.1,0\n0.6,1\n1.1,2\n1.6,3\n2.1,4\n");
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"),
            "[signal]\nkind = \"calibrated\"\nchannel = \"kappa (mS/cm)\"\nspecies = \"X\"\ncoefficient = -1\n[signal.calibration]\nfile = \"standards.csv\"\n");
        var result = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1 });
        var p = Assert.Single(result.Rejected);
        Assert.Contains("kPa", p.Message + p.Expected);
        Assert.Contains("mS/cm", p.Message + p.Expected);
    }
}
