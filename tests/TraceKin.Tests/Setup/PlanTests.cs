using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Tests.Setup;

public class PlanTests
{
    private const string Comma = """
        run,file,temperature (°C),[A]0 (mmol/L),[B]0 (mol/L),note
        R1,a.csv,25.0,0.50,0.10,first
        R2,b.csv,30,1.5,0.10,"has, comma"
        """;

    [Fact]
    public void Plan_converts_concentrations_to_mol_per_litre_and_celsius_to_kelvin()
    {
        var plan = Plan.FromText(Comma, "plan.csv");
        Assert.Equal(["A", "B"], plan.Species);
        Assert.Equal(5e-4, plan.Rows[0].InitialConcentrations["A"], 15);
        Assert.Equal(0.1, plan.Rows[0].InitialConcentrations["B"], 15);
        // Celsius zero is 273.15 K exactly (SI Brochure, 9th ed.).
        Assert.Equal(298.15, plan.Rows[0].TemperatureK!.Value, 12);
        Assert.Equal("has, comma", plan.Rows[1].Extra["note"]);
        Assert.Equal(3, plan.Rows[1].Line);
    }

    [Theory]
    [InlineData("de-DE")]
    [InlineData("fr-FR")]
    [InlineData("")]
    public void Semicolon_plan_with_decimal_commas_reads_the_same_under_every_culture(string culture)
    {
        var saved = CultureInfo.CurrentCulture;
        CultureInfo.CurrentCulture = CultureInfo.GetCultureInfo(culture);
        try
        {
            var plan = Plan.FromText("run;file;temperature (K);[A]0 (µmol/L)\nR1;a.csv;298,15;12,5\n", "plan.csv");
            Assert.Equal(12.5e-6, plan.Rows[0].InitialConcentrations["A"], 1e-20);
            Assert.Equal(298.15, plan.Rows[0].TemperatureK!.Value, 12);
        }
        finally { CultureInfo.CurrentCulture = saved; }
    }

    [Fact]
    public void Non_numeric_concentration_is_located_by_line_and_column()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,[A]0 (mM)\nR1,a.csv,0.5\nR2,b.csv,lots\n", "plan.csv"));
        Assert.Equal(3, ex.Problem.Line);
        Assert.Equal(10, ex.Problem.Column); // 1-based character position where the cell starts
        Assert.Contains("lots", ex.Problem.Found);
    }

    [Fact]
    public void Repeated_run_id_names_both_lines()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file\nR1,a.csv\nR1,b.csv\n", "plan.csv"));
        Assert.Equal(3, ex.Problem.Line);
        Assert.Contains("line 2", ex.Problem.Found);
    }

    [Fact]
    public void Unknown_concentration_unit_is_an_error_naming_it()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,[A]0 (ppm)\nR1,a.csv,1\n", "plan.csv"));
        Assert.Contains("ppm", ex.Problem.Found);
        Assert.Equal((1, 10), (ex.Problem.Line, ex.Problem.Column)); // character position of the cell
    }
}
