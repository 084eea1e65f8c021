using TraceKin.Series;
using TraceKin.Traces;

namespace TraceKin.Tests.Series;

/// <summary>Arrhenius and Eyring: CODATA constants, a textbook worked example, synthetic series with known truths.</summary>
public class TemperatureTests
{
    [Fact]
    public void Constants_are_the_CODATA_2018_values()
    {
        // CODATA 2018 (Tiesinga et al. 2021); SI Brochure 9th ed.: R = N_A·k exact, k/h exact quotient.
        Assert.Equal(8.31446261815324, PhysicalConstants.GasConstant);
        Assert.Equal(8.31446261815324, PhysicalConstants.Avogadro * PhysicalConstants.Boltzmann, 8.31446261815324 * 1e-15);
        Assert.Equal(2.083661912332757e10, PhysicalConstants.BoltzmannOverPlanck);
        Assert.Equal(2.083661912332757e10, PhysicalConstants.Boltzmann / PhysicalConstants.Planck, 2.083661912332757e10 * 1e-15);
        Assert.Equal(23.759977810504, PhysicalConstants.LnBoltzmannOverPlanck, 1e-12);
    }

    [Fact]
    public void Eyring_prefactor_at_25_C_is_kT_over_h()
    {
        // constants.md (CODATA 2018 exact constants): k_B·T/h at 298.15 K = 6.212 437 991 620 × 10¹² 1/s.
        Assert.Equal(6.212437991620e12, Eyring.RateConstant(0, 0, 298.15), 6.212437991620e12 * 1e-13);
        // And RT at 298.15 K = 2478.957 029 602 39 J/mol: ΔH‡ = RT, ΔS‡ = 0 gives (kT/h)·e⁻¹.
        Assert.Equal(6.212437991620e12 / Math.E, Eyring.RateConstant(2478.95702960239, 0, 298.15), 6.2e12 * 1e-13);
    }

    [Fact]
    public void Arrhenius_worked_example_of_ethanal_decomposition_gives_Ea_188_kJ_per_mol()
    {
        // Atkins & de Paula, Physical Chemistry (8th ed.), worked example "determining the Arrhenius parameters"
        // (second-order decomposition of ethanal, 700–1000 K), from memory: slope −2.265×10⁴ K, Ea = 188 kJ/mol,
        // A = 1.1×10¹² dm³/(mol·s).
        double[] t = [700, 730, 760, 790, 810, 840, 910, 1000];
        double[] k = [0.011, 0.035, 0.105, 0.343, 0.789, 2.17, 20.0, 145];
        var warnings = new List<Warning>();
        // Equal relative errors on k (weights 1/k²) weight the temperatures as the ln k line does.
        var f = Arrhenius.Fit(t, k, k.Select(v => 1 / (v * v)).ToArray(), null, "L/(mol·s)", warnings)!;
        Assert.Equal(188.0, f.LinearCheck!.Value, 0.5);
        Assert.Equal(188.0, f.ActivationEnergy.Value, 3.0);
        Assert.Equal(1.1e12, f.PreExponential.Value, 0.5e12);
        Assert.Equal("kJ/mol", f.ActivationEnergy.Unit);
        // k_ref at the centre of 1/T is nearly uncorrelated with Ea, unlike ln A.
        Assert.True(Math.Abs(f.Correlation) < 0.3, $"corr(k_ref, Ea) = {f.Correlation}");
        Assert.True(Math.Abs(f.CorrelationLnAEa) > 0.99, $"corr(ln A, Ea) = {f.CorrelationLnAEa}");
        Assert.InRange(f.ReferenceTemperatureK, 700, 1000);
    }

    [Fact]
    public void Eyring_fit_recovers_exact_activation_parameters()
    {
        // Round trip (invented truth): ΔH‡ = 80 kJ/mol, ΔS‡ = −40 J/(mol·K), k exact from the Eyring law.
        double[] t = [288.15, 298.15, 308.15, 318.15, 328.15];
        var k = t.Select(x => Eyring.RateConstant(80e3, -40, x) * (1 + 1e-3 * Math.Sin(x))).ToArray();
        var f = Eyring.Fit(t, k, null, 298.15, [])!;
        Assert.Equal(80.0, f.EnthalpyOfActivation.Value, 0.1);
        Assert.Equal(-40.0, f.EntropyOfActivation.Value, 0.3);
        Assert.Equal(80.0 + 298.15 * 40 / 1000, f.GibbsEnergyOfActivation.Value, 0.05);
        // ΔG‡ at a temperature inside the range is far better determined than ΔH‡ or ΔS‡ alone.
        Assert.True(f.GibbsEnergyOfActivation.StdError < f.EnthalpyOfActivation.StdError);
    }

    [Fact]
    public void Temperature_series_recovers_Ea_within_one_kJ_per_mol()
    {
        // Truth (invented): first order in A, k(298.15 K) = 0.02 1/s, Ea = 65 kJ/mol; five temperatures, four [A]0 each,
        // 1.5 % noise on each rate, seed 17.
        const double ea = 65e3;
        var rng = new Random(17);
        var runs = new List<RunPoint>();
        foreach (var t in new[] { 288.15, 295.65, 303.15, 310.65, 318.15 })
        {
            var k = Arrhenius.RateConstant(0.02, ea, 298.15, t);
            foreach (var a in new[] { 0.002, 0.004, 0.006, 0.008 })
            {
                var v = k * a * (1 + TraceKin.Simulation.RateLawSimulator.Gaussian(rng, 0.015));
                runs.Add(SeriesData.Point($"R{runs.Count + 1}", v, 0.015, t, ("A", a)));
            }
        }
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        Assert.Equal(1.0, f.Orders.Single().Value, 0.05);
        Assert.Null(f.RateConstant); // several temperatures: no single k
        var temp = f.Temperature!;
        Assert.Equal(5, temp.Groups.Count);
        Assert.Equal(65.0, temp.Arrhenius!.ActivationEnergy.Value, 1.0);
        Assert.InRange(65.0, temp.Arrhenius.ActivationEnergy.Ci95Low, temp.Arrhenius.ActivationEnergy.Ci95High);
        // ΔH‡ = Ea − R·T for a reaction in solution (IUPAC Gold Book, "enthalpy of activation"), T at the centre.
        Assert.Equal(65.0 - PhysicalConstants.GasConstant * temp.Arrhenius.ReferenceTemperatureK / 1000, temp.Eyring!.EnthalpyOfActivation.Value, 1.0);
        var caution = Assert.Single(f.Warnings, w => w.Code == "extrapolation-caution");
        Assert.Contains("licensed", caution.Message);
        Assert.Null(f.Saturation); // Km depends on temperature: the saturation law is fitted at one temperature only
    }

    [Fact]
    public void Two_temperatures_give_k_per_temperature_but_no_Arrhenius_fit()
    {
        var runs = new List<RunPoint>();
        foreach (var t in new[] { 298.15, 308.15 })
            foreach (var a in new[] { 0.002, 0.004, 0.008 })
                runs.Add(SeriesData.Point($"R{runs.Count + 1}", Arrhenius.RateConstant(0.02, 50e3, 298.15, t) * a, 0.01, t, ("A", a)));
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        Assert.Equal(2, f.Temperature!.Groups.Count);
        Assert.Null(f.Temperature.Arrhenius);
        Assert.Contains(f.Warnings, w => w.Code == "too-few-temperatures");
        Assert.DoesNotContain(f.Warnings, w => w.Code == "extrapolation-caution");
    }
}
