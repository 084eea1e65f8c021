using TraceKin.Setup;
using TraceKin.Tests.Support;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Tests.Signal;

/// <summary>The registry of signal kinds: one entry per kind, the names series.toml accepts, and errors that list them.</summary>
public sealed class SignalKindsTests
{
    [Fact]
    public void The_registry_lists_the_five_first_kinds_in_their_documented_order()
    {
        // The order docs/formats.md "[signal]" lists them in; a new kind comes after them.
        Assert.Equal(["absorbance", "calibrated", "gas_volume", "pressure", "conductivity"], SignalKinds.Names.Take(5));
        Assert.Equal(SignalKinds.Names, SignalSettings.Kinds);
        Assert.Equal(SignalKinds.Names.Count, SignalKinds.Names.Distinct().Count());
    }

    [Fact]
    public void An_unknown_kind_is_a_settings_error_that_lists_every_registered_name()
    {
        var s = new SignalSettings { Kind = "sonar", MolarAbsorptivity = 100 };
        var ex = Assert.Throws<InputException>(() => SignalModel.For(s, SignalSettingsTests.Row(298.15, ("A", 0.01))));
        Assert.Equal("signal.kind", ex.Problem.Key);
        Assert.Equal("\"sonar\"", ex.Problem.Found);
        Assert.Equal("one of: " + string.Join(", ", SignalKinds.Names), ex.Problem.Expected);
    }

    [Fact]
    public void An_unknown_kind_in_series_toml_is_refused_naming_the_registered_kinds()
    {
        var ex = Assert.Throws<InputException>(() => SignalSettingsTests.Read("kind = \"sonar\""));
        Assert.Equal("signal.kind", ex.Problem.Key);
        Assert.All(SignalKinds.Names, n => Assert.Contains(n, ex.Problem.Expected));
    }

    [Fact]
    public void Every_kind_names_a_sample_column_whose_unit_is_known()
    {
        foreach (var kind in SignalKinds.All)
            Assert.NotNull(Units.Find(kind.SampleColumn.Unit));
    }

    [Theory]
    [InlineData("absorbance", "blank,path_length")]
    [InlineData("calibrated", "")]
    [InlineData("gas_volume", "barometric_pressure,solution_volume,zero_offset,gas_temperature")]
    [InlineData("pressure", "gas_temperature")]
    [InlineData("conductivity", "")]
    public void Each_kind_takes_its_own_plan_parameters(string kind, string expected)
    {
        var used = RunConditions.UsedBy(new SignalSettings { Kind = kind });
        Assert.Equal(expected, string.Join(",", used));
    }

    [Fact]
    public void A_gas_collector_zeroed_after_mixing_takes_no_zero_offset_column()
    {
        var used = RunConditions.UsedBy(new SignalSettings { Kind = "gas_volume", ZeroedAfterMixing = true });
        Assert.DoesNotContain("zero_offset", used);
    }

    [Fact]
    public void Each_kind_builds_a_model_of_its_own_quantity()
    {
        // Minimal settings per kind; the quantity each conversion reads is what the kind is (common practice, no source).
        var row = SignalSettingsTests.Row(298.15, ("A", 0.01));
        Assert.Equal(Quantity.Absorbance, SignalModel.For(new SignalSettings { Kind = "absorbance", MolarAbsorptivity = 100 }, row).SignalQuantity);
        Assert.Equal(Quantity.GasVolume, SignalModel.For(new SignalSettings { Kind = "gas_volume", Coefficient = 1, BarometricPressure = 101325, SolutionVolume = 0.025 }, row).SignalQuantity);
        Assert.Equal(Quantity.Pressure, SignalModel.For(new SignalSettings { Kind = "pressure", GasMoleChange = 1 }, row).SignalQuantity);
        Assert.Equal(Quantity.Conductivity, SignalModel.For(new SignalSettings { Kind = "conductivity", KappaInitial = 1, KappaFinal = 0.5 }, row).SignalQuantity);
    }

    [Fact]
    public void Every_registered_kind_has_a_round_trip_case()
    {
        // A new kind must add its line to ConversionTests.Kinds (DEVELOPERS.md, "How to add a signal kind").
        var covered = ((IEnumerable<object[]>)ConversionTests.Kinds()).Select(row => SignalSettingsTests.Read("coefficient = -1\n" + (string)row[0]).Kind).ToHashSet();
        Assert.All(SignalKinds.Names, n => Assert.Contains(n, covered));
    }

    [Fact]
    public void Every_registered_kind_is_documented_in_formats_md()
    {
        var docs = File.ReadAllText(Path.Combine(RepoPaths.Docs, "formats.md"));
        Assert.All(SignalKinds.Names, n => Assert.Contains($"kind = \"{n}\"", docs));
    }

    private sealed record TrialOptions(double Gain);

    [Fact]
    public void A_kind_keeps_its_own_settings_record_beside_the_others()
    {
        var s = new SignalSettings().WithOptions("trial", new TrialOptions(2.5)).WithOptions("other", new TrialOptions(1));
        Assert.Equal(2.5, s.Options<TrialOptions>("trial")!.Gain);
        Assert.Equal(1, s.Options<TrialOptions>("other")!.Gain);
        Assert.Null(new SignalSettings().Options<TrialOptions>("trial"));
    }
}
