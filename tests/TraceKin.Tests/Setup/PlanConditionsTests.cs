using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Tests.Setup;

/// <summary>plan.csv columns that give a run its own conversion parameters, and [X]0 columns in pressure units.</summary>
public class PlanConditionsTests
{
    // CODATA 2018 molar gas constant R = N_A·k = 8.314462618 J/(mol·K) (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021);
    // TestData/constants/constants.md), written out here to ten digits so the check does not reuse the code's constant.
    private const double R = 8.314462618;

    [Fact]
    public void Parameter_columns_are_read_in_the_unit_of_their_header_into_internal_units()
    {
        var plan = Plan.FromText("""
            run,file,temperature (°C),[A]0 (mmol/L),barometric_pressure (kPa),solution_volume (mL),zero_offset (mL),gas_temperature (°C),path_length (mm),blank
            R1,a.csv,25,5,101.2,50,0.4,22.5,5,0.031
            R2,b.csv,25,5,99.85,,,,,
            """, "plan.csv");
        var c = plan.Rows[0].Conditions;
        // 1 kPa = 1000 Pa, 1 mL = 1e-3 L, 1 mm = 0.1 cm, 0 °C = 273.15 K (SI Brochure, 9th ed., BIPM 2019).
        Assert.Equal(101200, c["barometric_pressure"].Value, 9);
        Assert.Equal(0.05, c["solution_volume"].Value, 15);
        Assert.Equal(4e-4, c["zero_offset"].Value, 15);
        Assert.Equal(295.65, c["gas_temperature"].Value, 12);
        Assert.Equal(0.5, c["path_length"].Value, 15);
        Assert.Equal(0.031, c["blank"].Value, 15);
        Assert.Equal((2, 15), (c["barometric_pressure"].Line, c["barometric_pressure"].Column));
        Assert.Equal(99850, plan.Rows[1].Conditions["barometric_pressure"].Value, 9);
        Assert.False(plan.Rows[1].Conditions.ContainsKey("blank"));
        Assert.False(plan.Rows[0].Extra.ContainsKey("barometric_pressure (kPa)"));
        Assert.Equal(41, plan.ConditionColumns["barometric_pressure"].Column);
    }

    [Theory]
    [InlineData("de-DE")]
    [InlineData("fr-FR")]
    [InlineData("")]
    public void Parameter_and_partial_pressure_cells_with_decimal_commas_read_the_same_under_every_culture(string culture)
    {
        var saved = System.Globalization.CultureInfo.CurrentCulture;
        System.Globalization.CultureInfo.CurrentCulture = System.Globalization.CultureInfo.GetCultureInfo(culture);
        try
        {
            var plan = Plan.FromText("run;file;temperature (°C);[A]0 (kPa);barometric_pressure (hPa)\nR1;a.csv;25,0;12,5;1012,4\n", "plan.csv");
            // 1 hPa = 100 Pa (SI prefixes); [A]0 = 12500 Pa/(R·298.15 K)/1000.
            Assert.Equal(101240, plan.Rows[0].Conditions["barometric_pressure"].Value, 6);
            Assert.Equal(12500 / (R * 298.15) / 1000, plan.Rows[0].InitialConcentrations["A"], 1e-12);
        }
        finally { System.Globalization.CultureInfo.CurrentCulture = saved; }
    }

    [Fact]
    public void A_parameter_column_without_a_unit_is_located_at_its_header()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,barometric_pressure\nR1,a.csv,101.2\n", "plan.csv"));
        Assert.Equal((1, 10), (ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("pressure unit", ex.Problem.Expected);
    }

    [Fact]
    public void A_parameter_column_in_a_unit_of_another_quantity_is_located_at_its_header()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,solution_volume (kPa)\nR1,a.csv,50\n", "plan.csv"));
        Assert.Equal((1, 10), (ex.Problem.Line, ex.Problem.Column));
    }

    [Fact]
    public void A_negative_solution_volume_is_located_at_its_cell()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,solution_volume (mL)\nR1,a.csv,-50\n", "plan.csv"));
        Assert.Equal((2, 10), (ex.Problem.Line, ex.Problem.Column));
    }

    [Theory]
    // p in the column's unit, T in °C, expected [A]0 = p/(R·T) in mol/L computed by hand:
    // 12.5 kPa at 25 °C: 12500 / (8.314462618 · 298.15) / 1000 = 5.042470...e-3 mol/L
    [InlineData("kPa", 12.5, 25.0, 12500.0, 298.15)]
    // 0.2 bar at 80 °C: 1 bar = 1e5 Pa exactly (SI Brochure, 9th ed., Table 8)
    [InlineData("bar", 0.2, 80.0, 20000.0, 353.15)]
    // 95 Torr at 0 °C: 1 Torr = 101325/760 Pa (definition, NIST SP 811, B.8)
    [InlineData("Torr", 95.0, 0.0, 95 * 101325.0 / 760, 273.15)]
    public void A_partial_pressure_column_gives_the_concentration_p_over_RT_at_the_run_temperature(string unit, double p, double celsius, double pascal, double kelvin)
    {
        var plan = Plan.FromText($"run,file,temperature (°C),[A]0 ({unit})\nR1,a.csv,{celsius.ToString(System.Globalization.CultureInfo.InvariantCulture)},{p.ToString(System.Globalization.CultureInfo.InvariantCulture)}\n", "plan.csv");
        var expected = pascal / (R * kelvin) / 1000;
        Assert.Equal(expected, plan.Rows[0].InitialConcentrations["A"], expected * 1e-9);
        Assert.Equal(pascal, plan.Rows[0].InitialPressures["A"], pascal * 1e-12);
    }

    [Fact]
    public void A_partial_pressure_is_converted_at_the_gas_temperature_when_the_row_gives_one()
    {
        var plan = Plan.FromText("run,file,temperature (°C),gas_temperature (K),[A]0 (kPa)\nR1,a.csv,25,310,10\n", "plan.csv");
        Assert.Equal(10000 / (R * 310) / 1000, plan.Rows[0].InitialConcentrations["A"], 1e-12);
    }

    [Fact]
    public void A_partial_pressure_on_a_row_without_a_temperature_is_located_at_its_cell()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,temperature (°C),[A]0 (kPa)\nR1,a.csv,,10\n", "plan.csv"));
        Assert.Equal((2, 11), (ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("temperature", ex.Problem.Expected);
    }

    [Fact]
    public void An_initial_column_in_neither_a_concentration_nor_a_pressure_unit_names_both_kinds_of_unit()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,[A]0 (mL)\nR1,a.csv,10\n", "plan.csv"));
        Assert.Equal((1, 10), (ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("concentration unit", ex.Problem.Expected);
        Assert.Contains("kPa", ex.Problem.Expected);
    }
}
