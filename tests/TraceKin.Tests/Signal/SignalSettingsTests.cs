using TraceKin.Analysis;
using System.Globalization;
using TraceKin.Setup;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Tests.Signal;

public class SignalSettingsTests
{
    internal static SignalSettings Read(string signalTable) => SeriesConfig.FromText("[signal]\n" + signalTable, "series.toml").Signal;

    internal static PlanRow Row(double? temperatureK, params (string Species, double C)[] initial) =>
        new("r1", "r1.csv", temperatureK, initial.ToDictionary(p => p.Species, p => p.C), new Dictionary<string, string>(), 2);

    private static string KeyOf(Action act) => Assert.Throws<InputException>(act).Problem.Key!;

    [Fact]
    public void Keys_with_units_and_uncertainties_are_read_into_internal_units()
    {
        var s = Read("""
            kind = "gas_volume"
            species = "O2"
            coefficient = 1
            temperature = 21.5
            temperature_unit = "°C"
            temperature_u = 0.2
            barometric_pressure = 100.9
            barometric_pressure_u = 0.05
            pressure_unit = "kPa"
            solution_volume = 25
            solution_volume_u = 0.05
            zero_offset = 0.4
            path_length = 10
            path_length_unit = "mm"
            path_length_u = 0.1
            """);
        Assert.Equal(294.65, s.Temperature!.Value, 1e-12);
        Assert.Equal(0.2, s.TemperatureU, 1e-15);
        Assert.Equal(100900, s.BarometricPressure!.Value, 1e-9);
        Assert.Equal(50, s.BarometricPressureU, 1e-12);
        Assert.Equal(0.025, s.SolutionVolume!.Value, 1e-15);
        Assert.Equal(4e-4, s.ZeroOffset, 1e-15);
        Assert.Equal(1.0, s.PathLength, 1e-15);
        Assert.Equal(0.01, s.PathLengthU, 1e-15);
    }

    [Fact]
    public void Negative_path_length_names_its_key() =>
        Assert.Equal("signal.path_length", KeyOf(() => Read("path_length = -1\nmolar_absorptivity = 100")));

    [Fact]
    public void Zero_molar_absorptivity_names_its_key() =>
        Assert.Equal("signal.molar_absorptivity", KeyOf(() => Read("molar_absorptivity = 0")));

    [Fact]
    public void Negative_uncertainty_names_its_key() =>
        Assert.Equal("signal.molar_absorptivity_u", KeyOf(() => Read("molar_absorptivity = 100\nmolar_absorptivity_u = -2")));

    [Fact]
    public void Calibration_with_fewer_standards_than_parameters_names_its_key()
    {
        var ex = Assert.Throws<InputException>(() => Read("""
            kind = "calibrated"
            [signal.calibration]
            model = "quadratic"
            signal = [0.1, 0.4]
            concentration = [1, 4]
            """));
        Assert.Equal("signal.calibration.signal", ex.Problem.Key);
        Assert.Equal("series.toml", ex.Problem.File);
    }

    [Fact]
    public void Calibration_arrays_of_different_lengths_name_the_concentration_key() =>
        Assert.Equal("signal.calibration.concentration", KeyOf(() => Read("""
            kind = "calibrated"
            [signal.calibration]
            signal = [0.1, 0.4, 0.8, 1.2]
            concentration = [1, 4, 8]
            """)));

    [Fact]
    public void Misspelt_key_in_a_sub_table_is_refused() =>
        Assert.Equal("signal.absorber[0].epsilon", KeyOf(() => Read("""
            molar_absorptivity = 900
            [[signal.absorber]]
            species = "P"
            coefficient = 1
            molar_absorptivity = 200
            epsilon = 3
            """)));

    [Fact]
    public void Barometric_pressure_below_the_water_vapour_pressure_names_its_key()
    {
        // At 25 °C water's vapour pressure is 3169.7 Pa (IAPWS-IF97); a "barometric pressure" of 3000 Pa is impossible.
        var s = Read("kind = \"gas_volume\"\nbarometric_pressure = 3000\nsolution_volume = 50\ncoefficient = 1");
        var ex = Assert.Throws<InputException>(() => SignalModel.For(s, Row(298.15)));
        Assert.Equal("signal.barometric_pressure", ex.Problem.Key);
        Assert.Contains("3169.7", ex.Problem.Expected);
    }

    [Fact]
    public void Gas_over_water_above_boiling_names_the_temperature_key()
    {
        var s = Read("kind = \"gas_volume\"\nbarometric_pressure = 101325\nsolution_volume = 50\ncoefficient = 1\ntemperature = 380");
        Assert.Equal("signal.temperature", KeyOf(() => SignalModel.For(s, Row(298.15))));
    }

    [Fact]
    public void Temperature_below_absolute_zero_names_its_key() =>
        Assert.Equal("signal.temperature", KeyOf(() => Read("temperature = -300\ntemperature_unit = \"°C\"")));

    [Fact]
    public void Gas_volume_without_a_solution_volume_names_the_missing_key() =>
        Assert.Equal("signal.solution_volume", KeyOf(() => SeriesCheck.Check(
            SeriesConfig.FromText("[signal]\nkind = \"gas_volume\"\nbarometric_pressure = 101325", "series.toml"),
            Plan.FromText("run,file,temperature (°C),[A]0 (mmol/L)\nR1,r1.csv,25,5\n", "plan.csv"))));

    [Fact]
    public void Pressure_kind_with_no_change_in_gas_moles_names_its_key() =>
        Assert.Equal("signal.gas_mole_change", KeyOf(() => Read("kind = \"pressure\"\ngas_mole_change = 0")));

    [Fact]
    public void A_pressure_unit_that_is_not_a_pressure_names_its_key() =>
        Assert.Equal("signal.pressure_unit", KeyOf(() => Read("pressure_unit = \"mL\"")));

    [Fact]
    public void Conductivity_with_equal_end_readings_names_the_final_key() =>
        Assert.Equal("signal.kappa_final", KeyOf(() => Read("kind = \"conductivity\"\nkappa_initial = 0.2\nkappa_final = 0.2")));

    [Fact]
    public void A_reactant_without_an_initial_concentration_names_the_species_key()
    {
        var s = Read("kind = \"conductivity\"\nkappa_initial = 0.25\nkappa_final = 0.1\nspecies = \"E\"");
        var ex = Assert.Throws<InputException>(() => SignalModel.For(s, Row(298.15)));
        Assert.Equal("signal.species", ex.Problem.Key);
        Assert.Contains("[E]0", ex.Problem.Hint);
    }

    [Theory]
    [InlineData("gas_volume", "signal.barometric_pressure")]
    [InlineData("pressure", "signal.gas_mole_change")]
    [InlineData("conductivity", "signal.kappa_final")]
    [InlineData("calibrated", "signal.calibration")]
    [InlineData("absorbance", "signal.molar_absorptivity")]
    public void Settings_built_in_code_without_a_required_value_name_the_key(string kind, string key)
    {
        var s = new SignalSettings { Kind = kind, Temperature = 298.15, KappaInitial = 0.3 };
        var ex = Assert.Throws<InputException>(() => SignalModel.For(s, Row(298.15, ("A", 0.01))));
        Assert.Equal(key, ex.Problem.Key);
    }

    [Fact]
    public void Settings_read_the_same_under_a_decimal_comma_culture()
    {
        var saved = CultureInfo.CurrentCulture;
        try
        {
            CultureInfo.CurrentCulture = CultureInfo.GetCultureInfo("de-DE");
            var s = Read("molar_absorptivity = 1234.5\nblank = 0.025");
            Assert.Equal(1234.5, s.MolarAbsorptivity);
            Assert.Equal(0.025, s.Blank);
        }
        finally { CultureInfo.CurrentCulture = saved; }
    }
}
