using TraceKin.Ingest;
using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// Saturation: photometers report a flat ceiling when stray light dominates (common practice, no source);
// the plateaus here are invented round-trip data.
public class ValueCellTests
{
    [Theory]
    [InlineData("NaN")]
    [InlineData("Infinity")]
    [InlineData("-inf")]
    public void Not_a_number_and_infinity_cells_are_located_errors(string cell)
    {
        var p = Rejects($"time (s),A520\n0,0.5\n1,{cell}\n2,0.3\n");
        Assert.Equal(3, p.Line);
        Assert.Equal(3, p.Column);
        Assert.Equal("a finite number", p.Expected);
    }

    [Fact]
    public void A_blank_cell_is_a_located_error()
    {
        var p = Rejects("time (s);A520;A600\n0;0,5;0,1\n1;;0,2\n2;0,3;0,3\n");
        Assert.Equal(3, p.Line);
        Assert.Equal(3, p.Column);
        Assert.Equal("an empty cell", p.Found);
    }

    [Fact]
    public void Text_in_a_numeric_cell_is_a_located_error_quoting_it()
    {
        var p = Rejects("time (s),A520\n0,0.5\n1,OVER\n2,0.3\n");
        Assert.Equal((3, 3), (p.Line, p.Column));
        Assert.Equal("\"OVER\"", p.Found);
    }

    [Fact]
    public void Column_numbers_count_characters_not_bytes_after_non_ascii_text()
    {
        var p = Rejects("time (s);T (°C);A520\n0;25,0;0,5\n1;25,0;x\n2;25,0;0,3\n");
        Assert.Equal(8, p.Column);
    }

    [Fact]
    public void A_saturated_plateau_is_excluded_and_listed_by_line_numbers()
    {
        var run = Read("time (s),A520\n0,1.2\n1,2.1\n2,3.2\n3,3.2\n4,3.2\n5,3.2\n6,2.9\n7,2.5\n");
        var a = run.Channels[0];
        Assert.Equal([0.0, 1, 6, 7], a.Times);
        var w = Assert.Single(run.Warnings);
        Assert.Equal("saturated-absorbance", w.Code);
        Assert.Contains("lines 4–7", w.Message);
        Assert.Equal("run.csv:4", w.Where);
    }

    [Fact]
    public void A_flat_end_below_the_saturation_threshold_is_kept()
    {
        var run = Read("time (s),A520\n0,0.2\n1,0.9\n2,1.1\n3,1.1\n4,1.1\n5,1.1\n");
        Assert.Equal(6, run.Channels[0].Count);
        Assert.Empty(run.Warnings);
    }

    [Fact]
    public void Saturation_check_can_be_turned_off()
    {
        var run = Read("time (s),A520\n0,1.2\n1,3.2\n2,3.2\n3,3.2\n4,3.2\n", new IngestSettings { SaturationAbsorbance = 0 });
        Assert.Equal(5, run.Channels[0].Count);
    }

    [Fact]
    public void A_constant_signal_is_rejected_when_it_is_the_only_channel()
    {
        var p = Rejects("time (s),V (mL)\n0,1.5\n1,1.5\n2,1.5\n");
        Assert.Equal(2, p.Line);
        Assert.Contains("constant", p.Found);
    }

    [Fact]
    public void A_constant_channel_beside_a_changing_one_is_a_warning()
    {
        var run = Read("time (s),A430,A520\n0,0.5,0.1\n1,0.5,0.2\n2,0.5,0.3\n");
        Assert.Equal("constant-signal", Assert.Single(run.Warnings).Code);
    }

    [Fact]
    public void Long_mantissas_and_large_exponents_are_parsed_exactly_like_the_runtime()
    {
        // double.Parse under the invariant culture (.NET runtime, IEEE 754 round-to-nearest) is the reference
        // (readings beyond 1e100 are refused, see NumberRangeTests).
        string[] cells = ["0.1234567890123456789", "9.999999999999999e99", "4.9e-324", "123456789012345678901234", "-0.000000000000000000000000001"];
        var text = "time (s),A520\n" + string.Join("\n", cells.Select((c, i) => $"{i},{c}")) + "\n";
        var run = Read(text, new IngestSettings { SaturationAbsorbance = 0 });
        for (var i = 0; i < cells.Length; i++)
            Assert.Equal(double.Parse(cells[i], System.Globalization.CultureInfo.InvariantCulture), run.Channels[0].Values[i]);
    }

    [Fact]
    public void Fast_number_path_agrees_with_the_runtime_parser_on_random_short_decimals()
    {
        // Clinger (1990) fast path against double.Parse (.NET runtime) as the reference: 20,000 random cells, fixed seed.
        var rng = new Random(20261201);
        for (var k = 0; k < 20_000; k++)
        {
            var digits = rng.Next(1, 16);
            var mantissa = (long)(rng.NextDouble() * Math.Pow(10, digits));
            var exponent = rng.Next(-25, 25);
            var s = $"{(rng.Next(2) == 0 ? "-" : "")}{mantissa}e{exponent}";
            var bytes = System.Text.Encoding.ASCII.GetBytes(s);
            Assert.Equal(NumberStatus.Ok, NumberCell.TryParse(bytes, (byte)'.', out var v));
            Assert.Equal(double.Parse(s, System.Globalization.CultureInfo.InvariantCulture), v);
        }
    }
}
