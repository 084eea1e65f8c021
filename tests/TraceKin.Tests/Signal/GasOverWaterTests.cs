using TraceKin.Traces;
using TraceKin.Signal;

namespace TraceKin.Tests.Signal;

public class GasOverWaterTests
{
    [Fact]
    public void One_molar_volume_of_dry_gas_at_STP_is_one_mole()
    {
        // CODATA 2018: molar volume of an ideal gas at 273.15 K and 101.325 kPa = 22.413 969 545 014 L/mol (TestData/constants).
        var gas = new GasOverWater(101325, 273.15, 1, 1, 1, 0, DryGas: true);
        Assert.Equal(1.0, gas.MolesOfGas(22.413969545014), 1e-13);
    }

    [Fact]
    public void Gas_collected_over_water_is_corrected_by_the_vapour_pressure()
    {
        // Worked by hand (Dalton's law and pV = nRT, from memory), invented numbers: 42.0 mL collected over water at
        // 20.0 °C under 100.80 kPa. p_H2O(293.15 K) = 2339.214767 Pa (IF97 Eq. 30, TestData/iapws table, section 3).
        // n = (100800 − 2339.214767) Pa × 42.0e-6 m³ / (8.31446261815324 J/(mol K) × 293.15 K) = 1.69663531234e-3 mol.
        var gas = new GasOverWater(100800, 293.15, 0.050, 1, 1, 0);
        Assert.Equal(2339.214767, gas.WaterVapourPressure, 1e-6);
        Assert.Equal(1.69663531234e-3, gas.MolesOfGas(0.042), 1e-9 * 1.7e-3);
        // A product formed one mole per mole of gas in 50.0 mL of solution: [P] = n / 0.050 L.
        Assert.Equal(1.69663531234e-3 / 0.050, gas.ToConcentration(0.042), 1e-9 * 0.034);
    }

    [Fact]
    public void Reactant_concentration_falls_by_the_gas_formed_per_mole_consumed()
    {
        // 2 H2O2 → 2 H2O + O2 (ν_gas = 1, ν_X = −2): 1 mmol of O2 consumes 2 mmol of peroxide. Dry gas, exact numbers.
        var t = 298.15;
        var p = 100000.0;
        var volumeForOneMillimole = 1e-3 * PhysicalConstants.GasConstant * t / p * 1000; // L
        var gas = new GasOverWater(p, t, 0.100, 1, -2, 0.5, DryGas: true);
        Assert.Equal(0.5 - 2e-3 / 0.100, gas.ToConcentration(volumeForOneMillimole), 1e-14);
    }

    [Fact]
    public void Syringe_zero_offset_is_subtracted()
    {
        var gas = new GasOverWater(101325, 298.15, 0.05, 1, 1, 0, ZeroOffset: 0.0004);
        Assert.Equal(0.0, gas.ToConcentration(0.0004), 1e-15);
    }

    [Theory]
    [InlineData(false, 0.0)]
    [InlineData(true, 0.0)]
    [InlineData(false, 0.0012)]
    public void Concentration_to_volume_and_back_round_trips(bool dry, double offset)
    {
        // Round trip (invented values): concentration → volume → concentration to 1e-12 relative.
        var gas = new GasOverWater(99870, 296.4, 0.075, 1, -1, 0.2, dry, offset);
        foreach (var c in new[] { 0.2, 0.15, 0.0731, 0.01 })
            Assert.Equal(c, gas.ToConcentration(gas.ToVolume(c)), 1e-12 * c);
    }

    [Fact]
    public void Relative_scale_uncertainty_adds_pressure_and_volume_in_quadrature()
    {
        // Dry gas: scale ∝ p/(T·V), so u_rel² = (u_p/p)² + (u_T/T)² + (u_V/V)² (GUM, JCGM 100:2008 eq. 10, relative form for a product of powers).
        var gas = new GasOverWater(100000, 300, 0.05, 1, 1, 0, DryGas: true) { BarometricPressureU = 100, TemperatureU = 0.3, SolutionVolumeU = 0.0001 };
        var (rel, parts) = UncertaintyBudget.Relative(gas.Scale, gas.UncertainInputs());
        var expected = Math.Sqrt(1e-3 * 1e-3 + 1e-3 * 1e-3 + 2e-3 * 2e-3);
        Assert.Equal(expected, rel, 1e-9);
        Assert.Equal(3, parts.Count);
    }
}
