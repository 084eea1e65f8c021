using TraceKin.Ingest;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Tests.Signal;

public class ConversionTests
{
    private static RunExport Export(string text) => ExportReader.FromText(text, "r1.csv", IngestSettings.Default);

    private static RunExport ExportOf(params Trace[] channels) =>
        new("r1.csv", channels, [], new Dictionary<string, string>(), [], []);

    private static readonly double[] Times = [0, 10, 20, 30, 40, 50];

    [Fact]
    public void Reference_channel_is_subtracted_before_Beer_Lambert()
    {
        // (A520 − A700 − blank)/(ε·l): (0.61 − 0.11 − 0)/(1000 × 1) = 5e-4 mol/L at the first point.
        var s = SignalSettingsTests.Read("channel = \"A520\"\nreference_channel = \"A700\"\nmolar_absorptivity = 1000");
        var export = Export("time (s),A520,A700\n0,0.61,0.11\n10,0.51,0.11\n20,0.43,0.12\n");
        var run = Conversion.ToConcentration(export, SignalSettingsTests.Row(298.15), s);
        Assert.Equal(5e-4, run.Concentration.Values[0], 1e-15);
        Assert.Equal(3.1e-4, run.Concentration.Values[2], 1e-15);
        Assert.Contains(run.ConstantsUsed, kv => kv.Key == "reference channel" && kv.Value == "A700");
    }

    [Fact]
    public void Readings_above_the_linear_range_are_warned_about()
    {
        // Absorbance above ~1.5 (common practice, no source): two of three readings here.
        var s = SignalSettingsTests.Read("molar_absorptivity = 1000");
        var run = Conversion.ToConcentration(Export("time (s),A\n0,1.9\n10,1.6\n20,1.2\n"), SignalSettingsTests.Row(298.15), s);
        var w = Assert.Single(run.Warnings, x => x.Code == "absorbance-above-linear-range");
        Assert.Contains("2 of 3", w.Message);
    }

    [Fact]
    public void Two_wavelengths_that_agree_raise_no_warning_and_two_that_disagree_do()
    {
        // Invented: [A] = 1e-3 → 0.5e-3 read at 450 nm (ε 800) and 380 nm (ε 300).
        var conc = new[] { 1e-3, 0.9e-3, 0.8e-3, 0.7e-3, 0.6e-3, 0.5e-3 };
        var a450 = new Trace("A450", Quantity.Absorbance, "AU", Times, conc.Select(c => 800 * c).ToArray());
        var a380 = new Trace("A380", Quantity.Absorbance, "AU", Times, conc.Select(c => 300 * c).ToArray());
        var good = SignalSettingsTests.Read("channel = \"A450\"\nmolar_absorptivity = 800\ncheck_channel = \"A380\"\ncheck_molar_absorptivity = 300");
        var row = SignalSettingsTests.Row(298.15);
        Assert.DoesNotContain(Conversion.ToConcentration(ExportOf(a450, a380), row, good).Warnings, w => w.Code == "wavelengths-disagree");
        // A product that absorbs only at 380 nm makes the second wavelength read high as the reaction goes on.
        var drifting = a380 with { Values = conc.Select((c, i) => 300 * c + 0.02 * i).ToArray() };
        var bad = Conversion.ToConcentration(ExportOf(a450, drifting), row, good);
        Assert.Contains(bad.Warnings, w => w.Code == "wavelengths-disagree");
    }

    [Fact]
    public void Uncertain_constants_give_the_relative_systematic_uncertainty_and_its_budget()
    {
        // 2 % on ε and 1 % on l → √(0.02² + 0.01²) (JCGM 100:2008 eq. 10, relative form).
        var s = SignalSettingsTests.Read("molar_absorptivity = 500\nmolar_absorptivity_u = 10\npath_length = 1\npath_length_u = 0.01");
        var run = Conversion.ToConcentration(Export("time (s),A\n0,0.5\n10,0.4\n20,0.3\n"), SignalSettingsTests.Row(298.15), s);
        Assert.Equal(Math.Sqrt(0.02 * 0.02 + 0.01 * 0.01), run.RelativeSystematicUncertainty, 1e-9);
        Assert.Equal(["signal.molar_absorptivity", "signal.path_length"], run.UncertaintyBudget.Select(kv => kv.Key).ToArray());
    }

    [Fact]
    public void Calibrated_signal_gives_per_point_errors_and_warns_outside_the_standards()
    {
        var s = SignalSettingsTests.Read("""
            kind = "calibrated"
            [signal.calibration]
            concentration_unit = "mmol/L"
            signal = [0.003, 0.205, 0.398, 0.607, 0.801]
            concentration = [0, 1, 2, 3, 4]
            """);
        var run = Conversion.ToConcentration(Export("time (s),signal (AU)\n0,0.95\n10,0.5\n20,0.1\n"), SignalSettingsTests.Row(298.15), s);
        // 0.5 and 0.1 → 92/37 and 0.48448… mmol/L with the errors worked by hand in CalibrationCurveTests (mmol/L → mol/L).
        Assert.Equal(92.0 / 37 * 1e-3, run.Concentration.Values[1], 1e-15);
        Assert.Equal(0.022238125543377264e-3, run.StdErrors![1], 1e-15);
        Assert.Equal(0.024037306281370678e-3, run.StdErrors[2], 1e-15);
        var w = Assert.Single(run.Warnings, x => x.Code == "outside-standards");
        Assert.Contains("1 of 3", w.Message);
    }

    [Fact]
    public void Gas_volume_export_in_millilitres_becomes_a_product_concentration()
    {
        // Dry gas at 300 K and 100 kPa, 40 mL solution: 10 mL of gas is 1e5 × 1e-5/(R × 300) mol (pV = nRT, from memory).
        var s = SignalSettingsTests.Read("kind = \"gas_volume\"\nspecies = \"O2\"\ncoefficient = 1\ndry_gas = true\nbarometric_pressure = 100\npressure_unit = \"kPa\"\nsolution_volume = 40\ntemperature = 300");
        var run = Conversion.ToConcentration(Export("time (s),volume (mL)\n0,0\n10,5\n20,10\n"), SignalSettingsTests.Row(null), s);
        Assert.Equal(1.0 / (PhysicalConstants.GasConstant * 300) / 0.040, run.Concentration.Values[2], 1e-15);
        Assert.DoesNotContain(run.Warnings, w => w.Code == "signal-unit-assumed");
    }

    [Fact]
    public void Conductivity_is_compensated_point_by_point_from_a_temperature_column()
    {
        // κ0 = 0.25, κ∞ = 0.10 S/m at 25 °C, α = 0.02/K. A reading of 0.209 S/m at 30 °C is 0.19 at 25 °C → f = 0.4.
        var s = SignalSettingsTests.Read("kind = \"conductivity\"\nchannel = \"kappa (S/m)\"\nspecies = \"E\"\nkappa_initial = 0.25\nkappa_final = 0.10\ntemperature_coefficient = 0.02");
        var export = Export("time (s),kappa (S/m),T (°C)\n0,0.25,25\n10,0.209,30\n20,0.19,25\n");
        var run = Conversion.ToConcentration(export, SignalSettingsTests.Row(298.15, ("E", 0.01)), s);
        Assert.Equal(0.01, run.Concentration.Values[0], 1e-15);
        Assert.Equal(0.006, run.Concentration.Values[1], 1e-15);
        Assert.Equal(0.006, run.Concentration.Values[2], 1e-15);
    }

    public static TheoryData<string> Kinds() => new()
    {
        "molar_absorptivity = 1480\nblank = 0.045\nspecies = \"A\"",
        "molar_absorptivity = 1200\nspecies = \"A\"\n[[signal.absorber]]\nspecies = \"P\"\ncoefficient = 1\nmolar_absorptivity = 300",
        "kind = \"calibrated\"\n[signal.calibration]\nmodel = \"quadratic\"\nconcentration_unit = \"mmol/L\"\nsignal = [0.010, 0.262, 0.498, 0.716, 0.921, 1.101]\nconcentration = [0, 1, 2, 3, 4, 5]",
        "kind = \"calibrated\"\n[signal.calibration]\nsignal = [0.0105, 0.2095, 0.4103, 0.0597, 0.1102, 0.2596, 0.5102]\nconcentration = [0, 0.001, 0.002, 0, 0, 0.001, 0.002]\n[[signal.calibration.other]]\nspecies = \"P\"\ncoefficient = 1\nconcentration = [0, 0, 0, 0.001, 0.002, 0.001, 0.002]",
        "kind = \"absorbance\"\n[signal.calibration]\nsignal = [0.02, 0.51, 1.02, 1.49]\nconcentration = [0, 0.001, 0.002, 0.003]",
        "kind = \"gas_volume\"\nbarometric_pressure = 99.8\npressure_unit = \"kPa\"\nsolution_volume = 50\nzero_offset = 0.3\ntemperature = 22\ntemperature_unit = \"°C\"",
        "kind = \"pressure\"\ngas_mole_change = 1\ninitial_pressure = 30000",
        "kind = \"conductivity\"\nkappa_initial = 0.25\nkappa_final = 0.1\ntemperature_coefficient = 0.021",
        "kind = \"conductivity\"\ntemperature_coefficient = 0.02\n[signal.calibration]\nsignal = [0.05, 0.101, 0.149, 0.202, 0.251]\nconcentration = [0, 0.001, 0.002, 0.003, 0.004]",
    };

    [Theory]
    [MemberData(nameof(Kinds))]
    public void Every_kind_round_trips_concentration_to_signal_and_back(string table)
    {
        // Forward (simulation) then backward (analysis) through the front door, to 1e-12 relative; invented values.
        var s = SignalSettingsTests.Read("coefficient = -1\n" + table);
        var row = SignalSettingsTests.Row(306.4, ("A", 0.002), ("P", 0.0003));
        var conc = new Trace("[A]", Quantity.Concentration, Units.MolPerLitre, Times, [0.002, 0.0017, 0.00131, 0.0009, 0.00052, 0.0002]);
        var signal = Conversion.ToSignal(conc, row, s);
        var back = Conversion.ToConcentration(ExportOf(signal with { Quantity = signal.Quantity == Quantity.Other ? Quantity.Absorbance : signal.Quantity }), row, s);
        for (var i = 0; i < Times.Length; i++)
            Assert.Equal(conc.Values[i], back.Concentration.Values[i], 1e-12 * conc.Values[i]);
    }
}
