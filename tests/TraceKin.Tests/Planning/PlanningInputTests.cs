using TraceKin.Planning;
using TraceKin.Series;
using TraceKin.Tests.Support;
using TraceKin.Traces;
using Xunit;

namespace TraceKin.Tests.Planning;

/// <summary>Bad limits, series and guesses are refused with a message naming the option or summary.json key (robustness,
/// no source needed).</summary>
public sealed class PlanningInputTests : IDisposable
{
    private readonly RepoPaths.TempDir _dir = new();
    public void Dispose() => _dir.Dispose();

    private static readonly PowerLawDesign Law = new(["A"], null);
    private static readonly List<RunPoint> Runs = [.. new[] { 1e-3, 2e-3, 4e-3 }.Select((a, i) => new RunPoint($"R{i + 1}", 0.5 * a, 0.01 * a, new Dictionary<string, double> { ["A"] = a }, 298.15))];

    [Theory]
    [InlineData(5e-3, 1e-3)]  // low above high
    [InlineData(2e-3, 2e-3)]  // no room between them
    [InlineData(0, 2e-3)]     // zero concentration
    public void A_concentration_range_that_leaves_no_room_for_a_run_names_its_option(double low, double high)
    {
        var ex = Assert.Throws<InputException>(() => PlanningSetup.Space(new PlanningLimits([new ConcentrationRange("A", low, high)], null, null, 2), Law, Runs, null));
        Assert.Equal("--range A", ex.Problem.Key);
        Assert.Contains("leaves room for a run", ex.Problem.Expected);
    }

    [Fact]
    public void A_temperature_range_that_leaves_no_room_names_its_option()
    {
        var law = new PowerLawDesign(["A"], 298.15);
        var ex = Assert.Throws<InputException>(() => PlanningSetup.Space(new PlanningLimits([new ConcentrationRange("A", 1e-4, 1e-2)], 330, 300, 2), law, Runs, null));
        Assert.Equal("--temperature-range", ex.Problem.Key);
    }

    [Fact]
    public void Runs_and_replicates_that_do_not_fit_and_unknown_species_are_refused()
    {
        var range = new ConcentrationRange("A", 1e-4, 1e-2);
        Assert.Equal("--runs", Assert.Throws<InputException>(() => PlanningSetup.Space(new PlanningLimits([range], null, null, 0), Law, Runs, null)).Problem.Key);
        Assert.Equal("--replicates", Assert.Throws<InputException>(() => PlanningSetup.Space(new PlanningLimits([range], null, null, 3, 2), Law, Runs, null)).Problem.Key);
        Assert.Equal("--range B", Assert.Throws<InputException>(() => PlanningSetup.Space(new PlanningLimits([new ConcentrationRange("B", 1e-4, 1e-2)], null, null, 2), Law, Runs, null)).Problem.Key);
    }

    [Theory]
    [InlineData("Km", -1.0)]
    [InlineData("Vmax", 0.0)]
    [InlineData("n(S)", 9.0)]
    [InlineData("Ea", 900.0)]
    [InlineData("k", double.NaN)]
    public void A_prior_guess_out_of_range_names_the_guess(string name, double value)
    {
        var ex = Assert.Throws<InputException>(() => PlanningSetup.CheckGuess(name, value));
        Assert.Equal($"--guess {name}", ex.Problem.Key);
        Assert.Equal(PlanningSetup.CommandLine, ex.Problem.File);
    }

    [Fact]
    public void A_new_study_needs_a_guess_for_every_parameter_and_only_those()
    {
        var missing = Assert.Throws<InputException>(() => PlanningSetup.FromGuesses("saturation", ["S"], null, new Dictionary<string, double> { ["Vmax"] = 1e-5 }, false, 298.15));
        Assert.Equal("--guess Km", missing.Problem.Key);
        var extra = Assert.Throws<InputException>(() => PlanningSetup.FromGuesses("saturation", ["S"], null, new Dictionary<string, double> { ["Vmax"] = 1e-5, ["Km"] = 1e-3, ["Ea"] = 50 }, false, 298.15));
        Assert.Equal("--guess Ea", extra.Problem.Key);
    }

    [Theory]
    [InlineData("A=1..", "--range")]
    [InlineData("A:1..2", "--range")]
    [InlineData("A=1..2 furlongs", "--range A")]
    [InlineData("A=1..2 kPa", "--range A")]
    public void Range_text_that_cannot_be_read_names_the_option(string text, string key)
    {
        var ex = Assert.Throws<InputException>(() => LimitText.Range(text, _ => Units.Find("mmol/L")!));
        Assert.Equal(key, ex.Problem.Key);
    }

    [Fact]
    public void Range_and_guess_text_read_their_units()
    {
        var r = LimitText.Range("H+=25..400 mmol/L", _ => Units.Find("mol/L")!);
        Assert.Equal(("H+", 0.025, 0.4), (r.Species, r.Low, r.High));
        Assert.Equal(1e-4, LimitText.Range("A=0.1..2", _ => Units.Find("mmol/L")!).Low, 12);
        var (lo, hi) = LimitText.TemperatureRange("15..60");
        Assert.Equal((288.15, 333.15), (lo, hi));
        Assert.Equal(("Km", 0.002), LimitText.Guess("Km=2 mmol/L"));
    }

    private string Summary(string json)
    {
        var path = Path.Combine(_dir.Path, "summary.json");
        File.WriteAllText(path, json);
        return path;
    }

    private const string Run1 = """{"id": "R1", "temperature": 298.15, "initialConcentrations": {"A": 0.001}, "initialRate": {"value": 5e-7, "stdError": 1e-8}, "rateResolved": true}""";
    private const string Run2 = """{"id": "R2", "temperature": 298.15, "initialConcentrations": {"A": 0.002}, "initialRate": {"value": 1e-6, "stdError": 2e-8}, "rateResolved": true}""";

    [Fact]
    public void A_series_whose_power_law_fit_did_not_converge_is_refused_naming_the_key()
    {
        var path = Summary($$"""{"series": "x", "runs": [{{Run1}}, {{Run2}}], "orders": [{"species": "A", "value": 1}], "powerLaw": {"fit": {"converged": false} } }""");
        var ex = Assert.Throws<InputException>(() => AnalysedSeries.FromSummary(path));
        Assert.Equal("powerLaw.fit.converged", ex.Problem.Key);
        Assert.Equal("summary.json", ex.Problem.File);
    }

    [Fact]
    public void A_series_without_fitted_orders_is_refused_naming_the_key()
    {
        var path = Summary($$"""{"series": "x", "runs": [{{Run1}}, {{Run2}}], "orders": []}""");
        Assert.Equal("orders", Assert.Throws<InputException>(() => AnalysedSeries.FromSummary(path)).Problem.Key);
    }

    [Fact]
    public void A_summary_without_usable_runs_or_not_json_is_refused()
    {
        var none = Summary("""{"series": "x", "runs": [], "orders": []}""");
        Assert.Equal("runs", Assert.Throws<InputException>(() => AnalysedSeries.FromSummary(none)).Problem.Key);
        var bad = Summary("{ not json");
        var ex = Assert.Throws<InputException>(() => AnalysedSeries.FromSummary(bad));
        Assert.Equal(1, ex.Problem.Line);
    }
}
