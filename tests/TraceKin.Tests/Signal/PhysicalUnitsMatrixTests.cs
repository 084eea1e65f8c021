using System.Globalization;
using TraceKin.Analysis;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Signal;

/// <summary>
/// The conversions that need no standards (absorbance, gas volume, pressure, two-point conductivity) × the units of
/// their series.toml keys and of the export's channel: each concentration checked against a hand computation written
/// here. Unit factors (exact by definition): 1 mm = 0.1 cm, 1 mL = 1e-3 L, 1 kPa = 1e3 Pa, 1 bar = 1e5 Pa,
/// 1 atm = 101325 Pa, 1 mS/cm = 0.1 S/m, 1 µS/cm = 1e-4 S/m, 0 °C = 273.15 K (SI Brochure, 9th ed., BIPM 2019);
/// 1 Torr = 101325/760 Pa, 1 mmHg = 133.322387415 Pa, 1 psi = 6894.757293168 Pa (NIST SP 811, 2008, Appendix B.8).
/// </summary>
public sealed class PhysicalUnitsMatrixTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    // CODATA 2018 R = 8.314462618 J/(mol·K) (TestData/constants/constants.md), typed here to ten digits.
    private const double R = 8.314462618;
    // IAPWS-IF97 Table 35 check value p_s(300 K) = 0.353658941e-2 MPa (TestData/iapws/water-saturation.md).
    private const double WaterAt300K = 3536.58941;

    private static readonly Dictionary<string, double> Pa = new()
    {
        ["Pa"] = 1, ["kPa"] = 1e3, ["bar"] = 1e5, ["atm"] = 101325, ["Torr"] = 101325.0 / 760, ["mmHg"] = 133.322387415, ["psi"] = 6894.757293168,
    };
    private static readonly Dictionary<string, double> SPerM = new() { ["S/m"] = 1, ["mS/cm"] = 0.1, ["µS/cm"] = 1e-4 };
    private static readonly Dictionary<string, double> Litre = new() { ["mL"] = 1e-3, ["L"] = 1, ["µL"] = 1e-6 };

    private static string N(double v) => v.ToString("R", Inv);

    /// <summary>Writes a one-run series, analyses it and returns the run's concentrations (mol/L).</summary>
    private static double[] Convert(string signalToml, string planText, string channelHeader, double[] readings)
    {
        using var dir = new RepoPaths.TempDir();
        File.WriteAllText(Path.Combine(dir.Path, "r1.csv"),
            $"time (s),{channelHeader}\n" + string.Join("\n", readings.Select((r, i) => $"{10 * i},{N(r)}")) + "\n");
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"), planText);
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"), "[signal]\n" + signalToml);
        var result = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1, Retention = TraceRetention.Full });
        Assert.True(result.Rejected.Count == 0, string.Join("; ", result.Rejected.Select(p => p.Message)));
        return result.Runs.Single().Converted.Concentration.Values;
    }

    public static TheoryData<string, double, string> AbsorbanceCases() => new()
    {
        // path_length_unit, path_length in that unit, channel unit
        { "cm", 1, "AU" }, { "mm", 10, "AU" }, { "mm", 5, "AU" }, { "cm", 0.2, "mAU" }, { "mm", 2, "mAU" },
    };

    [Theory]
    [MemberData(nameof(AbsorbanceCases))]
    public void Absorbance_concentrations_match_Beer_Lambert_by_hand(string lengthUnit, double length, string channelUnit)
    {
        var absorbanceAu = new[] { 0.95, 0.80, 0.62, 0.47, 0.36 };
        var channelFactor = channelUnit == "mAU" ? 1e-3 : 1;
        var conc = Convert($"kind = \"absorbance\"\nspecies = \"A\"\nmolar_absorptivity = 1500\npath_length = {N(length)}\npath_length_unit = \"{lengthUnit}\"\nblank = 0.03\n",
            "run,file,temperature (°C),[A]0 (mmol/L)\nR1,r1.csv,25,1\n", $"A ({channelUnit})", absorbanceAu.Select(a => a / channelFactor).ToArray());
        var lCm = lengthUnit == "mm" ? length / 10 : length;
        for (var i = 0; i < absorbanceAu.Length; i++)
            // Beer–Lambert, A − A_blank = ε·l·c (IUPAC Gold Book, "Beer–Lambert law", doi:10.1351/goldbook.B00626).
            Assert.Equal((absorbanceAu[i] - 0.03) / (1500 * lCm), conc[i], 1e-14);
    }

    public static TheoryData<string, string, string, string, bool> GasCases()
    {
        var d = new TheoryData<string, string, string, string, bool>();
        // volume_unit (solution volume, zero offset), pressure_unit, temperature_unit, channel unit, dry gas
        foreach (var vu in new[] { "mL", "L" })
            foreach (var pu in new[] { "Pa", "kPa", "bar", "Torr" })
                foreach (var tu in new[] { "K", "°C" })
                    foreach (var cu in new[] { "mL", "L" })
                        d.Add(vu, pu, tu, cu, false);
        d.Add("mL", "kPa", "K", "µL", false);
        d.Add("mL", "kPa", "°C", "mL", true);
        d.Add("L", "atm", "K", "L", true);
        return d;
    }

    [Theory]
    [MemberData(nameof(GasCases))]
    public void Gas_volume_concentrations_match_the_ideal_gas_law_by_hand(string volumeUnit, string pressureUnit, string temperatureUnit, string channelUnit, bool dry)
    {
        // 100.5 kPa barometric, 300 K gas, 50 mL of solution, a 0.2 mL zero offset, [A]0 = 20 mmol/L, 1 mol gas per mol A.
        const double pb = 100500, t = 300, vSoln = 0.050, zero = 0.2e-3, a0 = 0.020;
        var volumesL = new[] { 0.2e-3, 2.2e-3, 4.6e-3, 6.1e-3, 7.9e-3 };
        var temperature = temperatureUnit == "K" ? "300" : "26.85";
        var conc = Convert(
            $"kind = \"gas_volume\"\nspecies = \"A\"\ncoefficient = -1\ngas_coefficient = 1\ndry_gas = {(dry ? "true" : "false")}\n" +
            $"temperature = {temperature}\ntemperature_unit = \"{temperatureUnit}\"\n" +
            $"barometric_pressure = {N(pb / Pa[pressureUnit])}\npressure_unit = \"{pressureUnit}\"\n" +
            $"solution_volume = {N(vSoln / Litre[volumeUnit])}\nzero_offset = {N(zero / Litre[volumeUnit])}\nvolume_unit = \"{volumeUnit}\"\n",
            "run,file,temperature (°C),[A]0 (mmol/L)\nR1,r1.csv,25,20\n", $"volume ({channelUnit})", volumesL.Select(v => v / Litre[channelUnit]).ToArray());
        var pGas = pb - (dry ? 0 : WaterAt300K);
        for (var i = 0; i < volumesL.Length; i++)
        {
            // Dalton's law and the perfect-gas equation: n = (p_bar − p_H2O)·V/(R·T) with V in m³ (IUPAC Green Book, 3rd ed., from memory).
            var n = pGas * (volumesL[i] - zero) * 1e-3 / (R * t);
            // [A] = [A]0 − n/V_solution (one mole of gas per mole of A).
            Assert.Equal(a0 - n / vSoln, conc[i], 1e-10);
        }
    }

    public static TheoryData<string, string> PressureCases()
    {
        var d = new TheoryData<string, string>();
        // pressure_unit (for initial_pressure), channel unit
        foreach (var cu in new[] { "Pa", "kPa", "bar", "Torr", "mmHg", "psi" })
            d.Add("kPa", cu);
        foreach (var pu in new[] { "Pa", "bar", "atm" })
            d.Add(pu, "kPa");
        return d;
    }

    [Theory]
    [MemberData(nameof(PressureCases))]
    public void Pressure_concentrations_match_Dalton_and_the_ideal_gas_law_by_hand(string pressureUnit, string channelUnit)
    {
        // A(g) → 2 B(g): Δν = +1; pure A at 40 kPa in a 350 K vessel; the plan gives [A]0 as a partial pressure.
        const double p0 = 40000, t = 350;
        var totalPa = new[] { 40000.0, 44000, 49500, 54000, 61000 };
        var conc = Convert(
            $"kind = \"pressure\"\nspecies = \"A\"\ncoefficient = -1\ngas_mole_change = 1\ninitial_pressure = {N(p0 / Pa[pressureUnit])}\npressure_unit = \"{pressureUnit}\"\n",
            "run,file,temperature (K),[A]0 (kPa)\nR1,r1.csv,350,40\n", $"p ({channelUnit})", totalPa.Select(p => p / Pa[channelUnit]).ToArray());
        for (var i = 0; i < totalPa.Length; i++)
        {
            // p_A = p_A0 + ν_A·(p − p0)/Δν, then c = p_A/(R·T) in mol/m³, /1000 for mol/L (Dalton's law, perfect-gas equation).
            var pA = p0 - (totalPa[i] - p0) / 1;
            Assert.Equal(pA / (R * t) / 1000, conc[i], 1e-12);
        }
    }

    [Fact]
    public void A_partial_pressure_in_the_plan_is_the_starting_partial_pressure_even_when_the_vessel_temperature_is_set_apart()
    {
        // signal.temperature = 360 K for the vessel; the plan row says 350 K. p_A0 = 40 kPa is taken as written, and every
        // concentration is p_A/(R·360 K) (Dalton's law, perfect-gas equation); [A]0 = 40 kPa/(R·350 K) only names the run.
        var totalPa = new[] { 40000.0, 45000, 52000, 58000, 63000 };
        var conc = Convert("kind = \"pressure\"\nspecies = \"A\"\ncoefficient = -1\ngas_mole_change = 1\ntemperature = 360\n",
            "run,file,temperature (K),[A]0 (kPa)\nR1,r1.csv,350,40\n", "p (kPa)", totalPa.Select(p => p / 1000).ToArray());
        for (var i = 0; i < totalPa.Length; i++)
            Assert.Equal((40000 - (totalPa[i] - 40000)) / (R * 360) / 1000, conc[i], 1e-12);
    }

    public static TheoryData<string, string> ConductivityCases()
    {
        var d = new TheoryData<string, string>();
        // conductivity_unit (kappa_initial, kappa_final), channel unit
        foreach (var ku in new[] { "S/m", "mS/cm", "µS/cm" })
            foreach (var cu in new[] { "S/m", "mS/cm", "µS/cm" })
                d.Add(ku, cu);
        return d;
    }

    [Theory]
    [MemberData(nameof(ConductivityCases))]
    public void Two_point_conductivity_concentrations_match_the_linear_interpolation_by_hand(string kappaUnit, string channelUnit)
    {
        // κ0 = 1.20 mS/cm, κ∞ = 0.45 mS/cm (0.120 and 0.045 S/m); [X]0 = 10 mmol/L.
        const double k0 = 0.120, kf = 0.045, x0 = 0.010;
        var kappa = new[] { 0.120, 0.101, 0.083, 0.066, 0.052 };
        var conc = Convert(
            $"kind = \"conductivity\"\nspecies = \"X\"\ncoefficient = -1\nkappa_initial = {N(k0 / SPerM[kappaUnit])}\nkappa_final = {N(kf / SPerM[kappaUnit])}\nconductivity_unit = \"{kappaUnit}\"\n",
            "run,file,temperature (°C),[X]0 (mmol/L)\nR1,r1.csv,25,10\n", $"kappa ({channelUnit})", kappa.Select(k => k / SPerM[channelUnit]).ToArray());
        for (var i = 0; i < kappa.Length; i++)
            // κ linear in the extent (Kohlrausch's independent migration, from memory): [X] = [X]0·(κ∞ − κ)/(κ∞ − κ0).
            Assert.Equal(x0 * (kf - kappa[i]) / (kf - k0), conc[i], 1e-14);
    }
}
