using System.Globalization;
using TraceKin.Analysis;
using TraceKin.Cli.Commands;
using TraceKin.Setup;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Plates;

/// <summary>
/// A series whose plan is drawn in plate maps beside series.toml ([plate]) instead of typed in plan.csv: the plan is
/// built in memory at analysis, and a problem of the map is located at its cell and takes out only the wells it
/// concerns. Invented maps and exports (<see cref="PlateFolder"/>: first-order loss, initial rate k·[S]0).
/// </summary>
public class PlateMapSeriesTests
{
    private const string Toml = PlateFolder.Toml + "\n\n[plate]\nexport = \"plate.csv\"\n";

    // line 1: [S]0 grid, 2: A, 3: B, 4: blank, 5: role grid, 6: A, 7: B
    private const string Map = """
        [S]0 (mmol/L),1,2,3
        A,0.4,0.6,0.8
        B,0.4,0.6,0.8

        role,1,2,3
        A,sample,sample,sample
        B,sample,sample,sample
        """;

    private static string Export(int rows = 2) => PlateFolder.Wide(
        Enumerable.Range(0, rows).SelectMany(r => new[] { 0.0004, 0.0006, 0.0008 }.Select((c0, c) => ($"{(char)('A' + r)}{c + 1}", c0, 0.01))).ToList());

    private static SeriesResult Analyse(string map, string? toml = null, string? export = null, string? plan = null)
    {
        using var folder = new PlateFolder(toml ?? Toml);
        folder.Write("plate.csv", export ?? Export());
        folder.Write("plate-map.csv", map);
        if (plan is not null) folder.Write("plan.csv", plan);
        return SeriesRunner.Analyse(folder.Path, new AnalysisOptions { Workers = 2 });
    }

    private static string[] Ids(SeriesResult r) => r.Runs.Select(x => x.Id).ToArray();

    [Fact]
    public void The_demo_plate_analysed_from_its_map_gives_the_runs_and_results_of_its_plan_csv()
    {
        // The demo's plan.csv was written from its plate-map.csv by `tracekin plate-plan`: the plan built in memory
        // from the map must be the same plan, so every number is the same (round trip, invented demo data).
        using var fromPlan = RepoPaths.CopyOf(RepoPaths.Sample("teal-lactonase-plate"));
        using var fromMap = RepoPaths.CopyOf(RepoPaths.Sample("teal-lactonase-plate"));
        File.Delete(Path.Combine(fromMap.Path, "plan.csv"));
        File.AppendAllText(Path.Combine(fromMap.Path, "series.toml"), "\n[plate]\nexport = \"plate.csv\"\n");

        var a = SeriesRunner.Analyse(fromPlan.Path, new AnalysisOptions { Workers = 2 });
        var b = SeriesRunner.Analyse(fromMap.Path, new AnalysisOptions { Workers = 2 });

        Assert.Empty(b.Rejected);
        Assert.Equal(32, b.Runs.Count);
        Assert.Equal(Ids(a), Ids(b));
        Assert.Equal(a.Runs.Select(r => (r.Plan.Channel, r.Plan.Role, r.Plan.Group, r.Plan.Subtract, r.Plan.InitialConcentrations["S"])),
            b.Runs.Select(r => (r.Plan.Channel, r.Plan.Role, r.Plan.Group, r.Plan.Subtract, r.Plan.InitialConcentrations["S"])));
        Assert.Equal(a.Runs.Select(r => (r.Rates.Headline.Value, r.Rates.Headline.StdError)), b.Runs.Select(r => (r.Rates.Headline.Value, r.Rates.Headline.StdError)));
        var (sa, sb) = (a.Findings!.Saturation!, b.Findings!.Saturation!);
        Assert.Equal((sa.Vmax.Value, sa.Vmax.StdError, sa.Km.Value, sa.Km.StdError), (sb.Vmax.Value, sb.Vmax.StdError, sb.Km.Value, sb.Km.StdError));
        Assert.Equal(a.Replicates.Select(g => g.Runs.Count), b.Replicates.Select(g => g.Runs.Count));
        Assert.DoesNotContain(b.Warnings, w => w.Code == "file-not-in-plan");
        // The map is an input like plan.csv: hashed from the bytes parsed, and listed with that hash in the report.
        var mapHash = Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(File.ReadAllBytes(Path.Combine(fromMap.Path, "plate-map.csv"))));
        Assert.Equal(mapHash, b.SetupHashes["plate-map.csv"]);
        Assert.Contains($"<tr><td>plate-map.csv</td>\n<td>plate map (hashed when read)</td>\n<td class=\"hash\">{mapHash}</td>", TraceKin.Reports.ReportHtml.Render(b, null));
    }

    [Fact]
    public void A_good_map_plans_one_run_per_filled_well_reading_its_own_channel()
    {
        var r = Analyse(Map);
        Assert.Empty(r.Rejected);
        Assert.Equal(["A1", "A2", "A3", "B1", "B2", "B3"], Ids(r));
        // initial rate k·[S]0 of a first-order loss (closed-form integrated law, common practice, no source), 5 % slack for noise
        Assert.All(r.Runs, x => Assert.Equal(0.01 * x.Plan.InitialConcentrations["S"], x.Rates.Headline.Value, 0.05 * 0.01 * x.Plan.InitialConcentrations["S"]));
    }

    [Fact]
    public void A_row_with_a_missing_well_takes_out_that_row_only_and_names_the_well()
    {
        var r = Analyse(Map.Replace("B,sample,sample,sample", "B,sample,sample"));
        var p = Assert.Single(r.Rejected);
        Assert.Equal(("plate-map.csv", 7), (p.File, p.Line));
        Assert.Contains("well B3 is missing", p.Hint);
        Assert.Contains("not analysed: wells B1, B2, B3", p.Hint);
        Assert.Equal(["A1", "A2", "A3"], Ids(r));
    }

    [Fact]
    public void A_row_with_an_extra_well_is_located_at_the_extra_cell()
    {
        var r = Analyse(Map.Replace("A,0.4,0.6,0.8", "A,0.4,0.6,0.8,0.9"));
        var p = Assert.Single(r.Rejected);
        Assert.Equal(("plate-map.csv", 2, 15), (p.File, p.Line, p.Column));
        Assert.Contains("well A4 is extra", p.Hint);
        Assert.Equal(["B1", "B2", "B3"], Ids(r));
    }

    [Fact]
    public void A_value_the_plan_refuses_is_located_at_its_map_cell_and_takes_out_its_well_only()
    {
        var r = Analyse(Map.Replace("B,0.4,0.6,0.8", "B,0.4,abc,0.8"));
        var p = Assert.Single(r.Rejected);
        Assert.Equal(("plate-map.csv", 3, 7), (p.File, p.Line, p.Column));
        Assert.StartsWith("well B2: \"abc\"", p.Found);
        Assert.Contains("a number", p.Expected);
        Assert.Equal(["A1", "A2", "A3", "B1", "B3"], Ids(r));

        var negative = Analyse(Map.Replace("A,0.4,0.6,0.8", "A,-0.4,0.6,0.8"));
        Assert.Equal(("plate-map.csv", 2, 3), (negative.Rejected[0].File, negative.Rejected[0].Line, negative.Rejected[0].Column));
        Assert.Equal(5, negative.Runs.Count);
    }

    [Fact]
    public void A_row_given_twice_takes_out_its_wells_located_at_the_second()
    {
        var r = Analyse(Map + "\nA,sample,blank,sample\n");
        var p = Assert.Single(r.Rejected);
        Assert.Equal(("plate-map.csv", 8, 1), (p.File, p.Line, p.Column));
        Assert.Contains("again (first on line 6)", p.Found);
        Assert.Equal(["B1", "B2", "B3"], Ids(r));
    }

    [Fact]
    public void A_missing_row_and_a_row_beyond_the_plate_are_located()
    {
        var missing = Analyse(Map.Replace("B,sample,sample,sample", ""));
        var p = Assert.Single(missing.Rejected);
        Assert.Equal("plate-map.csv", p.File);
        Assert.Contains("row B is missing", p.Hint);
        Assert.Equal(["A1", "A2", "A3"], Ids(missing));

        var beyond = Analyse(Map + "\nC,sample,sample,sample\n");
        var q = Assert.Single(beyond.Rejected);
        Assert.Equal((8, 1), (q.Line, q.Column));
        Assert.Contains("an extra row", q.Hint);
        Assert.Equal(6, beyond.Runs.Count);
    }

    [Fact]
    public void An_unknown_role_is_located_at_its_cell_and_takes_out_that_well()
    {
        var r = Analyse(Map.Replace("B,sample,sample,sample", "B,sample,standard,sample"));
        var p = Assert.Single(r.Rejected);
        Assert.Equal(("plate-map.csv", 7, 10), (p.File, p.Line, p.Column));
        Assert.Contains("sample or blank", p.Expected);
        Assert.Equal(["A1", "A2", "A3", "B1", "B3"], Ids(r));
    }

    [Fact]
    public void A_blank_well_taken_out_takes_out_the_wells_that_subtract_its_group()
    {
        // B3 is the group's one blank; its bad [S]0 cell must not leave A1 and A2 subtracting nothing
        var map = Map.Replace("B,0.4,0.6,0.8", "B,0.4,0.6,x").Replace("B,sample,sample,sample", "B,sample,sample,blank")
            + "\ngroup,1,2,3\nA,,,\nB,,,buffer\n\nsubtract,1,2,3\nA,buffer,buffer,\nB,,,\n";
        var r = Analyse(map, Toml.Replace("blank = 0.04", "blank = 0"));
        Assert.Equal(3, r.Rejected.Count);
        Assert.Equal(("plate-map.csv", 3, 11), (r.Rejected[0].File, r.Rejected[0].Line, r.Rejected[0].Column));
        // line 13: the subtract grid's row A; columns of A1 and A2
        Assert.Equal([(13, 3), (13, 10)], r.Rejected.Skip(1).Select(p => (p.Line, p.Column)));
        Assert.All(r.Rejected.Skip(1), p => Assert.Contains("well B3, itself not analysed", p.Found));
        Assert.Equal(["A3", "B1", "B2"], Ids(r));
    }

    [Fact]
    public void A_well_the_export_lacks_is_rejected_at_its_map_cell_and_a_missing_export_at_the_setting()
    {
        var r = Analyse(Map.Replace("B,0.4,0.6,0.8", "B,0.4,0.6,0.8\nC,0.5,,").Replace("B,sample,sample,sample", "B,sample,sample,sample\nC,sample,,"));
        var p = Assert.Single(r.Rejected);
        Assert.Equal(("plate-map.csv", 4, 3), (p.File, p.Line, p.Column));
        Assert.StartsWith("well C1: channel \"C1\"", p.Found);
        Assert.Equal(6, r.Runs.Count);

        var gone = Analyse(Map, Toml.Replace("export = \"plate.csv\"", "export = \"plate-7.csv\""));
        Assert.Equal(6, gone.Rejected.Count);
        var toml = Toml.Replace("export = \"plate.csv\"", "export = \"plate-7.csv\"").Replace("\r\n", "\n").Split('\n');
        Assert.All(gone.Rejected, q => Assert.Equal(("series.toml", Array.FindIndex(toml, l => l.StartsWith("export", StringComparison.Ordinal)) + 1), (q.File, q.Line)));
        Assert.All(gone.Rejected, q => Assert.Equal("plate-7.csv", q.Input));
    }

    [Fact]
    public void Plan_csv_beside_a_plate_table_is_refused_at_the_table()
    {
        var r = Analyse(Map, plan: "run,file,channel,[S]0 (mmol/L)\nA1,plate.csv,A1,0.4\n");
        var p = Assert.Single(r.Rejected);
        var toml = Toml.Replace("\r\n", "\n").Split('\n');
        Assert.Equal(("series.toml", Array.IndexOf(toml, "[plate]") + 1), (p.File, p.Line));
        Assert.Contains("plan.csv", p.Found);
        Assert.Empty(r.Runs);
    }

    [Fact]
    public void A_map_without_a_plate_table_is_pointed_at_by_the_missing_plan_csv()
    {
        var r = Analyse(Map, PlateFolder.Toml);
        var p = Assert.Single(r.Rejected);
        Assert.Equal("plan.csv", p.File);
        Assert.Contains("[plate]", p.Hint);
    }

    [Fact]
    public void A_map_problem_of_the_whole_map_rejects_the_series_at_its_cell()
    {
        var r = Analyse(Map.Replace("[S]0 (mmol/L)", "[S]0 (furlongs)"));
        var p = Assert.Single(r.Rejected);
        Assert.Equal(("plate-map.csv", 1, 1), (p.File, p.Line, p.Column));
        Assert.Empty(r.Runs);

        var twice = Analyse(Map + "\n[S]0 (mmol/L),1,2,3\nA,1,1,1\nB,1,1,1\n");
        Assert.Equal(("plate-map.csv", 8, 1), (twice.Rejected[0].File, twice.Rejected[0].Line, twice.Rejected[0].Column));
    }

    [Fact]
    public void File_and_channel_grids_name_a_wells_export_and_channel()
    {
        var map = Map + "\nchannel,1,2,3\nA,,,B3\nB,,,A3\n";
        var r = Analyse(map);
        Assert.Empty(r.Rejected);
        Assert.Equal("B3", r.Runs.Single(x => x.Id == "A3").Plan.Channel);
        Assert.Equal("A3", r.Runs.Single(x => x.Id == "B3").Plan.Channel);
    }

    [Fact]
    public void Plate_plan_reports_a_value_the_plan_refuses_at_its_map_cell()
    {
        using var dir = new RepoPaths.TempDir();
        var mapPath = Path.Combine(dir.Path, "map.csv");
        File.WriteAllText(mapPath, Map.Replace("B,0.4,0.6,0.8", "B,0.4,abc,0.8"));
        var err = new StringWriter();
        Assert.Equal(2, PlatePlanCommand.Run([new FileInfo(mapPath)], "plate.csv", null, "", false, TextWriter.Null, err));
        Assert.Contains("map.csv:3:7: found well B2: \"abc\"", err.ToString());
        Assert.False(File.Exists(Path.Combine(dir.Path, "plan.csv")));
    }

    [Theory]
    [InlineData("de-DE")]
    [InlineData("fr-FR")]
    [InlineData("")]
    public void A_semicolon_map_with_decimal_commas_plans_the_same_runs_under_every_culture(string culture)
    {
        var commas = PlateMap.Read([("m.csv", "[S]0 (mmol/L);1;2\nA;0,4;0,6\nB;0,8;1,5e0\n\nrole;1;2\nA;sample;sample\nB;sample;blank\n")]);
        var saved = (CultureInfo.CurrentCulture, CultureInfo.CurrentUICulture);
        CultureInfo.CurrentCulture = CultureInfo.CurrentUICulture = CultureInfo.GetCultureInfo(culture);
        try
        {
            var (plan, problems) = commas.ToPlan("plate.csv", "", "plate map (m.csv)");
            Assert.Empty(problems);
            // the values as written: 0,4 mmol/L = 4e-4 mol/L (exact decimal reading, common practice, no source)
            Assert.Equal([4e-4, 6e-4, 8e-4, 1.5e-3], plan!.Rows.Select(r => r.InitialConcentrations["S"]));
            Assert.Equal("blank", plan.Rows[3].Role);
        }
        finally { (CultureInfo.CurrentCulture, CultureInfo.CurrentUICulture) = saved; }
    }
}
