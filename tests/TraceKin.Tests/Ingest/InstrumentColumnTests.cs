using TraceKin.Ingest;
using TraceKin.Traces;
using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// Unit factors: SI Brochure 9th ed. (BIPM 2019) for SI prefixes; standard atmosphere 101 325 Pa and
// torr = 101 325/760 Pa (BIPM 2019, Table 8 and CGPM 1954); psi = 6 894.757 293 168 Pa and mmHg = 133.322 387 415 Pa
// (NIST SP 811, 2008, Appendix B.8); bar = 10^5 Pa (BIPM 2019, Table 8).
public class InstrumentColumnTests
{
    [Theory]
    [InlineData("A520", 520.0)]
    [InlineData("A@520nm", 520.0)]
    [InlineData("Abs 430 nm", 430.0)]
    [InlineData("A 254.5 nm", 254.5)]
    [InlineData("absorbance", null)]
    [InlineData("Abs", null)]
    public void Absorbance_headers_in_several_spellings_are_absorbance_channels(string header, double? wavelength)
    {
        var run = Read($"time (s),{header}\n0,0.5\n1,0.4\n2,0.3\n");
        Assert.Equal(Quantity.Absorbance, run.Channels[0].Quantity);
        var described = Detected(run, $"column \"{header}\"");
        Assert.StartsWith("absorbance", described);
        if (wavelength is { } wl) Assert.Contains($"at {wl.ToString(System.Globalization.CultureInfo.InvariantCulture)} nm", described);
    }

    [Fact]
    public void Multi_wavelength_export_gives_one_channel_per_wavelength_and_keeps_the_reference()
    {
        var run = Read("time (s),A430,A520,A700 ref\n0,0.9,0.5,0.01\n1,0.8,0.45,0.01\n2,0.7,0.41,0.02\n");
        Assert.Equal(["A430", "A520", "A700 ref"], run.Channels.Select(c => c.Name));
        Assert.Equal("A700 ref", Detected(run, "reference channel"));
        Assert.Equal("absorbance reference at 700 nm, AU", Detected(run, "column \"A700 ref\""));
    }

    [Fact]
    public void Absorbance_in_milli_units_is_converted()
    {
        var run = Read("time (s),A520 (mAU)\n0,512\n1,431\n2,366\n");
        Assert.Equal(0.512, run.Channels[0].Values[0], 12);
    }

    [Theory]
    [InlineData("V (mL)", 2.5, 2.5e-3)]
    [InlineData("V [µL]", 2500.0, 2.5e-3)]
    [InlineData("volume (L)", 0.0025, 0.0025)]
    [InlineData("gas volume/mL", 2.5, 2.5e-3)]
    public void Gas_volume_columns_are_read_in_litres(string header, double written, double litres)
    {
        var w = written.ToString(System.Globalization.CultureInfo.InvariantCulture);
        var run = Read($"time (s),{header}\n0,0\n1,{w}\n2,{w}1\n");
        Assert.Equal(Quantity.GasVolume, run.Channels[0].Quantity);
        Assert.Equal("L", run.Channels[0].Unit);
        Assert.Equal(litres, run.Channels[0].Values[1], 12);
    }

    [Theory]
    [InlineData("Pa", 1.0)]
    [InlineData("kPa", 1e3)]
    [InlineData("MPa", 1e6)]
    [InlineData("bar", 1e5)]
    [InlineData("mbar", 100.0)]
    [InlineData("atm", 101325.0)]
    [InlineData("psi", 6894.757293168)]
    [InlineData("mmHg", 133.322387415)]
    [InlineData("Torr", 101325.0 / 760)]
    public void Pressure_units_convert_to_pascal_with_exact_factors(string unit, double pascalPerUnit)
    {
        var run = Read($"time (s),p [{unit}]\n0,1\n1,2\n2,3\n");
        Assert.Equal(Quantity.Pressure, run.Channels[0].Quantity);
        Assert.Equal(2 * pascalPerUnit, run.Channels[0].Values[1], 9);
    }

    [Theory]
    [InlineData("κ (mS/cm)", 0.1)]
    [InlineData("conductivity (µS/cm)", 1e-4)]
    [InlineData("cond [S/m]", 1.0)]
    public void Conductivity_units_convert_to_siemens_per_metre(string header, double factor)
    {
        var run = Read($"time (s),{header}\n0,10\n1,12\n2,14\n");
        Assert.Equal(Quantity.Conductivity, run.Channels[0].Quantity);
        Assert.Equal(12 * factor, run.Channels[0].Values[1], 12);
    }

    [Fact]
    public void Temperature_and_ph_columns_go_to_auxiliary_not_channels()
    {
        var run = Read("time (s),A520,T (°C),pH\n0,0.5,25.0,7.01\n1,0.4,25.1,7.00\n2,0.3,25.2,6.98\n");
        Assert.Single(run.Channels);
        Assert.Equal(["T (°C)", "pH"], run.Auxiliary.Select(a => a.Name));
        Assert.Equal(298.25, run.Auxiliary[0].Values[1], 12);
        Assert.Equal(6.98, run.Auxiliary[1].Values[2]);
    }

    [Fact]
    public void Sample_number_columns_and_listed_columns_are_ignored()
    {
        var run = Read("No.,time (s),A520,comment\n1,0,0.5,ok\n2,1,0.4,ok\n3,2,0.3,bubble\n", new IngestSettings { IgnoreColumns = ["comment"] });
        Assert.Single(run.Channels);
        Assert.Equal([0.0, 1, 2], run.Channels[0].Times);
        Assert.Equal("time", Detected(run, "time column").Split(' ')[0].Trim('"'));
    }

    [Fact]
    public void An_unknown_unit_is_an_error_naming_it()
    {
        var p = Rejects("time (s),V (furlong3)\n0,1\n1,2\n2,3\n");
        Assert.Equal(1, p.Line);
        Assert.Equal(10, p.Column);
        Assert.Contains("furlong3", p.Found);
    }

    [Fact]
    public void An_unknown_time_unit_is_an_error_naming_it()
    {
        var p = Rejects("time (fortnights),A520\n0,1\n1,2\n2,3\n");
        Assert.Contains("fortnights", p.Found);
        Assert.Equal(1, p.Column);
    }

    [Fact]
    public void A_volume_header_with_a_pressure_unit_is_rejected()
    {
        var p = Rejects("time (s),V (kPa)\n0,1\n1,2\n2,3\n");
        Assert.Contains("kPa", p.Found);
        Assert.Contains("volume", p.Expected);
    }

    [Fact]
    public void A_column_with_neither_a_known_name_nor_a_unit_is_rejected_with_a_hint()
    {
        var p = Rejects("time (s),signal\n0,1\n1,2\n2,3\n");
        Assert.Contains("signal", p.Found);
        Assert.Contains("ignore_columns", p.Hint);
    }

    [Fact]
    public void Time_column_is_found_by_name_when_it_is_not_first()
    {
        var run = Read("A520,t [min]\n0.5,0\n0.4,1\n0.3,2\n");
        Assert.Equal([0.0, 60, 120], run.Channels[0].Times);
    }

    [Fact]
    public void Time_column_can_be_named_in_settings()
    {
        var run = Read("elapsed (s),clock (s),A520\n0,100,0.5\n1,101,0.4\n2,102,0.3\n",
            new IngestSettings { TimeColumn = "clock", IgnoreColumns = ["elapsed"] });
        Assert.Equal([0.0, 1, 2], run.Channels[0].Times);
        Assert.StartsWith("\"clock (s)\"", Detected(run, "time column"));
    }
}
