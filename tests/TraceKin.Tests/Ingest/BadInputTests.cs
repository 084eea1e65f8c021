using System.Text;
using TraceKin.Traces;
using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// Each bad export must give one located message (file, 1-based line and column, found, expected, hint)
// and never a stack trace, a hang or unbounded memory. The inputs are invented.
public class BadInputTests
{
    [Fact]
    public void Empty_file_is_rejected_at_line_1()
    {
        var p = RejectsBytes([]);
        Assert.Equal(("run.csv", 1, 1), (p.File, p.Line, p.Column));
        Assert.Equal("an empty file", p.Found);
    }

    [Fact]
    public void Blank_only_file_is_rejected()
    {
        var p = Rejects("\n\n   \n");
        Assert.Equal(1, p.Line);
    }

    [Fact]
    public void Header_only_file_is_rejected_after_the_header()
    {
        var p = Rejects("# note\ntime (s),A520\n");
        Assert.Equal(2, p.Line);
        Assert.Contains("no data rows", p.Found);
    }

    [Fact]
    public void Binary_file_with_nul_bytes_is_rejected_at_the_first_nul()
    {
        var p = RejectsBytes([0x50, 0x4B, 0x03, 0x04, 0x0A, 0x41, 0x00, 0x01]);
        Assert.Equal((2, 2), (p.Line, p.Column));
        Assert.Equal("a NUL byte", p.Found);
    }

    [Fact]
    public void Truncated_last_row_is_a_cut_row_error_with_a_hint()
    {
        var p = Rejects("time (s),A520,A600\n0,0.5,0.1\n1,0.4,0.2\n2,0.3");
        Assert.Equal(4, p.Line);
        Assert.Equal(6, p.Column); // just past the end of the short row
        Assert.Equal("a last row of 2 cells with no line break after it", p.Found);
        Assert.Contains("3 cells", p.Expected);
        Assert.Contains("cut off", p.Hint);
    }

    [Fact]
    public void Ragged_row_with_an_extra_cell_is_located_at_the_extra_cell()
    {
        var p = Rejects("time (s),A520\n0,0.5\n1,0.4,7\n2,0.3\n");
        Assert.Equal((3, 7), (p.Line, p.Column));
    }

    [Fact]
    public void Ten_megabyte_line_is_rejected_quickly_without_reading_it_as_a_header()
    {
        var big = new string('7', 10 * 1024 * 1024);
        var started = System.Diagnostics.Stopwatch.StartNew();
        var p = Rejects("time (s),A520\n0,0.5\n1," + big + "\n2,0.3\n");
        Assert.Equal(3, p.Line);
        Assert.Contains("bytes", p.Found);
        Assert.True(started.Elapsed < TimeSpan.FromSeconds(20), "must not hang"); // a generous guard, not a speed target
    }

    [Theory]
    [InlineData("time (s),A520\n0,0.5\n")]
    [InlineData("time (s),A520\n0,0.5\n1,0.4\n")]
    public void One_or_two_points_are_not_a_time_course(string text)
    {
        var p = Rejects(text);
        Assert.Contains("data row", p.Found);
        Assert.Contains("at least 3", p.Expected);
        Assert.True(p.Line >= 2);
    }

    [Fact]
    public void Zero_time_span_is_rejected()
    {
        var p = Rejects("time (s),A520\n5,0.5\n5,0.4\n5,0.3\n", new TraceKin.Ingest.IngestSettings { DuplicateTimes = "average" });
        Assert.Contains("1 data row", p.Found);
    }

    [Fact]
    public void Data_before_any_header_is_rejected()
    {
        var p = Rejects("0,0.5\n1,0.4\n2,0.3\n");
        Assert.Equal(1, p.Line);
        Assert.Contains("before any header", p.Found);
    }

    [Fact]
    public void Unclosed_quote_is_located()
    {
        var p = Rejects("time (s),A520\n0,0.5\n1,\"0.4\n2,0.3\n");
        Assert.Equal((3, 3), (p.Line, p.Column));
    }

    [Fact]
    public void Header_with_a_single_column_is_rejected()
    {
        var p = Rejects("time (s)\n0\n1\n2\n");
        Assert.Equal(1, p.Line);
        Assert.Contains("at least one signal column", p.Expected);
    }

    [Fact]
    public void Messages_read_as_one_located_sentence()
    {
        var p = Rejects("time (s),A520\n0,0.5\n1,abc\n2,0.3\n", file: "r7.csv");
        Assert.Equal("r7.csv:3:3: found \"abc\"; expected a number with a decimal point. Hint: thousands separators and units inside cells are not accepted", p.Message);
    }

    [Fact]
    public void A_missing_file_is_an_input_error_not_an_io_exception()
    {
        var ex = Assert.Throws<InputException>(() => TraceKin.Ingest.ExportReader.FromFile("/nonexistent/r9.csv", TraceKin.Ingest.IngestSettings.Default));
        Assert.Equal("r9.csv", ex.Problem.File);
    }

    [Fact]
    public void Many_lines_of_prose_without_data_stop_at_a_bound()
    {
        var text = new StringBuilder();
        for (var i = 0; i < 100_010; i++) text.Append("words\n");
        var p = Rejects(text.ToString());
        Assert.Contains("without a data row", p.Found);
    }
}
