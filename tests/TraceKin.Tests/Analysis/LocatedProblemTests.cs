using TraceKin.Ingest;
using TraceKin.Tests.Watch;
using TraceKin.Traces;

namespace TraceKin.Tests.Analysis;

// Every rejection names a 1-based line and column, never 0: a scan over bad inputs of every kind (exports, plan.csv,
// series.toml, files that are not exports at all), analysed as a series. Robustness tests: no source needed.
public class LocatedProblemTests
{
    private static string Toml(string from, string to)
    {
        Assert.Contains(from, SeriesFixture.GoodToml, StringComparison.Ordinal);
        return SeriesFixture.GoodToml.Replace(from, to, StringComparison.Ordinal);
    }

    /// <summary>Each case damages a good series in one way.</summary>
    private static readonly Dictionary<string, Action<ProbeSeries>> Cases = new()
    {
        ["cut last row"] = s => { var t = s.ExportText().TrimEnd('\n'); s.Write("r005.csv", t[..t.LastIndexOf(',')]); s.Plan("r005.csv"); },
        ["cut number"] = s => { s.Write("r005.csv", s.ExportText().TrimEnd('\n') + "\n999,1.2e"); s.Plan("r005.csv"); },
        ["huge and subnormal readings"] = s => { s.Write("r005.csv", s.ExportText().Replace("\n1,", "\n1,4.9e-324\n1.25,", StringComparison.Ordinal) + "300,1e308\n"); s.Plan("r005.csv"); },
        ["too few samples for a rate"] = s => { s.Write("r005.csv", "time (s),A530\n0,0.60\n0.5,0.59\n1,0.58\n"); s.Plan("r005.csv"); },
        ["saturated channel"] = s => { s.Write("r005.csv", "time (s),A530\n0,1.0\n1,3.3\n2,3.3\n3,3.3\n4,3.3\n"); s.Plan("r005.csv"); },
        ["text in a cell"] = s => { s.Write("r005.csv", "time (s),A530\n0,0.6\n1,zero\n2,0.5\n"); s.Plan("r005.csv"); },
        ["empty export"] = s => { s.Write("r005.csv", ""); s.Plan("r005.csv"); },
        ["binary export"] = s => { File.WriteAllBytes(Path.Combine(s.Folder, "r005.csv"), [0x50, 0x4B, 0x03, 0x04, 0x00, 0x01]); s.Plan("r005.csv"); },
        ["missing export"] = s => s.Plan("r005.csv"),
        ["path out of the folder"] = s => s.Plan("../outside/secret.csv"),
        ["absolute path"] = s => s.Plan(s.Secret),
        ["link out of the folder"] = s => { File.CreateSymbolicLink(Path.Combine(s.Folder, "r005.csv"), s.Secret); s.Plan("r005.csv"); },
        ["a folder"] = s => { Directory.CreateDirectory(Path.Combine(s.Folder, "r005")); s.Plan("r005"); },
        ["a device"] = s => s.Plan("/dev/zero"),
        ["oversized sparse file"] = s => { using var fs = File.Create(Path.Combine(s.Folder, "r005.csv")); fs.SetLength(ExportReader.MaxBytes + 1); s.Plan("r005.csv"); },
        ["bad temperature in the plan"] = s => File.AppendAllText(Path.Combine(s.Folder, "plan.csv"), "R009,r001.csv,hot,0.4,100\n"),
        ["unknown key in series.toml"] = s => s.Write("series.toml", SeriesFixture.BadToml),
        ["bad value in series.toml"] = s => s.Write("series.toml", Toml("path_length = 1.0", "path_length = -1.0")),
        ["missing key in series.toml"] = s => s.Write("series.toml", Toml("molar_absorptivity = 1480\n", "")),
        ["channel the exports lack"] = s => s.Write("series.toml", Toml("channel = \"A530\"", "channel = \"A999\"")),
        ["decimal comma forced on comma-delimited exports"] = s => s.Write("series.toml", SeriesFixture.GoodToml + "\n[ingest]\ndecimal = \"comma\"\n"),
        ["not TOML"] = s => s.Write("series.toml", "name = \"x\"\n[signal\nkind = 1\n"),
        ["missing series.toml"] = s => File.Delete(Path.Combine(s.Folder, "series.toml")),
    };

    public static TheoryData<string> Names => new(Cases.Keys);

    [Theory]
    [MemberData(nameof(Names))]
    public void Every_problem_names_a_line_and_a_column_of_at_least_1(string name)
    {
        if (name == "a device" && !File.Exists("/dev/zero")) return; // no device to name on this system
        using var s = new ProbeSeries();
        Cases[name](s);
        var result = s.AnalyseGuarded();
        Assert.NotEmpty(result.Rejected);
        foreach (var p in result.Rejected)
        {
            Assert.True(p.Line >= 1, $"{name}: line {p.Line} in \"{p.Message}\"");
            Assert.True(p.Column >= 1, $"{name}: column {p.Column} in \"{p.Message}\"");
            Assert.Matches(@"^[^:]+:\d+:\d+", p.Message);
        }
    }

    [Fact]
    public void A_settings_problem_names_the_line_and_column_of_its_key()
    {
        using var s = new ProbeSeries();
        s.Write("series.toml", Toml("path_length = 1.0", "path_length = -1.0"));
        var p = Assert.Single(s.Analyse().Rejected);
        var lines = File.ReadAllLines(Path.Combine(s.Folder, "series.toml"));
        var line = Array.FindIndex(lines, l => l.StartsWith("path_length", StringComparison.Ordinal)) + 1;
        Assert.Equal(("series.toml", line, 1, "signal.path_length"), (p.File, p.Line, p.Column, p.Key));
    }

    [Fact]
    public void A_key_that_conflicts_with_an_export_is_located_in_series_toml_and_names_the_export()
    {
        using var s = new ProbeSeries();
        s.Write("series.toml", Toml("channel = \"A530\"", "channel = \"A999\""));
        var result = s.Analyse();
        Assert.Equal(ProbeSeries.GoodRuns, result.Rejected.Count);
        var p = result.Rejected[0];
        var lines = File.ReadAllLines(Path.Combine(s.Folder, "series.toml"));
        Assert.Equal(("series.toml", Array.FindIndex(lines, l => l.StartsWith("channel", StringComparison.Ordinal)) + 1, 1), (p.File, p.Line, p.Column));
        Assert.StartsWith("\"r001.csv\": \"A999\"", p.Found);
        Assert.Equal("r001.csv", p.Input);
    }

    [Fact]
    public void A_trace_too_short_for_a_rate_is_located_at_its_first_data_row()
    {
        using var s = new ProbeSeries();
        s.Write("r005.csv", "# bench photometer\ntime (s),A530\n0,0.60\n0.5,0.59\n1,0.58\n");
        s.Plan("r005.csv");
        var result = s.Analyse();
        ProbeSeries.AssertGoodRunsAnalysed(result);
        var p = Assert.Single(result.Rejected);
        Assert.Equal(("r005.csv", 3, 1), (p.File, p.Line, p.Column));
        Assert.Contains("(data rows on lines 3–5)", p.Found);
    }

    [Theory]
    [InlineData("[signal]\npath_length = 1\n", "signal.path_length", 2, 1)]
    [InlineData("[signal]\n  path_length = 1 # cm\n", "signal.path_length", 2, 3)]
    [InlineData("signal.path_length = 1\n", "signal.path_length", 1, 1)]
    [InlineData("[signal]\nkind = \"a\"\n[rates]\nmethod = \"x\"\n", "rates.method", 4, 1)]
    [InlineData("[signal]\ncalibration = { file = \"std.csv\" }\n", "signal.calibration.file", 2, 17)]
    [InlineData("[signal]\nkind = \"a\"\n", "signal.molar_absorptivity", 1, 1)] // not written: at its table's header
    [InlineData("name = \"x\"\n", "ingest.decimal", 1, 1)]
    [InlineData("# note = 1\n[model]\n\"species\" = []\n", "model.species", 3, 1)]
    public void Keys_are_found_in_the_forms_series_toml_uses(string text, string key, int line, int column) =>
        Assert.Equal((line, column), TraceKin.Setup.TomlKeyLocation.Find(text, key));
}
