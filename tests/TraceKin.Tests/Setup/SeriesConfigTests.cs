using TraceKin.Analysis;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Tests.Setup;

public class SeriesConfigTests
{
    [Fact]
    public void Defaults_apply_when_tables_are_absent_and_millimetre_path_is_converted()
    {
        var c = SeriesConfig.FromText("[signal]\nmolar_absorptivity = 1200\npath_length = 5\npath_length_unit = \"mm\"\n", "series.toml");
        Assert.Equal(0.5, c.Signal.PathLength, 15);
        Assert.Equal(-1, c.Signal.Coefficient);
        Assert.Equal("auto", c.Rates.Method);
    }

    [Fact]
    public void Misspelt_key_is_an_error_naming_the_dotted_key()
    {
        var ex = Assert.Throws<InputException>(() => SeriesConfig.FromText("[signal]\nmolar_absorbtivity = 1200\n", "series.toml"));
        Assert.Equal("signal.molar_absorbtivity", ex.Problem.Key);
    }

    [Fact]
    public void Negative_path_length_is_an_error_naming_the_key()
    {
        var ex = Assert.Throws<InputException>(() => SeriesConfig.FromText("[signal]\npath_length = -1\n", "series.toml"));
        Assert.Equal("signal.path_length", ex.Problem.Key);
        Assert.Contains("greater than zero", ex.Problem.Expected);
    }

    [Fact]
    public void Invalid_toml_is_rejected_with_a_located_message()
    {
        var ex = Assert.Throws<InputException>(() => SeriesConfig.FromText("name = \"x\"\n[signal\nkind = 1\n", "series.toml"));
        Assert.Equal("series.toml", ex.Problem.File);
        Assert.Equal(2, ex.Problem.Line);
    }
}
