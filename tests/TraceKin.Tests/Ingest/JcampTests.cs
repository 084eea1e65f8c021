using TraceKin.Traces;
using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// Every file below is built by hand from the rules of the JCAMP-DX specification: R. S. McDonald & P. A. Wilks,
// "JCAMP-DX: A Standard Form for Exchange of Infrared Spectra in Computer Readable Form", Appl. Spectrosc. 42 (1988) 151
// (labelled data records, required records, ##XYDATA=(X++(Y..Y)) and ##XYPOINTS=(XY..XY) tables, AFFN, PAC and the
// ASDF characters SQZ, DIF, DUP, the DIF Y-value check and the FIRSTX/LASTX/NPOINTS/FIRSTY checks; from memory of the paper).
// The ordinates are invented: 1000, 980, 961, 943, 926, 909, 893, 877 times YFACTOR 0.001, one every 10 s.
public class JcampTests
{
    private static readonly double[] Expected = [1.000, 0.980, 0.961, 0.943, 0.926, 0.909, 0.893, 0.877];

    private static string File(string table, string data, string extra = "", string npoints = "8", string lastx = "70") =>
        "##TITLE=fading violet band\n##JCAMP-DX=4.24\n##DATA TYPE=UV/VIS TIME COURSE\n##XUNITS=SECONDS\n##YUNITS=ABSORBANCE\n" +
        $"##XFACTOR=1\n##YFACTOR=0.001\n##FIRSTX=0\n##LASTX={lastx}\n##NPOINTS={npoints}\n##FIRSTY=1.0\n{extra}##{table}\n{data}##END=\n";

    private static void AssertCourse(RunExport run)
    {
        var trace = Assert.Single(run.Channels);
        Assert.Equal(Quantity.Absorbance, trace.Quantity);
        Assert.Equal([0.0, 10, 20, 30, 40, 50, 60, 70], trace.Times);
        for (var k = 0; k < Expected.Length; k++) Assert.Equal(Expected[k], trace.Values[k], 12);
        Assert.StartsWith("JCAMP-DX 4.24", Detected(run, "format"));
    }

    [Fact]
    public void Xydata_in_affn_is_read_with_yfactor_applied()
    {
        var run = Read(File("XYDATA=(X++(Y..Y))", "0 1000 980 961 943\n40 926 909 893 877\n"), file: "course.txt");
        AssertCourse(run);
        Assert.Equal("AFFN", Detected(run, "number forms"));
        Assert.Equal("UV/VIS TIME COURSE", run.Metadata["DATA TYPE"]);
    }

    [Fact]
    public void Xydata_in_pac_form_uses_signs_as_separators()
    {
        var run = Read(File("XYDATA=(X++(Y..Y))", "0+1000+980+961+943\n40+926+909+893+877\n"));
        AssertCourse(run);
        Assert.Contains("PAC", Detected(run, "number forms"));
    }

    [Fact]
    public void Xydata_in_sqz_form_decodes_the_leading_digit_letters()
    {
        // SQZ: A–I stand for a leading +1…+9 (McDonald & Wilks 1988): 1000 → A000, 980 → I80, 893 → H93.
        var run = Read(File("XYDATA=(X++(Y..Y))", "0A000I80I61I43\n40I26I09H93H77\n"));
        AssertCourse(run);
        Assert.Equal("AFFN, SQZ", Detected(run, "number forms"));
    }

    [Fact]
    public void Xydata_in_dif_dup_form_with_a_y_check_value_is_decoded()
    {
        // DIF: j–r are −1…−9 as leading digits (−20 → k0, −19 → j9); DUP: T means "two in all"; a line ending in DIF form is followed by a line
        // that repeats its last ordinate (943 at X = 30), which is checked and not counted (McDonald & Wilks 1988).
        var run = Read(File("XYDATA=(X++(Y..Y))", "0A000k0j9j8\n30I43j7Tj6T\n"));
        AssertCourse(run);
        Assert.Equal("AFFN, SQZ, DIF, DUP", Detected(run, "number forms"));
    }

    [Fact]
    public void A_wrong_y_check_value_is_a_located_error()
    {
        var p = Rejects(File("XYDATA=(X++(Y..Y))", "0A000k0j9j8\n30I44j7Tj6T\n"));
        Assert.Equal(14, p.Line);
        Assert.Contains("Y check", p.Found);
    }

    [Fact]
    public void Dup_of_an_absolute_value_repeats_it()
    {
        var run = Read(File("XYDATA=(X++(Y..Y))", "0A000U\n30I43\n", npoints: "4", lastx: "30"));
        Assert.Equal([1.0, 1.0, 1.0, 0.943], run.Channels[0].Values.Select(v => Math.Round(v, 12)));
    }

    [Fact]
    public void Xypoints_pairs_are_read_with_both_factors()
    {
        var text = "##TITLE=gas burette\n##JCAMP-DX=5.01\n##XUNITS=MINUTES\n##YUNITS=ML\n##XFACTOR=0.5\n##YFACTOR=0.1\n" +
                   "##NPOINTS=4\n##FIRSTX=0\n##LASTX=1.5\n##XYPOINTS=(XY..XY)\n0, 0; 1, 12\n2, 23; 3, 33\n##END=\n";
        var run = Read(text);
        var v = run.Channels[0];
        Assert.Equal(Quantity.GasVolume, v.Quantity);
        Assert.Equal([0.0, 30, 60, 90], v.Times);
        Assert.Equal(2.3e-3, v.Values[2], 12); // 23 × 0.1 mL
    }

    [Fact]
    public void Npoints_that_disagree_with_the_table_is_an_error_naming_the_check()
    {
        var p = Rejects(File("XYDATA=(X++(Y..Y))", "0 1000 980 961 943\n40 926 909 893\n", lastx: "60"));
        Assert.Contains("NPOINTS", p.Expected);
    }

    [Fact]
    public void Firstx_that_disagrees_with_the_first_abscissa_is_an_error()
    {
        var p = Rejects(File("XYDATA=(X++(Y..Y))", "5 1000 980 961 943\n45 926 909 893 877\n"));
        Assert.Contains("X check", p.Expected);
        Assert.Equal(13, p.Line);
    }

    [Fact]
    public void Lastx_that_disagrees_with_the_points_is_an_error()
    {
        var text = "##TITLE=t\n##JCAMP-DX=4.24\n##XUNITS=SECONDS\n##YUNITS=ABSORBANCE\n##NPOINTS=3\n##FIRSTX=0\n##LASTX=20\n" +
                   "##XYPOINTS=(XY..XY)\n0,0.5 10,0.4 25,0.3\n##END=\n";
        var p = Rejects(text);
        Assert.Contains("LASTX check", p.Expected);
        Assert.Equal(7, p.Line);
    }

    [Fact]
    public void Firsty_that_disagrees_with_the_first_ordinate_is_an_error()
    {
        var p = Rejects(File("XYDATA=(X++(Y..Y))", "0 1100 980 961 943\n40 926 909 893 877\n"));
        Assert.Contains("FIRSTY check", p.Expected);
    }

    [Fact]
    public void A_file_without_end_is_reported_as_truncated()
    {
        var text = File("XYDATA=(X++(Y..Y))", "0 1000 980 961 943\n40 926 909 893 877\n").Replace("##END=\n", "");
        var p = Rejects(text);
        Assert.Contains("##END=", p.Found);
    }

    [Fact]
    public void Jcamp_is_sniffed_by_content_not_by_file_name()
    {
        var run = Read(File("XYDATA=(X++(Y..Y))", "0 1000 980 961 943\n40 926 909 893 877\n"), file: "run.csv");
        Assert.StartsWith("JCAMP-DX", Detected(run, "format"));
        var csv = Read("time (s),A520\n0,0.5\n1,0.4\n2,0.3\n", file: "run.jdx");
        Assert.Equal("delimited text", Detected(csv, "format"));
    }

    [Fact]
    public void Labels_are_compared_after_normalisation()
    {
        var text = "##TITLE=t\n##JCAMP-DX=4.24\n##X_UNITS=SECONDS\n##y units=ABSORBANCE\n##NPOINTS=3\n##FIRSTX=0\n##LASTX=20\n" +
                   "##XYPOINTS=(XY..XY)\n0,0.5 10,0.4 20,0.3\n##END=\n";
        Assert.Equal([0.5, 0.4, 0.3], Read(text).Channels[0].Values);
    }

    [Fact]
    public void Transmittance_is_refused_with_a_hint_to_convert()
    {
        var p = Rejects(File("XYDATA=(X++(Y..Y))", "0 1000\n").Replace("ABSORBANCE", "TRANSMITTANCE"));
        Assert.Equal(5, p.Line);
        Assert.Contains("absorbance", p.Hint);
    }

    [Fact]
    public void A_non_time_x_axis_is_refused()
    {
        var p = Rejects(File("XYDATA=(X++(Y..Y))", "0 1000\n").Replace("SECONDS", "1/CM"));
        Assert.Equal(4, p.Line);
        Assert.Contains("1/CM", p.Found);
    }

    [Fact]
    public void An_unknown_character_in_a_data_line_is_located()
    {
        var p = Rejects(File("XYDATA=(X++(Y..Y))", "0 1000 980 961 943\n40 926 9~9 893 877\n"));
        Assert.Equal((14, 9), (p.Line, p.Column));
    }

    [Fact]
    public void Comments_after_double_dollar_are_ignored()
    {
        var run = Read(File("XYDATA=(X++(Y..Y))", "0 1000 980 961 943 $$ first four\n40 926 909 893 877\n"));
        AssertCourse(run);
    }
}
