using TraceKin.Ingest;
using TraceKin.Traces;
using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// Expected values in these tests are the numbers written in the inline exports themselves (round trips of invented
// data), converted with exact unit factors (SI Brochure, 9th ed., BIPM 2019).
public class DelimitedTextTests
{
    [Fact]
    public void Comma_delimited_file_with_decimal_points_is_read_exactly()
    {
        var run = Read("time (s),A520\n0,0.512\n10,0.431\n20,0.366\n");
        var a = run.Channel("A520");
        Assert.Equal([0.0, 10, 20], a.Times);
        Assert.Equal([0.512, 0.431, 0.366], a.Values);
        Assert.Equal(Quantity.Absorbance, a.Quantity);
        Assert.Equal("comma", Detected(run, "delimiter"));
        Assert.Equal("point", Detected(run, "decimal separator"));
    }

    [Fact]
    public void Semicolon_delimited_file_with_decimal_commas_reads_0_comma_02_as_two_hundredths()
    {
        var run = Read("time (s);A520\n0;0,02\n5;0,015\n10;0,011\n");
        Assert.Equal([0.02, 0.015, 0.011], run.Channel("A520").Values);
        Assert.Equal("semicolon", Detected(run, "delimiter"));
        Assert.Equal("comma", Detected(run, "decimal separator"));
    }

    [Fact]
    public void Tab_delimited_file_is_detected()
    {
        var run = Read("time (s)\tA 520 nm\n0\t1.5\n1\t1.25\n2\t1.0\n");
        Assert.Equal("tab", Detected(run, "delimiter"));
        Assert.Equal([1.5, 1.25, 1.0], run.Channels[0].Values);
    }

    [Fact]
    public void Whitespace_delimited_file_with_aligned_columns_is_detected()
    {
        var run = Read("time (s)     A520      A600\n  0.0     0.900     0.100\n  1.0     0.800     0.110\n  2.0     0.700     0.120\n");
        Assert.Equal("whitespace", Detected(run, "delimiter"));
        Assert.Equal([0.1, 0.11, 0.12], run.Channel("A600").Values);
    }

    [Fact]
    public void Whitespace_header_with_single_spaces_keeps_units_with_their_names()
    {
        var run = Read("t (min) V (mL)\n0 0.0\n1 2.5\n2 4.5\n");
        Assert.Equal([0.0, 60, 120], run.Channels[0].Times);
        Assert.Equal(Quantity.GasVolume, run.Channels[0].Quantity);
    }

    [Fact]
    public void Quoted_cells_hold_decimal_commas_in_a_comma_delimited_file()
    {
        var run = Read("\"time (s)\",\"A520\"\n\"0\",\"0,50\"\n\"1\",\"0,45\"\n\"2\",\"0,41\"\n");
        Assert.Equal([0.50, 0.45, 0.41], run.Channel("A520").Values);
        Assert.Equal("comma", Detected(run, "delimiter"));
        Assert.Equal("comma", Detected(run, "decimal separator"));
    }

    [Fact]
    public void Quoted_header_with_an_embedded_delimiter_and_escaped_quote_is_one_column()
    {
        var run = Read("time (s),\"p, \"\"cell 1\"\" [kPa]\"\n0,101.3\n1,101.0\n2,100.8\n");
        Assert.Equal("p, \"cell 1\" [kPa]", run.Channels[0].Name);
        Assert.Equal(101300, run.Channels[0].Values[0], 9);
    }

    [Fact]
    public void Unquoted_decimal_commas_in_a_comma_delimited_file_are_rejected_never_read_as_whole_numbers()
    {
        var p = Rejects("time (s),A520\n0,0,02\n1,0,01\n2,0,005\n");
        Assert.Equal(2, p.Line);
        Assert.Contains("3 cells", p.Found);
        Assert.Contains("quoted", p.Hint);
    }

    [Fact]
    public void A_file_mixing_decimal_point_and_decimal_comma_is_an_error_naming_both_lines()
    {
        var p = Rejects("time (s);A520\n0;0.50\n1;0.45\n2;0,41\n");
        Assert.Equal(4, p.Line);
        Assert.Equal(3, p.Column);
        Assert.Contains("decimal comma", p.Found);
        Assert.Contains("line 2", p.Expected);
    }

    [Fact]
    public void A_number_with_grouping_and_decimal_separators_is_rejected()
    {
        var p = Rejects("time (s);p (Pa)\n0;101.325,5\n1;101.300,0\n2;101.250,0\n");
        Assert.Equal(2, p.Line);
        Assert.Contains("both", p.Found);
    }

    [Theory]
    [InlineData("\n")]
    [InlineData("\r\n")]
    [InlineData("\r")]
    public void Line_endings_LF_CRLF_and_CR_give_the_same_trace(string eol)
    {
        var text = string.Join(eol, "# instrument: bench photometer", "time (s),A520", "0,0.3", "1,0.2", "2,0.1") + eol;
        var run = Read(text);
        Assert.Equal([0.3, 0.2, 0.1], run.Channel("A520").Values);
        Assert.Equal(eol switch { "\n" => "LF", "\r\n" => "CRLF", _ => "CR" }, Detected(run, "line endings"));
    }

    [Fact]
    public void Comment_lines_and_blank_lines_are_skipped_anywhere()
    {
        var run = Read("# exported by a bench photometer\n\ntime (s),A520\n# baseline done\n0,0.3\n\n; note\n1,0.2\n2,0.1\n");
        Assert.Equal([0.0, 1, 2], run.Channels[0].Times);
        Assert.Equal(2, run.Channels[0].Times.Length - 1);
    }

    [Fact]
    public void Preamble_lines_in_four_spellings_become_metadata()
    {
        var run = Read("Operator: R. Imrie\nSample,run 4\npath length = 1 cm\n# cuvette: quartz\n\ntime (s),A520\n0,0.3\n1,0.2\n2,0.1\n");
        Assert.Equal("R. Imrie", run.Metadata["Operator"]);
        Assert.Equal("run 4", run.Metadata["Sample"]);
        Assert.Equal("1 cm", run.Metadata["path length"]);
        Assert.Equal("quartz", run.Metadata["cuvette"]);
        Assert.Equal("4 lines (4 metadata)", Detected(run, "preamble"));
        Assert.Equal("line 6", Detected(run, "header"));
    }

    [Fact]
    public void A_comment_line_of_prose_is_not_metadata_even_with_a_semicolon()
    {
        var run = Read("# written by a bench photometer; firmware 2\ntime (s),A520\n0,0.3\n1,0.2\n2,0.1\n");
        Assert.Empty(run.Metadata);
        Assert.Equal("1 line (0 metadata)", Detected(run, "preamble"));
    }

    [Fact]
    public void Footer_lines_after_the_data_end_the_table_and_their_keys_are_kept()
    {
        var run = Read("time (s),A520\n0,0.3\n1,0.2\n2,0.1\nEnd of data\nPoints: 3\n");
        Assert.Equal(3, run.Channels[0].Count);
        Assert.Equal("3", run.Metadata["Points"]);
        Assert.Equal("2 lines from line 5", Detected(run, "footer"));
    }

    [Fact]
    public void A_header_repeated_mid_file_is_an_error_naming_both_lines()
    {
        var p = Rejects("time (s),A520\n0,0.3\n1,0.2\ntime (s),A520\n0,0.3\n1,0.2\n");
        Assert.Equal(4, p.Line);
        Assert.Contains("line 4", p.Found);
        Assert.Contains("line 1", p.Found);
    }

    [Fact]
    public void A_text_row_between_data_rows_is_a_located_cell_error()
    {
        var p = Rejects("time (s),A520\n0,0.3\nn/a,0.25\n1,0.2\n2,0.1\n");
        Assert.Equal(3, p.Line);
        Assert.Equal(1, p.Column);
        Assert.Contains("n/a", p.Found);
    }

    [Fact]
    public void A_trailing_delimiter_on_every_line_is_accepted()
    {
        var run = Read("time (s);A520;\n0;0,3;\n1;0,2;\n2;0,1;\n");
        Assert.Equal([0.3, 0.2, 0.1], run.Channels[0].Values);
    }

    [Fact]
    public void Forced_delimiter_and_decimal_from_settings_are_used_and_reported()
    {
        var settings = new IngestSettings { Delimiter = "semicolon", DecimalSeparator = "comma" };
        var run = Read("time (s);A520\n0;1\n1;2\n2;3\n", settings);
        Assert.Equal("semicolon (set by ingest.delimiter)", Detected(run, "delimiter"));
        Assert.Equal("comma (set by ingest.decimal)", Detected(run, "decimal separator"));
    }

    [Fact]
    public void Forced_decimal_comma_with_comma_delimiter_is_a_setting_error()
    {
        var p = Rejects("time (s),A520\n0,1\n1,2\n2,3\n", new IngestSettings { Delimiter = "comma", DecimalSeparator = "comma" });
        Assert.Equal("ingest.decimal", p.Key);
    }

    [Fact]
    public void Forced_header_line_skips_a_preamble_that_looks_like_data()
    {
        var run = Read("2026-03-01 bench run\n25 degrees\ntime (s),A520\n0,0.3\n1,0.2\n2,0.1\n", new IngestSettings { HeaderLine = 3 });
        Assert.Equal("line 3 (set by ingest.header_line)", Detected(run, "header"));
        Assert.Equal(3, run.Channels[0].Count);
    }

    [Theory]
    [InlineData("de-DE")]
    [InlineData("fr-FR")]
    [InlineData("")]
    public void Decimal_comma_file_reads_identically_under_any_current_culture(string culture)
    {
        const string text = "mixed at: 0,5 s\ntime (s);A520;T (°C)\n0,0;0,812;25,0\n0,5;0,790;25,1\n1,5;0,751;25,1\n2,5;0,707;25,2\n";
        var run = UnderCulture(culture, () => Read(text));
        var reference = UnderCulture("", () => Read(text));
        Assert.Equal([-0.5, 0.0, 1.0, 2.0], run.Channels[0].Times);
        Assert.Equal([0.812, 0.790, 0.751, 0.707], run.Channels[0].Values);
        Assert.Equal(reference.Auxiliary[0].Values, run.Auxiliary[0].Values);
        Assert.Equal(298.15, run.Auxiliary[0].Values[0], 12);
    }

    [Theory]
    [InlineData("de-DE")]
    [InlineData("fr-FR")]
    [InlineData("")]
    public void Decimal_point_file_reads_identically_under_any_current_culture(string culture)
    {
        var run = UnderCulture(culture, () => Read("time (s),A520\n0.0,1.25e-1\n0.5,1.5E-1\n1.5,0.175\n"));
        Assert.Equal([0.125, 0.15, 0.175], run.Channels[0].Values);
        Assert.Equal([0.0, 0.5, 1.5], run.Channels[0].Times);
    }
}
