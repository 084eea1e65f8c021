using TraceKin.Traces;

namespace TraceKin.Tests.Traces;

public class UnitsTests
{
    [Theory]
    // Exact by definition: standard atmosphere 101 325 Pa (CODATA 2018); torr = 101 325/760 Pa;
    // conventional mmHg 133.322 387 415 Pa (BIPM SI Brochure 8th ed., Table 9); psi = 6894.757 293 168 Pa (NIST SP 811, B.8).
    [InlineData("atm", 101325.0)]
    [InlineData("Torr", 101325.0 / 760)]
    [InlineData("mmHg", 133.322387415)]
    [InlineData("psi", 6894.757293168)]
    [InlineData("bar", 1e5)]
    [InlineData("kPa", 1e3)]
    public void Pressure_units_convert_to_pascal_by_their_definitions(string unit, double pascal) =>
        Assert.Equal(pascal, Units.Find(unit)!.ToInternal(1), 12);

    [Theory]
    [InlineData("mmol/L", 1e-3)]
    [InlineData("µM", 1e-6)]
    [InlineData("μmol/L", 1e-6)]
    [InlineData("M", 1.0)]
    public void Concentration_units_convert_to_mol_per_litre(string unit, double factor) =>
        Assert.Equal(factor, Units.Find(unit)!.ToInternal(1), factor * 1e-15);

    [Fact]
    public void Celsius_offset_is_273_15_kelvin() // SI Brochure, 9th ed.
        => Assert.Equal(273.15, Units.Find("°C")!.ToInternal(0), 12);

    [Fact]
    public void Unknown_unit_is_rejected_not_guessed()
    {
        Assert.Null(Units.Find("furlongs"));
        var ex = Assert.Throws<InputException>(() => Units.Require("furlongs", Quantity.Time, "x.csv", 3, 7));
        Assert.Equal((3, 7), (ex.Problem.Line, ex.Problem.Column));
    }
}
