using System.Collections.Concurrent;
using TraceKin.Analysis;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Tests.Plates;

/// <summary>Many runs read from one export through the plan's channel column.</summary>
public class SharedExportTests
{
    private static readonly (string Header, double C0, double K)[] Wells =
    [
        ("A1", 0.0004, 0.010), ("A02", 0.0006, 0.010), ("B1", 0.0008, 0.020), ("B2", 0.0010, 0.005),
    ];

    private const string Plan = """
        run,file,channel,[S]0 (mmol/L)
        w1,plate.csv,A01,0.4
        w2,plate.csv,A2,0.6
        w3,plate.csv,b1,0.8
        w4,plate.csv,B2,1.0
        """;

    [Fact]
    public void Each_run_reads_its_own_well_and_the_file_is_parsed_once_for_all_of_them()
    {
        using var folder = new PlateFolder();
        folder.Write("plate.csv", PlateFolder.Wide(Wells));
        folder.Write("plan.csv", Plan);
        var parsed = new ConcurrentBag<string>();

        var result = SeriesRunner.Analyse(folder.Path, new AnalysisOptions { Workers = 4, ExportParsed = parsed.Add });

        Assert.Empty(result.Rejected);
        Assert.Equal(["plate.csv"], parsed.ToArray());
        // Initial rate of a first-order loss is k·[S]0 (closed-form integrated law, common practice, no source).
        for (var i = 0; i < Wells.Length; i++)
        {
            var run = result.Runs[i];
            var truth = Wells[i].K * Wells[i].C0;
            Assert.InRange(run.Rates.Headline.Value, truth * 0.97, truth * 1.03);
            Assert.Single(run.Export.Channels);
            Assert.Equal(WellName.Normalise(Wells[i].Header), run.Export.Channels[0].Name);
        }
    }

    [Fact]
    public void A_plan_channel_the_file_lacks_is_located_at_its_plan_cell_and_the_other_wells_are_analysed()
    {
        using var folder = new PlateFolder();
        folder.Write("plate.csv", PlateFolder.Wide(Wells));
        folder.Write("plan.csv", Plan + "\nw5,plate.csv,C9,0.5\n");

        var result = SeriesRunner.Analyse(folder.Path, new AnalysisOptions { Workers = 2 });

        Assert.Equal(4, result.Runs.Count);
        var p = Assert.Single(result.Rejected);
        Assert.Equal(("plan.csv", 6, 14), (p.File, p.Line, p.Column));
        Assert.Equal("plate.csv", p.Input);
        Assert.Contains("\"C9\"", p.Found);
        Assert.Contains("A1, A2, B1, B2", p.Expected);
    }

    [Fact]
    public void The_same_well_twice_in_a_plan_is_a_located_error_even_written_with_a_leading_zero()
    {
        var ex = Assert.Throws<InputException>(() => TraceKin.Setup.Plan.FromText(Plan + "\nw5,plate.csv,B01,0.5\n", "plan.csv"));
        Assert.Equal((6, 14), (ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("first on line 4", ex.Problem.Found);
    }

    [Fact]
    public void An_export_with_one_well_in_two_columns_is_rejected_at_the_second_header_cell()
    {
        using var folder = new PlateFolder();
        folder.Write("plate.csv", PlateFolder.Wide([("A1", 0.0004, 0.01), ("B1", 0.0004, 0.01), ("A01", 0.0004, 0.01)]));
        folder.Write("plan.csv", "run,file,channel,[S]0 (mmol/L)\nw1,plate.csv,A1,0.4\nw2,plate.csv,B1,0.4\n");

        var result = SeriesRunner.Analyse(folder.Path, new AnalysisOptions { Workers = 1 });

        Assert.Empty(result.Runs);
        Assert.Equal(2, result.Rejected.Count);
        Assert.All(result.Rejected, p => Assert.Equal(("plate.csv", 1, 16), (p.File, p.Line, p.Column)));
    }

    [Fact]
    public void Without_a_channel_column_the_series_channel_still_applies()
    {
        using var folder = new PlateFolder(PlateFolder.Toml.Replace("kind = \"absorbance\"", "kind = \"absorbance\"\nchannel = \"B01\""));
        folder.Write("plate.csv", PlateFolder.Wide(Wells));
        folder.Write("plan.csv", "run,file,[S]0 (mmol/L)\nw3,plate.csv,0.8\n");

        var result = SeriesRunner.Analyse(folder.Path, new AnalysisOptions { Workers = 1 });

        var run = Assert.Single(result.Runs);
        Assert.InRange(run.Rates.Headline.Value, 0.02 * 0.0008 * 0.97, 0.02 * 0.0008 * 1.03);
    }

    [Fact]
    public void A_reader_warning_about_one_well_stays_with_that_wells_run()
    {
        using var folder = new PlateFolder();
        // well B01 reads the same value throughout (k = 0): the reader warns about that column only
        var text = PlateFolder.Wide([("A1", 0.0004, 0.01), ("B01", 0.0004, 0.0)]).Split('\n')
            .Select((l, i) => i == 0 || l.Length == 0 ? l : string.Join(',', l.Split(',')[..2].Append("0.44000"))).ToArray();
        folder.Write("plate.csv", string.Join('\n', text));
        folder.Write("plan.csv", "run,file,channel,[S]0 (mmol/L)\nw1,plate.csv,A1,0.4\nw2,plate.csv,B1,0.4\n");

        var result = SeriesRunner.Analyse(folder.Path, new AnalysisOptions { Workers = 1 });

        var w1 = result.Runs.Single(r => r.Id == "w1");
        Assert.DoesNotContain(w1.Warnings, w => w.Code == "constant-signal");
        var w2 = result.Runs.Single(r => r.Id == "w2");
        Assert.Contains(w2.Warnings, w => w.Code == "constant-signal");
    }
}
