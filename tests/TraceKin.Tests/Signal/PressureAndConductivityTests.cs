using TraceKin.Traces;
using TraceKin.Signal;

namespace TraceKin.Tests.Signal;

public class PressureAndConductivityTests
{
    [Fact]
    public void Total_pressure_of_a_decomposition_gives_the_reactant_partial_pressure()
    {
        // Worked by hand (Dalton's law, from memory), invented numbers: A(g) → 2 B(g) + C(g), Δν = +2, pure A at
        // p0 = 40 kPa. When the total reads 52 kPa, p_A = 40 − (52 − 40)/2 = 34 kPa,
        // and [A] = p/(R·T) = 34000/(8.31446261815324 × 500)/1000 mol/L.
        var pc = new PressureConversion(500, 2, -1, 40000, 40000);
        Assert.Equal(34000, pc.PartialPressure(52000), 1e-9);
        Assert.Equal(34000 / (8.31446261815324 * 500) / 1000, pc.ToConcentration(52000), 1e-16);
    }

    [Theory]
    [InlineData(-1, 2, 40000, 40000)]
    [InlineData(-2, -1, 30000, 20000)]
    [InlineData(1, 1, 50000, 0)]
    public void Concentration_to_pressure_and_back_round_trips(double nu, double deltaNu, double p0, double pX0)
    {
        // Round trip (invented values) to 1e-12 relative.
        var pc = new PressureConversion(612.3, deltaNu, nu, p0, pX0);
        foreach (var c in new[] { 0.001, 0.0042, 0.0069 })
            Assert.Equal(c, pc.ToConcentration(pc.ToPressure(c)), 1e-12 * c);
    }

    [Fact]
    public void Pressure_scale_uncertainty_is_the_relative_temperature_uncertainty()
    {
        // c ∝ 1/T (JCGM 100:2008 eq. 10, relative form): u_rel = u_T/T.
        var pc = new PressureConversion(500, 1, -1, 1e5, 1e5) { TemperatureU = 0.5 };
        Assert.Equal(1e-3, UncertaintyBudget.Relative(pc.Scale, pc.UncertainInputs()).Relative, 1e-10);
    }

    [Fact]
    public void Two_point_conductivity_interpolates_the_fraction_converted()
    {
        // Worked by hand, invented numbers: κ0 = 0.25 S/m, κ∞ = 0.10 S/m, [X]0 = 0.01 mol/L; at κ = 0.19 S/m
        // f = (0.19 − 0.25)/(0.10 − 0.25) = 0.4, so [X] = 0.006 mol/L.
        var cc = new ConductivityConversion(0.25, 0.10, 0.01);
        Assert.Equal(0.006, cc.ToConcentration(0.19, 298.15), 1e-15);
    }

    [Fact]
    public void Temperature_compensation_refers_a_reading_to_the_reference_temperature()
    {
        // κ_ref = κ/(1 + α(T − T_ref)); α = 0.02/K, 5 K above 25 °C → factor 1.1 (worked by hand).
        var cc = new ConductivityConversion(0.25, 0.10, 0.01, 0.02, 298.15);
        Assert.Equal(0.19, cc.Compensate(0.209, 303.15), 1e-15);
        Assert.Equal(0.006, cc.ToConcentration(0.209, 303.15), 1e-15);
    }

    [Theory]
    [InlineData(null, 298.15)]
    [InlineData(0.021, 291.4)]
    [InlineData(0.019, 310.0)]
    public void Concentration_to_conductivity_and_back_round_trips(double? alpha, double temperature)
    {
        // Round trip (invented values) to 1e-12 relative.
        var cc = new ConductivityConversion(0.31, 0.12, 0.02, alpha, 298.15);
        foreach (var c in new[] { 0.02, 0.0133, 0.0011 })
            Assert.Equal(c, cc.ToConcentration(cc.ToConductivity(c, temperature), temperature), 1e-12 * c);
    }

    [Fact]
    public void Conductivity_scale_uncertainty_follows_the_two_readings()
    {
        // Scale = −[X]0/(κ∞ − κ0): u_rel = √(u(κ0)² + u(κ∞)²)/|κ∞ − κ0| (JCGM 100:2008 eq. 10). 0.002 and 0.0015 over 0.15.
        var cc = new ConductivityConversion(0.25, 0.10, 0.01) { KappaInitialU = 0.002, KappaFinalU = 0.0015 };
        var (rel, _) = UncertaintyBudget.Relative(cc.Scale(298.15), cc.UncertainInputs(298.15));
        Assert.Equal(Math.Sqrt(0.002 * 0.002 + 0.0015 * 0.0015) / 0.15, rel, 1e-10);
    }
}

public class PressureFromPlanTests
{
    [Fact]
    public void Initial_pressure_comes_from_a_plan_column_before_the_first_sample()
    {
        // Pure A at p0 = 40 kPa (plan column), A(g) → 2 B(g) + C(g), Δν = 2: a reading of 52 kPa leaves p_A = 34 kPa
        // (worked by hand, as in the decomposition test); [A] = 34000/(R·500)/1000.
        var s = SignalSettingsTests.Read("kind = \"pressure\"\nchannel = \"p (kPa)\"\ngas_mole_change = 2\ntemperature = 500");
        var row = new TraceKin.Setup.PlanRow("r1", "r1.csv", null, new Dictionary<string, double>(), new Dictionary<string, string> { ["p0 (kPa)"] = "40" }, 2);
        var export = TraceKin.Ingest.ExportReader.FromText("time (s),p (kPa)\n0,40.3\n10,46\n20,52\n", "r1.csv", TraceKin.Ingest.IngestSettings.Default);
        var run = TraceKin.Signal.Conversion.ToConcentration(export, row, s);
        Assert.Equal(34000 / (PhysicalConstants.GasConstant * 500) / 1000, run.Concentration.Values[2], 1e-15);
        Assert.Contains(run.ConstantsUsed, kv => kv.Key == "p0" && kv.Value.Contains("(plan)"));
    }

    [Fact]
    public void Without_a_plan_column_the_first_sample_is_the_initial_pressure()
    {
        var s = SignalSettingsTests.Read("kind = \"pressure\"\nchannel = \"p (kPa)\"\ngas_mole_change = 2\ntemperature = 500");
        var export = TraceKin.Ingest.ExportReader.FromText("time (s),p (kPa)\n0,40\n10,46\n20,52\n", "r1.csv", TraceKin.Ingest.IngestSettings.Default);
        var run = TraceKin.Signal.Conversion.ToConcentration(export, SignalSettingsTests.Row(null), s);
        Assert.Equal(40000 / (PhysicalConstants.GasConstant * 500) / 1000, run.Concentration.Values[0], 1e-15);
        Assert.Equal(34000 / (PhysicalConstants.GasConstant * 500) / 1000, run.Concentration.Values[2], 1e-15);
    }
}
