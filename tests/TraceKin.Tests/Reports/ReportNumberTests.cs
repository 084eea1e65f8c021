using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

public sealed class ReportNumberTests
{
    [Fact]
    public void Uncertainty_keeps_two_significant_digits_and_the_value_the_same_decimal_place()
    {
        // JCGM 100:2008 (GUM) 7.2.2 example: m_s = 100.02147 g with u_c = 0.35 mg, written (100.02147 ± 0.00035) g (from memory).
        Assert.Equal("100.02147 ± 0.00035", ReportNumber.Measured(100.02147, 0.00035));
        // Rounding the value to the uncertainty's last digit (GUM 7.2.6): 0.97524 ± 0.01498 → 0.975 ± 0.015.
        Assert.Equal("0.975 ± 0.015", ReportNumber.Measured(0.97524, 0.014982));
        Assert.Equal("12.0 ± 3.4", ReportNumber.Measured(12.04, 3.4));
    }

    [Fact]
    public void Small_and_large_values_share_one_power_of_ten_with_their_error_and_interval()
    {
        Assert.Equal("(7.24 ± 0.62) × 10⁻⁶", ReportNumber.Measured(7.244983e-6, 6.23238e-7));
        Assert.Equal("(5.96 to 8.53) × 10⁻⁶", ReportNumber.Interval(7.244983e-6, 6.23238e-7, 5.9625e-6, 8.5275e-6));
        Assert.Equal("(2.50 ± 0.13) × 10⁵", ReportNumber.Measured(2.5e5, 1.3e4));
    }

    [Fact]
    public void Missing_error_and_non_finite_values_are_said_plainly()
    {
        Assert.Equal("0.3480 ± n/a", ReportNumber.Measured(0.348, double.NaN));
        Assert.Equal("not available", ReportNumber.Measured(double.NaN, 0.1));
        Assert.Equal("—", ReportNumber.Plain(null));
        Assert.Equal("−0.50 ± 0.12", ReportNumber.Measured(-0.5, 0.12));
    }

    // The rounding rule of JCGM 100:2008 7.2.6 (two significant digits of the standard error, the value to the same
    // decimal place), applied by hand to each pair; the first row is the GUM's own 7.2.2 example (from memory).
    [Theory]
    [InlineData(100.02147, 0.00035, "100.02147 ± 0.00035")]
    [InlineData(0.97524, 0.014982, "0.975 ± 0.015")]
    [InlineData(55.0, 0.017, "55.000 ± 0.017")]
    [InlineData(2.8e-5, 3.3e-8, "(2.8000 ± 0.0033) × 10⁻⁵")]
    [InlineData(7.244983e-6, 6.23238e-7, "(7.24 ± 0.62) × 10⁻⁶")]
    [InlineData(1.5e-15, 2.5e-17, "(1.500 ± 0.025) × 10⁻¹⁵")]
    [InlineData(0.0004, 0.00002, "(4.00 ± 0.20) × 10⁻⁴")]
    [InlineData(6.02214076e23, 1.2e21, "(6.022 ± 0.012) × 10²³")]
    [InlineData(1e300, 1e298, "(1.000 ± 0.010) × 10³⁰⁰")]
    [InlineData(123456.0, 2345.0, "(1.235 ± 0.023) × 10⁵")]
    [InlineData(12345.0, 678.0, "12350 ± 680")]
    [InlineData(0.0, 2e-9, "(0.0 ± 2.0) × 10⁻⁹")]
    [InlineData(-0.5, 0.12, "−0.50 ± 0.12")]
    [InlineData(2.4, 0.0, "2.400 ± 0")]
    [InlineData(2.4, double.NaN, "2.400 ± n/a")]
    [InlineData(2.4, double.PositiveInfinity, "2.400 ± n/a")]
    [InlineData(3.0, 1e-20, "3.00000000000000 ± 1.0 × 10⁻²⁰")]
    [InlineData(0.0012, 1e-17, "0.001200000000000 ± 1.0 × 10⁻¹⁷")]
    [InlineData(double.NaN, 0.1, "not available")]
    public void Printed_value_and_error(double value, double stdError, string printed) =>
        Assert.Equal(printed, ReportNumber.Measured(value, stdError));

    [Fact]
    public void Every_pair_of_magnitudes_prints_without_failing_and_without_exponent_letters()
    {
        double[] sizes = [0, 1e-300, 3.7e-200, 2.2e-17, 1.1e-9, 4.4e-4, 0.0012, 0.5, 7, 12345, 99999.9, 3.3e5, 8.8e19, 1.7e300];
        double[] odd = [double.NaN, double.PositiveInfinity, -1];
        foreach (var v in sizes.Concat(sizes.Select(x => -x)))
            foreach (var se in sizes.Concat(odd))
            {
                var text = ReportNumber.Measured(v, se) + " " + ReportNumber.Interval(v, se, v - 2 * Math.Abs(se), v + 2 * Math.Abs(se));
                Assert.DoesNotContain("E", text, StringComparison.Ordinal);
                Assert.DoesNotContain("∞", text, StringComparison.Ordinal);
            }
    }

    [Theory]
    [InlineData(7.244983e-6, 6.23238e-7, 5.9625e-6, 8.5275e-6, "(5.96 to 8.53) × 10⁻⁶")]
    [InlineData(2.4, 0.0051, 2.389, 2.411, "2.3890 to 2.4110")]
    [InlineData(2.4, 0.0051, double.NaN, 2.411, "not available")]
    public void Printed_interval(double value, double stdError, double low, double high, string printed) =>
        Assert.Equal(printed, ReportNumber.Interval(value, stdError, low, high));

    [Fact]
    public void An_estimate_in_a_line_of_text_has_its_unit_and_interval_at_the_same_decimal_place()
    {
        Assert.Equal("2.4000 ± 0.0051 L/(mol·s) (95 % CI 2.3890 to 2.4110)", ReportNumber.Estimate(2.4, 0.0051, "L/(mol·s)", 2.389, 2.411));
        Assert.Equal("(2.8000 ± 0.0033) × 10⁻⁵ 1/s", ReportNumber.Estimate(2.8e-5, 3.3e-8, "1/s", double.NaN, double.NaN));
    }

    [Fact]
    public void Output_does_not_depend_on_the_current_culture()
    {
        var saved = Thread.CurrentThread.CurrentCulture;
        try
        {
            Thread.CurrentThread.CurrentCulture = System.Globalization.CultureInfo.GetCultureInfo("de-DE");
            Assert.Equal("0.975 ± 0.015", ReportNumber.Measured(0.97524, 0.014982));
            Thread.CurrentThread.CurrentCulture = System.Globalization.CultureInfo.GetCultureInfo("fr-FR");
            Assert.Equal("25.00", ReportNumber.Plain(25.0));
        }
        finally { Thread.CurrentThread.CurrentCulture = saved; }
    }
}
