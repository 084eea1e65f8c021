using TraceKin.Analysis;
using TraceKin.Setup;
using TraceKin.Tests.Support;
using TraceKin.Traces;

namespace TraceKin.Tests.Setup;

/// <summary>Every species or channel series.toml names must exist; otherwise one located problem listing what does.</summary>
public class SeriesCheckTests
{
    private const string PlanText = "run,file,temperature (°C),[A]0 (mmol/L),[B]0 (mmol/L)\nR1,r1.csv,25,1,10\n";

    private static Problem Problem(string toml, string plan = PlanText)
    {
        var text = "[signal]\nkind = \"absorbance\"\nmolar_absorptivity = 1500\n" + toml;
        var config = SeriesConfig.FromText(text, "series.toml");
        var ex = Assert.Throws<InputException>(() => SeriesCheck.Check(config, Plan.FromText(plan, "plan.csv")));
        return config.Locate(ex.Problem);
    }

    [Fact]
    public void An_unknown_species_in_the_model_is_located_at_its_key_and_lists_the_plan_species()
    {
        var p = Problem("species = \"A\"\n[model]\nspecies = [\"A\", \"C\"]\n");
        Assert.Equal(("model.species", 6, 1), (p.Key, p.Line, p.Column));
        Assert.Contains("\"C\"", p.Found);
        Assert.Contains("A, B", p.Expected);
    }

    [Fact]
    public void An_unknown_followed_reactant_is_located_at_signal_species()
    {
        var p = Problem("species = \"Q\"\n");
        Assert.Equal(("signal.species", 4), (p.Key, p.Line));
        Assert.Contains("A, B", p.Expected);
    }

    [Fact]
    public void A_followed_product_may_be_absent_from_the_plan_since_it_starts_at_zero()
    {
        var config = SeriesConfig.FromText("[signal]\nkind = \"absorbance\"\nmolar_absorptivity = 1500\nspecies = \"P\"\ncoefficient = 1\n", "series.toml");
        SeriesCheck.Check(config, Plan.FromText(PlanText, "plan.csv"));
    }

    [Fact]
    public void A_reactant_absorber_missing_from_the_plan_is_an_error()
    {
        var p = Problem("species = \"A\"\n[[signal.absorber]]\nspecies = \"Z\"\nmolar_absorptivity = 200\ncoefficient = -1\n");
        Assert.Equal("signal.absorber[0].species", p.Key);
        Assert.True(p.Line > 0);
    }

    [Fact]
    public void An_unknown_substrate_is_an_error()
    {
        var p = Problem("species = \"A\"\n[model]\nsubstrate = \"S\"\n");
        Assert.Equal("model.substrate", p.Key);
    }

    [Fact]
    public void A_reference_channel_missing_from_an_export_rejects_that_run_listing_its_channels()
    {
        using var dir = new RepoPaths.TempDir();
        File.WriteAllText(Path.Combine(dir.Path, "r1.csv"), "time (s),A410,A600\n0,0.8,0.01\n10,0.7,0.01\n20,0.6,0.01\n30,0.5,0.01\n40,0.45,0.01\n");
        File.WriteAllText(Path.Combine(dir.Path, "plan.csv"), PlanText);
        File.WriteAllText(Path.Combine(dir.Path, "series.toml"),
            "[signal]\nkind = \"absorbance\"\nmolar_absorptivity = 1500\nspecies = \"A\"\nchannel = \"A410\"\nreference_channel = \"A650\"\n");

        var p = SeriesRunner.Analyse(dir.Path, new AnalysisOptions { Workers = 1 }).Rejected.Single();

        Assert.Equal(("signal.reference_channel", 6), (p.Key, p.Line));
        Assert.Contains("A410, A600", p.Expected);
        Assert.Equal("r1.csv", p.Input);
    }
}
