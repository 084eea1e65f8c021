using TraceKin.Traces;
using TraceKin.Signal;

namespace TraceKin.Tests.Signal;

/// <summary>CODATA 2018 / SI 2019 values, copied in TestData/constants/constants.md.</summary>
public class PhysicalConstantsTests
{
    [Fact]
    public void Defining_constants_are_the_exact_SI_values()
    {
        // SI Brochure, 9th ed. (BIPM 2019): exact by definition.
        Assert.Equal(6.62607015e-34, PhysicalConstants.Planck);
        Assert.Equal(1.380649e-23, PhysicalConstants.Boltzmann);
        Assert.Equal(6.02214076e23, PhysicalConstants.Avogadro);
        Assert.Equal(1.602176634e-19, PhysicalConstants.ElementaryCharge);
        Assert.Equal(101325.0, PhysicalConstants.StandardAtmosphere);
    }

    [Fact]
    public void Gas_constant_and_Faraday_constant_are_the_exact_products()
    {
        // CODATA 2018: R = N_A·k = 8.314 462 618 153 24 and F = N_A·e (exact products).
        Assert.Equal(8.31446261815324, PhysicalConstants.GasConstant);
        Assert.Equal(PhysicalConstants.Avogadro * PhysicalConstants.Boltzmann, PhysicalConstants.GasConstant, 1e-15 * 8.3145);
        Assert.Equal(PhysicalConstants.Avogadro * PhysicalConstants.ElementaryCharge, PhysicalConstants.Faraday, 1e-15 * 96485.33);
    }

    [Fact]
    public void Derived_values_match_the_reference_table()
    {
        // constants.md "Handy derived values": RT at 298.15 K = 2478.957 029 602 39 J/mol;
        // CODATA 2018 molar volume at 273.15 K and 101.325 kPa = 22.413 969 545 014 L/mol.
        Assert.Equal(2478.95702960239, PhysicalConstants.GasConstant * 298.15, 1e-15 * 2479 * 4);
        Assert.Equal(22.413969545014, PhysicalConstants.GasConstant * PhysicalConstants.CelsiusZero / PhysicalConstants.StandardAtmosphere * 1000, 1e-14 * 22.4 * 4);
    }
}
