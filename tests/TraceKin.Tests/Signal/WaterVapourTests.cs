using TraceKin.Signal;

namespace TraceKin.Tests.Signal;

/// <summary>
/// IAPWS R7-97(2012) (IAPWS-IF97), Region 4. Check values copied in TestData/iapws/water-saturation.md.
/// </summary>
public class WaterVapourTests
{
    /// <summary>|actual − expected| within half a unit of the last of <paramref name="digits"/> significant digits of expected.</summary>
    internal static void AssertSignificantDigits(double expected, double actual, int digits)
    {
        var exponent = Math.Floor(Math.Log10(Math.Abs(expected)));
        var halfUnit = 0.5 * Math.Pow(10, exponent - digits + 1);
        Assert.True(Math.Abs(actual - expected) <= halfUnit, $"expected {expected:R} to {digits} digits, got {actual:R}");
    }

    [Theory]
    // IAPWS-IF97 Table 35: T / K, p_s / MPa.
    [InlineData(300, 0.353658941e-2)]
    [InlineData(500, 0.263889776e1)]
    [InlineData(600, 0.123443146e2)]
    public void Saturation_pressure_matches_IF97_table_35_to_nine_digits(double temperatureK, double expectedMPa) =>
        AssertSignificantDigits(expectedMPa, WaterVapour.SaturationPressure(temperatureK) / 1e6, 9);

    [Theory]
    // IAPWS-IF97 Table 36: p / MPa, T_s / K.
    [InlineData(0.1, 0.372755919e3)]
    [InlineData(1, 0.453035632e3)]
    [InlineData(10, 0.584149488e3)]
    public void Saturation_temperature_matches_IF97_table_36_to_nine_digits(double pressureMPa, double expectedK) =>
        AssertSignificantDigits(expectedK, WaterVapour.SaturationTemperature(pressureMPa * 1e6), 9);

    [Fact]
    public void Saturation_pressure_at_25_celsius_is_3169_75_pascal()
    {
        // IF97 Eq. 30 at 298.15 K, 3169.746855 Pa (computed to 30 digits in TestData/iapws/water-saturation.md, section 3,
        // regression data for this equation, not an independent measurement).
        Assert.Equal(3169.746855, WaterVapour.SaturationPressure(298.15), 1e-6 * 3169.746855);
    }

    [Theory]
    [InlineData(274)]
    [InlineData(293.15)]
    [InlineData(350)]
    public void Backward_equation_inverts_the_saturation_pressure(double temperatureK)
    {
        // Eqs. 30 and 31 are the two explicit solutions of one implicit quadratic (IAPWS-IF97 Eq. 29), so each inverts
        // the other up to rounding.
        var p = WaterVapour.SaturationPressure(temperatureK);
        Assert.Equal(temperatureK, WaterVapour.SaturationTemperature(p), 1e-9);
    }

    [Fact]
    public void Temperatures_outside_the_equation_are_refused()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => WaterVapour.SaturationPressure(250));
        Assert.Throws<ArgumentOutOfRangeException>(() => WaterVapour.SaturationPressure(700));
    }
}
