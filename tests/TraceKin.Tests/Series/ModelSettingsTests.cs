using TraceKin.Analysis;
using TraceKin.Series;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Tests.Series;

/// <summary>The [model] table of series.toml (keys and defaults as documented in docs/formats.md).</summary>
public class ModelSettingsTests
{
    private static ModelSettings Parse(string model) =>
        SeriesConfig.FromText("[signal]\nkind = \"absorbance\"\nspecies = \"A\"\n[model]\n" + model, "series.toml").Model;

    [Fact]
    public void Defaults_fit_power_and_saturation_and_round_orders()
    {
        var m = ModelSettings.Default;
        Assert.Equal(["power", "saturation"], m.Laws);
        Assert.True(m.RoundOrders);
        Assert.Equal(298.15, m.EyringTemperatureK);
        Assert.Null(m.ReferenceTemperatureK);
        Assert.False(m.GlobalFit);
    }

    [Fact]
    public void Keys_are_read_from_the_model_table()
    {
        var m = Parse("laws = [\"saturation\"]\nsubstrate = \"S\"\nround_orders = false\nreference_temperature = 310.0\neyring_temperature = 310.15\nglobal_fit = true\n");
        Assert.Equal(["power", "saturation"], m.Laws); // the power law is always fitted, as the reference
        Assert.Equal("S", m.Substrate);
        Assert.False(m.RoundOrders);
        Assert.Equal(310.0, m.ReferenceTemperatureK);
        Assert.Equal(310.15, m.EyringTemperatureK);
        Assert.True(m.GlobalFit);
    }

    [Fact]
    public void An_unknown_law_is_a_located_error_naming_the_key()
    {
        var ex = Assert.Throws<InputException>(() => Parse("laws = [\"power\", \"hyperbolic\"]\n"));
        Assert.Equal("model.laws[1]", ex.Problem.Key);
        Assert.Contains("hyperbolic", ex.Problem.Found);
    }
}
