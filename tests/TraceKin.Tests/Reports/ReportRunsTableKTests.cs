using System.Text;
using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Series;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

/// <summary>
/// The runs table's "k for this run" column, in a series small enough to list every run and in one beyond
/// <see cref="ReportHtml.MaxListedRuns"/>, where only the listed runs' k are looked up: every row shows its own run's
/// k as summary.json's rateConstantPerRun gives it (the same numbers, so no source).
/// </summary>
public sealed class ReportRunsTableKTests
{
    private static readonly SeriesResult Amber = SeriesRunner.Analyse(RepoPaths.Sample("amber-ester-warmth"), new AnalysisOptions { Workers = 2 });

    private static Dictionary<string, string> KCells(SeriesResult result)
    {
        using var stream = new MemoryStream();
        ReportHtml.WriteTo(result, null, stream);
        var (doc, errors) = ReportHtmlTests.Parse(Encoding.UTF8.GetString(stream.ToArray()));
        Assert.Empty(errors);
        var table = doc.QuerySelector("#runs table.runs")!;
        var headers = table.QuerySelectorAll("thead th").Select(th => th.TextContent).ToList();
        var kColumn = headers.FindIndex(h => h.StartsWith("k for this run", StringComparison.Ordinal));
        Assert.True(kColumn >= 0, "the runs table has a k column");
        return table.QuerySelectorAll("tbody tr").ToDictionary(tr => tr.GetAttribute("data-run")!, tr => tr.QuerySelectorAll("td")[kColumn].TextContent);
    }

    private static void EveryRowShowsItsRunsK(SeriesResult result, Dictionary<string, string> cells)
    {
        var k = result.Findings!.PerRunK.ToDictionary(x => x.RunId);
        foreach (var (run, cell) in cells)
            Assert.Equal(k.TryGetValue(run, out var rk) ? ReportNumber.Measured(rk.Value, rk.StdError) : "—", cell);
    }

    [Fact]
    public void A_small_series_shows_every_runs_k()
    {
        Assert.NotEmpty(Amber.Findings!.PerRunK);
        var cells = KCells(Amber);
        Assert.Equal(Amber.Runs.Count, cells.Count);
        EveryRowShowsItsRunsK(Amber, cells);
    }

    [Fact]
    public void Beyond_the_listed_runs_each_listed_row_still_shows_its_own_k()
    {
        // The sample's runs repeated under new ids until the series is longer than the report lists, each copy
        // with a k of its own (every third without one), so a row showing another run's k would be seen.
        var runs = new List<RunResult>();
        var perRunK = new List<RunRateConstant>();
        var baseK = Amber.Findings!.PerRunK.ToDictionary(x => x.RunId);
        for (var copy = 0; runs.Count <= ReportHtml.MaxListedRuns + 50; copy++)
            foreach (var run in Amber.Runs)
            {
                var id = $"{run.Id}-c{copy}";
                runs.Add(run with { Plan = run.Plan with { Run = id } });
                if (runs.Count % 3 != 0 && baseK.TryGetValue(run.Id, out var k))
                    perRunK.Add(new RunRateConstant(id, k.Value * (1 + 0.001 * runs.Count), k.StdError));
            }
        // Unplanned ids: the report is drawn from the result alone (no plan to name the plot files from).
        var big = Amber with { Runs = runs, Plan = null, Findings = Amber.Findings with { PerRunK = perRunK, RunsUsed = [] } };
        var cells = KCells(big);
        Assert.Equal(ReportHtml.MaxListedRuns, cells.Count);
        Assert.Contains(cells.Values, c => c == "—");
        Assert.Contains(cells.Values, c => c != "—");
        EveryRowShowsItsRunsK(big, cells);
    }
}
