using System.Globalization;
using TraceKin.Setup;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Tests.Setup;

/// <summary>
/// The forms a hand-edited plan.csv takes, read through CsvHelper: quoting as RFC 4180 (IETF RFC 4180, "Common Format
/// and MIME Type for CSV Files", section 2: a quoted field may hold commas, line breaks and doubled quotes), a UTF-8
/// byte order mark, semicolons with decimal commas (common practice of spreadsheets in such locales, no source),
/// comment and blank lines, headers in any case with their units. Errors keep their line and column.
/// </summary>
public class PlanCsvTests
{
    [Fact]
    public void Quoted_cell_with_a_comma_and_a_line_break_is_one_cell_and_later_lines_keep_their_numbers()
    {
        var plan = Plan.FromText("run,file,[A]0 (mmol/L),note\nR1,a.csv,0.5,\"stirred, then\nheated\"\nR2,b.csv,1.5,plain\n", "plan.csv");
        Assert.Equal("stirred, then\nheated", plan.Rows[0].Extra["note"]);
        Assert.Equal(2, plan.Rows[0].Line);
        Assert.Equal(4, plan.Rows[1].Line); // the quoted line break counts as a line of the file
        Assert.Equal(1.5e-3, plan.Rows[1].InitialConcentrations["A"], 1e-18);
    }

    [Fact]
    public void Bad_cell_after_a_multi_line_quoted_cell_is_located_on_its_own_line_and_column()
    {
        // Line 3 is `second line",lots`: the bad cell starts after the closing quote and the comma, at character 14.
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,note,[A]0 (mM)\nR1,a.csv,\"first line\nsecond line\",lots\n", "plan.csv"));
        Assert.Equal((3, 14), (ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("lots", ex.Problem.Found);
    }

    [Fact]
    public void File_and_parameter_cells_after_a_multi_line_cell_keep_their_own_line()
    {
        // Line 3 is `b",r1.csv,`: the file cell starts at character 4 and the empty blank cell at 11.
        var plan = Plan.FromText("run,note,file,blank\nR1,\"a\nb\",r1.csv,\n", "plan.csv");
        var row = plan.Rows[0];
        Assert.Equal((2, 3, 4), (row.Line, row.FileLine, row.FileColumn));
        Assert.Equal((3, 11), (row.ConditionLines["blank"], row.ConditionCells["blank"]));
    }

    [Fact]
    public void Cell_after_a_quoted_cell_holding_the_delimiter_is_located_at_its_own_start()
    {
        // `R1,"a, b",x.csv,lots`: the [A]0 cell starts at character 17 (the old line splitter ignored quotes for columns).
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,note,file,[A]0 (mM)\nR1,\"a, b\",x.csv,lots\n", "plan.csv"));
        Assert.Equal((2, 17), (ex.Problem.Line, ex.Problem.Column));
    }

    [Fact]
    public void Doubled_quotes_inside_a_quoted_cell_read_as_one_quote()
    {
        var plan = Plan.FromText("run,file,note\nR1,a.csv,\"the \"\"fast\"\" batch\"\n", "plan.csv");
        Assert.Equal("the \"fast\" batch", plan.Rows[0].Extra["note"]);
    }

    [Fact]
    public void Byte_order_mark_is_not_part_of_the_first_header_nor_of_its_column()
    {
        var plan = Plan.FromText("\uFEFFrun,file,[A]0 (mM)\nR1,a.csv,0.5\n", "plan.csv");
        Assert.Equal("R1", plan.Rows[0].Run);
        Assert.Equal(10, plan.SpeciesColumns["A"].Column); // after "run,file," (9 characters): the BOM is not counted
        var ex = Assert.Throws<InputException>(() => Plan.FromText("\uFEFFrun,file,[A]0 (ppm)\nR1,a.csv,1\n", "plan.csv"));
        Assert.Equal((1, 10), (ex.Problem.Line, ex.Problem.Column));
    }

    [Fact]
    public void Byte_order_mark_in_a_file_on_disk_is_read_past()
    {
        var path = Path.Combine(Path.GetTempPath(), $"plan-bom-{Guid.NewGuid():N}.csv");
        File.WriteAllBytes(path, [0xEF, 0xBB, 0xBF, .. "run;file;[A]0 (mmol/L)\nR1;a.csv;0,25\n"u8.ToArray()]);
        try
        {
            var plan = Plan.FromFile(path);
            Assert.Equal(2.5e-4, plan.Rows[0].InitialConcentrations["A"], 1e-18);
        }
        finally { File.Delete(path); }
    }

    [Fact]
    public void Semicolon_plan_reads_decimal_commas_never_as_group_separators()
    {
        // "0,02" is two hundredths with a decimal comma; a parser that allows group separators would read 2.
        var plan = Plan.FromText("run;file;[A]0 (mol/L);note\nR1;a.csv;0,02;\"a; b\"\n", "plan.csv");
        Assert.Equal(0.02, plan.Rows[0].InitialConcentrations["A"], 1e-17);
        Assert.Equal("a; b", plan.Rows[0].Extra["note"]);
    }

    [Fact]
    public void Comment_lines_blank_lines_and_indented_comments_are_skipped_with_line_numbers_kept()
    {
        var plan = Plan.FromText("# series of 3 December\n\nrun,file,[A]0 (mM)\n# a comment with an \"odd quote\n  # indented\n   \nR1,a.csv,0.5\n\nR2,b.csv,1\n", "plan.csv");
        Assert.Equal(3, plan.HeaderLine);
        Assert.Equal([7, 9], plan.Rows.Select(r => r.Line));
    }

    [Fact]
    public void Headers_are_matched_in_any_case_with_their_units()
    {
        var plan = Plan.FromText("RUN,File,Temperature (K),[A]0 (mmol/L),Barometric_Pressure (kPa)\nR1,a.csv,300,2,101.3\n", "plan.csv");
        Assert.Equal(300, plan.Rows[0].TemperatureK!.Value, 12);
        Assert.Equal(2e-3, plan.Rows[0].InitialConcentrations["A"], 1e-18);
        Assert.Equal(101300, plan.Rows[0].Conditions["barometric_pressure"].Value, 9);
    }

    [Fact]
    public void Quote_that_is_never_closed_is_an_error_at_the_quote()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,note\nR1,a.csv,\"left open\nR2,b.csv,x\n", "plan.csv"));
        Assert.Equal((2, 10), (ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("quote", ex.Problem.Found);
    }

    [Fact]
    public void Row_with_a_missing_cell_is_located_where_the_cell_would_start()
    {
        var ex = Assert.Throws<InputException>(() => Plan.FromText("run,file,[A]0 (mM)\nR1,a.csv\n", "plan.csv"));
        Assert.Equal((2, 9), (ex.Problem.Line, ex.Problem.Column)); // just after "R1,a.csv"
        Assert.Equal("2 cells", ex.Problem.Found);
    }

    public static TheoryData<string> Cultures => new() { "de-DE", "fr-FR", "" };

    [Theory]
    [MemberData(nameof(Cultures))]
    public void Same_plan_gives_identical_runs_under_every_culture(string culture)
    {
        // Each form once: decimal commas with semicolons, and decimal points with commas (invented plan).
        const string semicolons = "\uFEFFRun;File;Temperature (°C);[A]0 (mmol/L);[B]0 (µmol/L);note\n# comment\nR1;a.csv;25,5;0,02;1,5e2;\"x; y\"\nR2;b.csv;-5,25;12;0,5;\"two\nlines\"\n";
        const string commas = "run,file,temperature (°C),[A]0 (mmol/L),[B]0 (µmol/L),note\nR1,a.csv,25.5,0.02,1.5e2,\"x, y\"\nR2,b.csv,-5.25,12,0.5,plain\n";
        var reference = Describe(Plan.FromText(semicolons, "plan.csv")) + Describe(Plan.FromText(commas, "plan.csv"));
        var saved = (CultureInfo.CurrentCulture, CultureInfo.CurrentUICulture);
        CultureInfo.CurrentCulture = CultureInfo.CurrentUICulture = CultureInfo.GetCultureInfo(culture);
        try
        {
            Assert.Equal(reference, Describe(Plan.FromText(semicolons, "plan.csv")) + Describe(Plan.FromText(commas, "plan.csv")));
        }
        finally { (CultureInfo.CurrentCulture, CultureInfo.CurrentUICulture) = saved; }
        // And the numbers are the ones written (Celsius zero is 273.15 K exactly, SI Brochure, 9th ed.).
        var plan = Plan.FromText(semicolons, "plan.csv");
        Assert.Equal(298.65, plan.Rows[0].TemperatureK!.Value, 12);
        Assert.Equal(2e-5, plan.Rows[0].InitialConcentrations["A"], 1e-20);
        Assert.Equal(1.5e-4, plan.Rows[0].InitialConcentrations["B"], 1e-19);
        Assert.Equal(267.9, plan.Rows[1].TemperatureK!.Value, 12);
    }

    /// <summary>Every field of every row as round-trip text in the invariant culture.</summary>
    private static string Describe(Plan plan)
    {
        var ci = CultureInfo.InvariantCulture;
        return string.Join("\n", plan.Rows.Select(r => string.Join("|",
            r.Run, r.File, r.Line, r.FileColumn, r.TemperatureK?.ToString("R", ci),
            string.Join(";", r.InitialConcentrations.OrderBy(kv => kv.Key, StringComparer.Ordinal).Select(kv => kv.Key + "=" + kv.Value.ToString("R", ci))),
            string.Join(";", r.Extra.OrderBy(kv => kv.Key, StringComparer.Ordinal).Select(kv => kv.Key + "=" + kv.Value))))) + "\n";
    }

    [Fact]
    public void Calibration_standards_read_quotes_bom_comments_and_decimal_commas()
    {
        var st = CalibrationStandards.FromCsvText("\uFEFF# standards of 3 December\n\"signal (AU)\";[A] (mmol/L)\n0,10;1,0\n  # a repeat\n0,20;2,0\n", "standards.csv", "A", []);
        Assert.Equal([0.10, 0.20], st.Signals);
        Assert.Equal(1e-3, st.Concentrations[0], 1e-18);
        Assert.Equal(2e-3, st.Concentrations[1], 1e-18);
    }

    [Fact]
    public void Calibration_error_after_a_comment_keeps_its_line_and_column()
    {
        var ex = Assert.Throws<InputException>(() => CalibrationStandards.FromCsvText("signal,[A] (mol/L)\n# note\n0.1,0.001\n0.2,abc\n", "standards.csv", "A", []));
        Assert.Equal((4, 5), (ex.Problem.Line, ex.Problem.Column));
    }
}
