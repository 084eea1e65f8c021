using TraceKin.Ingest;
using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// Expected seconds are plain arithmetic on the clock readings written in each inline export
// (1 min = 60 s, 1 h = 3600 s: SI Brochure 9th ed., Table 8). ISO 8601-1:2019 §5.4 defines the date-time forms read here.
public class TimeColumnTests
{
    [Theory]
    [InlineData("time (s)", "0,1.5,3", 1.5)]
    [InlineData("t [ms]", "0,1500,3000", 1.5)]
    [InlineData("Time/ms", "0,1500,3000", 1.5)]
    [InlineData("t (min)", "0,0.025,0.05", 1.5)]
    [InlineData("time (h)", "0,0.000416666666666667,0.000833333333333333", 1.5)]
    public void Numeric_time_units_convert_to_seconds(string header, string times, double second)
    {
        var t = times.Split(',');
        var run = Read($"{header};A520\n{t[0]};0,5\n{t[1]};0,4\n{t[2]};0,3\n".Replace(".", ","));
        Assert.Equal(second, run.Channels[0].Times[1], 9);
    }

    [Fact]
    public void Minutes_and_seconds_with_minutes_past_59_are_read()
    {
        var run = Read("time (mm:ss),A520\n59:59.5,0.5\n60:00.0,0.4\n125:30.25,0.3\n");
        // 59:59.5 is the first sample: zero. 60:00 is 0.5 s later; 125:30.25 is 7530.25 − 3599.5 s later.
        Assert.Equal([0.0, 0.5, 3930.75], run.Channels[0].Times);
        Assert.Equal("\"time (mm:ss)\" (mm:ss (minutes and seconds))", Detected(run, "time column"));
    }

    [Fact]
    public void Clock_readings_without_a_unit_are_recognised_from_the_cells()
    {
        var run = Read("time,A520\n00:00:00,0.5\n00:59:59.5,0.4\n25:00:00,0.3\n");
        Assert.Equal([0.0, 3599.5, 90000], run.Channels[0].Times);
    }

    [Fact]
    public void Iso_date_times_with_offsets_crossing_midnight_become_seconds_from_the_first_sample()
    {
        var run = Read("timestamp,A520\n2026-03-01T23:59:50+01:00,0.5\n2026-03-02T00:00:10+01:00,0.4\n2026-03-01T23:00:30Z,0.3\n");
        // 23:00:30Z is 00:00:30+01:00 the next day: 40 s after the first sample.
        Assert.Equal([0.0, 20, 40], run.Channels[0].Times);
        Assert.Equal("first sample (line 2)", Detected(run, "time zero"));
    }

    [Fact]
    public void Mixed_at_in_the_preamble_sets_time_zero_for_date_times()
    {
        var run = Read("mixed at: 2026-03-01T10:00:00Z\ntimestamp;A520\n2026-03-01T10:00:05Z;0,5\n2026-03-01T10:00:15.5Z;0,4\n2026-03-01T10:01:00Z;0,3\n");
        Assert.Equal([5.0, 15.5, 60], run.Channels[0].Times);
        Assert.Equal("\"mixed at\" on line 1 (2026-03-01T10:00:00Z)", Detected(run, "time zero"));
    }

    [Fact]
    public void A_t0_key_with_its_own_unit_sets_time_zero_for_numeric_times()
    {
        var run = Read("t0 = 0.5 min\ntime (s),A520\n10,0.5\n30,0.4\n50,0.3\n");
        Assert.Equal([-20.0, 0, 20], run.Channels[0].Times);
    }

    [Fact]
    public void Time_zero_from_the_first_sample_can_be_forced()
    {
        var run = Read("t0: 5\ntime (s),A520\n10,0.5\n30,0.4\n50,0.3\n", new IngestSettings { TimeZero = "first-sample" });
        Assert.Equal([0.0, 20, 40], run.Channels[0].Times);
    }

    [Fact]
    public void An_unreadable_time_zero_is_an_error_at_its_preamble_line()
    {
        var p = Rejects("sample: x\nmixed at: soon\ntime (s),A520\n10,0.5\n30,0.4\n50,0.3\n");
        Assert.Equal(2, p.Line);
        Assert.Contains("soon", p.Found);
    }

    [Fact]
    public void Time_zero_required_from_metadata_but_absent_is_a_setting_error()
    {
        var p = Rejects("time (s),A520\n10,0.5\n30,0.4\n50,0.3\n", new IngestSettings { TimeZero = "metadata" });
        Assert.Equal("ingest.time_zero", p.Key);
    }

    [Fact]
    public void A_time_column_without_a_unit_is_rejected_because_seconds_and_minutes_look_alike()
    {
        var p = Rejects("time,A520\n0,0.5\n1,0.4\n2,0.3\n");
        Assert.Equal(1, p.Line);
        Assert.Contains("without a unit", p.Found);
    }

    [Fact]
    public void Times_that_go_backwards_are_an_error_naming_both_lines()
    {
        var p = Rejects("time (s),A520\n0,0.5\n2,0.4\n1,0.3\n3,0.2\n");
        Assert.Equal(4, p.Line);
        Assert.Equal(1, p.Column);
        Assert.Contains("line 3", p.Found);
    }

    [Fact]
    public void A_duplicated_time_is_an_error_by_default_with_a_hint_to_the_repair()
    {
        var p = Rejects("time (s),A520\n0,0.5\n1,0.4\n1,0.38\n2,0.3\n");
        Assert.Equal(4, p.Line);
        Assert.Contains("line 3", p.Found);
        Assert.Contains("duplicate_times", p.Hint);
    }

    [Fact]
    public void Duplicated_times_are_averaged_when_settings_allow_and_the_repair_is_a_warning()
    {
        var run = Read("time (s),A520\n0,0.5\n1,0.4\n1,0.38\n1,0.36\n2,0.3\n", new IngestSettings { DuplicateTimes = "average" });
        Assert.Equal([0.0, 1, 2], run.Channels[0].Times);
        Assert.Equal(0.38, run.Channels[0].Values[1], 12); // (0.40 + 0.38 + 0.36) / 3
        var w = Assert.Single(run.Warnings);
        Assert.Equal("duplicate-times", w.Code);
        Assert.Contains("lines 4, 5", w.Message);
    }

    [Fact]
    public void Duplicated_times_keep_the_first_row_when_settings_say_first()
    {
        var run = Read("time (s),A520\n0,0.5\n1,0.4\n1,0.38\n2,0.3\n", new IngestSettings { DuplicateTimes = "first" });
        Assert.Equal([0.5, 0.4, 0.3], run.Channels[0].Values);
        Assert.Contains("line 4", Assert.Single(run.Warnings).Message);
    }

    [Fact]
    public void A_bad_clock_reading_is_a_located_error()
    {
        var p = Rejects("time (mm:ss),A520\n00:00,0.5\n00:61,0.4\n01:02,0.3\n");
        Assert.Equal(3, p.Line);
        Assert.Contains("00:61", p.Found);
    }
}
