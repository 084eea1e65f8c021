using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// Huge and subnormal readings (invented exports). A huge reading is refused where it stands, with its line and column,
// instead of overflowing much later in a fit that knows no line numbers. A subnormal number is a valid double close to
// zero and is read as it is.
public class NumberRangeTests
{
    [Theory]
    [InlineData("1e308")]
    [InlineData("-1.7976931348623157e308")]
    [InlineData("2e101")]
    public void A_reading_beyond_1e100_is_refused_at_its_cell(string cell)
    {
        var p = Rejects($"time (s),A520\n0,0.8\n1,0.7\n2,{cell}\n3,0.5\n");
        Assert.Equal(("run.csv", 4, 3), (p.File, p.Line, p.Column));
        Assert.Equal($"\"{cell}\", a number beyond ±1e100", p.Found);
        Assert.Equal("a reading of magnitude at most 1e100", p.Expected);
    }

    [Fact]
    public void A_time_beyond_1e100_seconds_is_refused_at_its_cell()
    {
        var p = Rejects("time (s),A520\n0,0.8\n1,0.7\n1e300,0.6\n");
        Assert.Equal((4, 1), (p.Line, p.Column));
        Assert.Contains("beyond ±1e100", p.Found);
    }

    [Fact]
    public void A_subnormal_reading_is_read_as_the_double_it_is()
    {
        // 4.9e-324 rounds to the smallest positive subnormal double, double.Epsilon (IEEE 754 binary64).
        var run = Read("time (s),A520\n0,0.8\n1,4.9e-324\n2,0.6\n3,0.5\n");
        Assert.Equal(double.Epsilon, run.Channels[0].Values[1]);
    }

    [Fact]
    public void Exactly_1e100_is_still_accepted()
    {
        var run = Read("time (s),A520\n0,0.8\n1,1e100\n2,0.6\n3,0.5\n");
        Assert.Equal(1e100, run.Channels[0].Values[1]);
    }
}

public class SaturatedChannelTests
{
    [Fact]
    public void A_channel_saturated_almost_throughout_is_refused_at_its_header()
    {
        // Invented export: two readings, then the detector's ceiling (3.2 AU) for every later row.
        var p = Rejects("# photometer\ntime (s),A520\n0,1.1\n1,2.0\n2,3.2\n3,3.2\n4,3.2\n5,3.2\n");
        Assert.Equal(("run.csv", 2, 10), (p.File, p.Line, p.Column));
        Assert.Equal("channel \"A520\" with 4 of its 6 readings stuck at the detector's ceiling, leaving 2", p.Found);
        Assert.Equal("at least 3 readings below saturation", p.Expected);
    }
}
