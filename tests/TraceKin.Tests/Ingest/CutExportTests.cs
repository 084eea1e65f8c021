using TraceKin.Analysis;
using System.Text;
using TraceKin.Ingest;
using TraceKin.Traces;
using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// An export copied while the instrument was still writing it ends in the middle of a row or of a number. Such a file
// must never be read as if it were whole: the default is a located error; ingest.cut_last_row = "drop" leaves the
// incomplete row out with a located warning. Invented exports; robustness rules need no source.
public class CutExportTests
{
    private const string Head = "time (s),A520,A600\n0,0.50,0.10\n1,0.40,0.20\n2,0.30,0.30\n";

    [Fact]
    public void A_last_row_with_fewer_cells_and_no_line_break_is_a_located_error()
    {
        var p = Rejects(Head + "3,0.2");
        Assert.Equal(("run.csv", 5, 6), (p.File, p.Line, p.Column)); // just past the end of "3,0.2"
        Assert.Equal("a last row of 2 cells with no line break after it", p.Found);
        Assert.Equal("3 cells, as in the header on line 1", p.Expected);
        Assert.Contains("cut off", p.Hint);
        Assert.Contains("ingest.cut_last_row", p.Hint);
    }

    [Fact]
    public void A_short_last_row_followed_only_by_blank_lines_is_also_cut()
    {
        var p = Rejects(Head + "3,0.2\n\n");
        Assert.Equal((5, 6), (p.Line, p.Column));
        Assert.Equal("a last row of 2 cells", p.Found);
    }

    [Fact]
    public void A_short_row_inside_the_file_stays_a_ragged_row_error()
    {
        var p = Rejects("time (s),A520,A600\n0,0.5,0.1\n1,0.4\n2,0.3,0.3\n3,0.2,0.4\n");
        Assert.Equal((3, 6), (p.Line, p.Column));
        Assert.Equal("2 cells", p.Found);
    }

    [Theory]
    [InlineData("3,0.2,0.", "\"0.\"")]
    [InlineData("3,0.2,12.", "\"12.\"")]
    [InlineData("3,0.2,1.2e", "\"1.2e\"")]
    [InlineData("3,0.2,1.2E-", "\"1.2E-\"")]
    [InlineData("3,0.2,-", "\"-\"")]
    public void A_number_cut_short_at_the_very_end_of_the_file_is_a_located_error(string last, string quoted)
    {
        var p = Rejects(Head + last);
        Assert.Equal(5, p.Line);
        Assert.Equal(7, p.Column); // the third cell starts at character 7 of "3,0.2,…"
        Assert.Equal($"{quoted} at the very end of the file (no line break after it), a number cut short", p.Found);
        Assert.Equal("a complete number in the last cell", p.Expected);
    }

    [Fact]
    public void An_empty_last_cell_at_the_very_end_of_the_file_is_cut()
    {
        var p = Rejects(Head + "3,0.2,");
        Assert.Equal((5, 7), (p.Line, p.Column));
        Assert.Contains("an empty last cell at the very end of the file", p.Found);
    }

    [Fact]
    public void A_decimal_comma_cut_short_is_caught_too()
    {
        var p = Rejects("t (s);A520\n0;0,50\n1;0,40\n2;0,30\n3;0,");
        Assert.Equal((5, 3), (p.Line, p.Column));
        Assert.StartsWith("\"0,\" at the very end of the file", p.Found);
    }

    [Fact]
    public void The_same_numbers_followed_by_a_line_break_are_whole()
    {
        // "12." is a complete number (NumberStyles.Float accepts it); only at an unterminated end is it taken as cut.
        var run = Read(Head + "3,0.2,12.\n");
        Assert.Equal(12.0, run.Channels.Single(c => c.Name == "A600").Values[^1]);
    }

    [Fact]
    public void A_complete_last_row_without_a_line_break_is_read()
    {
        var run = Read(Head + "3,0.2,0.4");
        Assert.Equal(4, run.Channels[0].Count);
        Assert.Equal(0.4, run.Channels.Single(c => c.Name == "A600").Values[^1]);
        Assert.Empty(run.Warnings);
    }

    [Theory]
    [InlineData("3,0.2")]
    [InlineData("3,0.2,1.2e")]
    public void With_cut_last_row_drop_the_row_is_left_out_with_a_located_warning(string last)
    {
        var run = Read(Head + last, new IngestSettings { CutLastRow = "drop" });
        Assert.Equal(3, run.Channels[0].Count);
        Assert.Equal([0.0, 1.0, 2.0], run.Channels[0].Times);
        var w = Assert.Single(run.Warnings, w => w.Code == "cut-last-row");
        Assert.StartsWith("run.csv:5:", w.Where);
        Assert.Contains("the row on line 5 was left out", w.Message);
    }

    [Fact]
    public void Drop_does_not_hide_a_short_row_inside_the_file()
    {
        var p = Rejects("time (s),A520,A600\n0,0.5,0.1\n1,0.4\n2,0.3,0.3\n3,0.2,0.4\n", new IngestSettings { CutLastRow = "drop" });
        Assert.Equal((3, 6), (p.Line, p.Column));
    }

    [Fact]
    public void The_cut_last_row_key_takes_error_or_drop_and_a_bad_value_is_located_at_it()
    {
        Assert.Equal("drop", TraceKin.Analysis.SeriesConfig.FromText("[ingest]\ncut_last_row = \"drop\"\n", "series.toml").Ingest.CutLastRow);
        Assert.Equal("error", TraceKin.Analysis.SeriesConfig.FromText("", "series.toml").Ingest.CutLastRow);
        var p = Assert.Throws<InputException>(() => TraceKin.Analysis.SeriesConfig.FromText("[ingest]\ncut_last_row = \"repair\"\n", "series.toml")).Problem;
        Assert.Equal(("series.toml", 2, 1, "ingest.cut_last_row"), (p.File, p.Line, p.Column, p.Key));
    }

    [Fact]
    public void Fast_rows_and_the_general_path_agree_on_cut_files()
    {
        var rows = new StringBuilder("time (s),A520\n");
        for (var k = 0; k < 50; k++) rows.Append(string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{k},{0.9 - k * 0.01:0.000}\n"));
        foreach (var tail in new[] { "50,0.4", "50,0.", "50,4e", "50", "50,0.4\n" })
        {
            var bytes = Encoding.UTF8.GetBytes(rows + tail);
            Problem? fast = null, slow = null;
            try { ExportReader.FromBytes(bytes, "run.csv", IngestSettings.Default, fastRows: true); }
            catch (InputException ex) { fast = ex.Problem; }
            try { ExportReader.FromBytes(bytes, "run.csv", IngestSettings.Default, fastRows: false); }
            catch (InputException ex) { slow = ex.Problem; }
            Assert.Equal(slow, fast);
            Assert.Equal(tail is "50,0.4" or "50,0.4\n", fast is null);
            if (fast is not null) Assert.Equal(52, fast.Line);
        }
    }

    [Theory]
    [InlineData("12.", true)]
    [InlineData("12,", true)]
    [InlineData("1.2e", true)]
    [InlineData("1.2e+", true)]
    [InlineData("-1e-", true)]
    [InlineData("+", true)]
    [InlineData("", true)]
    [InlineData("12", false)]
    [InlineData("1.2", false)]
    [InlineData("1.2e5", false)]
    [InlineData("1.2.", false)]
    [InlineData("e", false)]
    [InlineData("note", false)]
    public void A_cut_number_is_digits_then_a_separator_or_exponent_mark_with_nothing_after(string cell, bool cut) =>
        Assert.Equal(cut, RowReaderCut(cell));

    private static bool RowReaderCut(string cell) => RowReader.IsCutNumber(Encoding.ASCII.GetBytes(cell));
}
