using TraceKin.Cli.Commands;

namespace TraceKin.Tests.Cli;

// `inspect` prints what the ingest stage decided; the exports are invented, the expected lines follow from them.
public sealed class InspectCommandTests : IDisposable
{
    private readonly DirectoryInfo _dir = Directory.CreateTempSubdirectory("tracekin-inspect-");

    public void Dispose() => _dir.Delete(recursive: true);

    private FileInfo Write(string name, string text)
    {
        var path = Path.Combine(_dir.FullName, name);
        File.WriteAllText(path, text);
        return new FileInfo(path);
    }

    [Fact]
    public void Inspect_prints_detected_format_columns_span_and_interval_and_exits_0()
    {
        var f = Write("r1.csv", "run: R1\ntime (s);A520;T (°C)\n0;0,50;25,0\n0,5;0,45;25,0\n1;0,41;25,1\n");
        var output = new StringWriter();
        var code = InspectCommand.Run([f], null, output);
        var text = output.ToString();
        Assert.Equal(0, code);
        Assert.Contains("delimiter            semicolon", text);
        Assert.Contains("decimal separator    comma", text);
        Assert.Contains("encoding             UTF-8", text);
        Assert.Contains("run                R1", text);
        Assert.Contains("\"A520\"", text);
        Assert.Contains("3 points, 0 to 1 s, every 0.5 s", text);
        Assert.Contains("1 of 1 file read, 0 rejected", text);
    }

    [Fact]
    public void Inspect_lists_a_rejected_file_with_its_located_message_and_exits_2()
    {
        var good = Write("good.csv", "time (s),A520\n0,0.5\n1,0.4\n2,0.3\n");
        var bad = Write("bad.csv", "time (s),A520\n0,0.5\n1,zero\n2,0.3\n");
        var output = new StringWriter();
        var code = InspectCommand.Run([good, bad], null, output);
        Assert.Equal(2, code);
        Assert.Contains("rejected: bad.csv:3:3: found \"zero\"", output.ToString());
        Assert.Contains("1 of 2 files read, 1 rejected", output.ToString());
    }

    [Fact]
    public void Inspect_applies_the_ingest_table_of_series_toml_beside_the_file()
    {
        Write("series.toml", "[ingest]\nduplicate_times = \"average\"\n");
        var f = Write("r2.csv", "time (s),A520\n0,0.5\n1,0.4\n1,0.38\n2,0.3\n");
        var output = new StringWriter();
        Assert.Equal(0, InspectCommand.Run([f], null, output));
        Assert.Contains("[ingest] of series.toml", output.ToString());
        Assert.Contains("[duplicate-times]", output.ToString());
    }

    [Fact]
    public void Inspect_command_parses_its_arguments_through_system_commandline()
    {
        var f = Write("r3.csv", "time (s),A520\n0,0.5\n1,0.4\n2,0.3\n");
        var root = new System.CommandLine.RootCommand { InspectCommand.Create() };
        Assert.Equal(0, root.Parse(["inspect", f.FullName]).Invoke());
        Assert.Equal(2, root.Parse(["inspect", f.FullName, Path.Combine(_dir.FullName, "missing.csv")]).Invoke());
    }

    [Fact]
    public void Inspect_shows_control_characters_from_the_export_as_visible_escapes()
    {
        // an invented preamble value carrying a terminal "clear screen" sequence and a bell
        var f = Write("r1.csv", "operator: MK\u001B[2J\u0007\ntime (s),A520\n0,0.50\n1,0.45\n2,0.41\n");
        var output = new StringWriter();
        Assert.Equal(0, InspectCommand.Run([f], null, output));
        var text = output.ToString();
        Assert.DoesNotContain("\u001B", text, StringComparison.Ordinal);
        Assert.DoesNotContain("\u0007", text, StringComparison.Ordinal);
        Assert.Contains(@"MK\x1B[2J\x07", text, StringComparison.Ordinal);
    }

    [Fact]
    public void Inspect_of_a_plate_map_shows_the_plan_it_makes_and_its_located_problems()
    {
        Write("series.toml", TraceKin.Tests.Plates.PlateFolder.Toml + "\n\n[plate]\nexport = \"plate.csv\"\n");
        var map = Write("plate-map.csv", "[S]0 (mmol/L),1,2\nA,0.4,0.6\nB,0.8,x\n\nrole,1,2\nA,sample,sample\nB,blank,\n");
        var output = new StringWriter();
        Assert.Equal(2, InspectCommand.Run([map], null, output));
        var text = output.ToString();
        Assert.Contains("runs                 3 (A1 … B1), reading plate.csv", text);
        Assert.Contains("2 sample, 1 blank", text);
        Assert.Contains("plate-map.csv:3:7: found well B2: \"x\"", text);

        File.WriteAllText(map.FullName, "[S]0 (mmol/L),1,2\nA,0.4,0.6\nB,0.8,1.0\n");
        output = new StringWriter();
        Assert.Equal(0, InspectCommand.Run([map], null, output));
        Assert.Contains("problems             none", output.ToString());
    }
}
