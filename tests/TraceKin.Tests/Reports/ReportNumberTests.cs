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
