using TraceKin.Cli.Commands;
using TraceKin.Setup;
using TraceKin.Tests.Support;
using TraceKin.Traces;

namespace TraceKin.Tests.Plates;

/// <summary>Plate-map grids (row letters down, column numbers across) turned into plan.csv rows. Invented maps.</summary>
public class PlateMapTests
{
    private const string Map = """
        [S]0 (mmol/L),1,2,3
        A,0.1,0.1,
        B,0.5,0.5,0

        role,1,2,3
        A,sample,sample,
        B,sample,sample,blank
        """;

    [Fact]
    public void Each_filled_well_becomes_a_plan_row_reading_its_own_channel()
    {
        var map = PlateMap.FromTexts([("map.csv", Map)]);
        var plan = Plan.FromText(map.ToPlanText("plate.csv"), "plan.csv");

        Assert.Equal(["A1", "A2", "B1", "B2", "B3"], plan.Rows.Select(r => r.Run));
        Assert.All(plan.Rows, r => Assert.Equal("plate.csv", r.File));
        Assert.Equal(["A1", "A2", "B1", "B2", "B3"], plan.Rows.Select(r => r.Channel));
        Assert.Equal(0.0005, plan.Rows[2].InitialConcentrations["S"], 12);
        Assert.Equal("blank", plan.Rows[4].Role);
    }

    [Fact]
    public void A_missing_or_extra_well_is_located_in_the_map()
    {
        var missing = Assert.Throws<InputException>(() => PlateMap.FromTexts([("map.csv", Map.Replace("B,sample,sample,blank", "B,sample,sample"))]));
        Assert.Equal(("map.csv", 7), (missing.Problem.File, missing.Problem.Line));
        Assert.Contains("well B3 is missing", missing.Problem.Hint);

        var extra = Assert.Throws<InputException>(() => PlateMap.FromTexts([("map.csv", Map.Replace("B,0.5,0.5,0", "B,0.5,0.5,0,0.7"))]));
        Assert.Equal((3, 13), (extra.Problem.Line, extra.Problem.Column));
        Assert.Contains("well B4 is extra", extra.Problem.Hint);
    }

    [Fact]
    public void A_repeated_grid_a_row_out_of_order_and_an_unknown_role_are_located()
    {
        var twice = Assert.Throws<InputException>(() => PlateMap.FromTexts([("a.csv", Map), ("b.csv", "role,1,2,3\nA,blank,,\nB,,,\n")]));
        Assert.Equal(("b.csv", 1, 1), (twice.Problem.File, twice.Problem.Line, twice.Problem.Column));
        Assert.Contains("first at a.csv line 5", twice.Problem.Found);

        var order = Assert.Throws<InputException>(() => PlateMap.FromTexts([("map.csv", Map.Replace("B,0.5,0.5,0", "C,0.5,0.5,0"))]));
        Assert.Equal((3, 1), (order.Problem.Line, order.Problem.Column));

        var role = Assert.Throws<InputException>(() => PlateMap.FromTexts([("map.csv", Map.Replace("B,sample,sample,blank", "B,sample,standard,blank"))]));
        Assert.Equal((7, 10), (role.Problem.Line, role.Problem.Column));
    }

    [Fact]
    public void The_command_writes_plan_csv_beside_the_map_and_refuses_to_replace_one()
    {
        using var dir = new RepoPaths.TempDir();
        var mapPath = Path.Combine(dir.Path, "map.csv");
        File.WriteAllText(mapPath, Map);
        var err = new StringWriter();

        Assert.Equal(0, PlatePlanCommand.Run([new FileInfo(mapPath)], "plate.csv", null, "", false, TextWriter.Null, err));
        var plan = Plan.FromFile(Path.Combine(dir.Path, "plan.csv"));
        Assert.Equal(5, plan.Rows.Count);
        Assert.Equal(1, PlatePlanCommand.Run([new FileInfo(mapPath)], "plate.csv", null, "", false, TextWriter.Null, err));
    }

    [Fact]
    public void A_file_grid_names_each_wells_export_so_the_command_needs_no_export()
    {
        using var dir = new RepoPaths.TempDir();
        var mapPath = Path.Combine(dir.Path, "map.csv");
        File.WriteAllText(mapPath, Map + "\n\nfile,1,2,3\nA,p1.csv,p1.csv,\nB,p2.csv,p2.csv,p2.csv\n");
        var err = new StringWriter();
        Assert.Equal(0, PlatePlanCommand.Run([new FileInfo(mapPath)], null, null, "", false, TextWriter.Null, err));
        var plan = Plan.FromFile(Path.Combine(dir.Path, "plan.csv"));
        Assert.Equal(["p1.csv", "p1.csv", "p2.csv", "p2.csv", "p2.csv"], plan.Rows.Select(r => r.File));
        Assert.DoesNotContain("file", plan.Rows[0].Extra.Keys);

        File.WriteAllText(mapPath, Map);
        Assert.Equal(1, PlatePlanCommand.Run([new FileInfo(mapPath)], null, new FileInfo(Path.Combine(dir.Path, "other.csv")), "", false, TextWriter.Null, err));
        Assert.Contains("--export", err.ToString());
    }
}
