using TraceKin.Ingest;
using TraceKin.Traces;
using Xunit.Abstractions;

namespace TraceKin.Tests.Analysis;

// Every file a series names is read only when it is a regular file inside the series folder (symbolic links
// followed), checked from its metadata before anything is opened. Each refusal is located at the plan cell that
// names the file, and the other runs of the batch are still analysed. Robustness tests: no source needed.
public sealed class InputFolderTests(ITestOutputHelper output) : IDisposable
{
    private readonly ProbeSeries _s = new();

    public void Dispose() => _s.Dispose();

    private static Problem Refused(TraceKin.Analysis.SeriesResult result, string file)
    {
        ProbeSeries.AssertGoodRunsAnalysed(result);
        return Assert.Single(result.Rejected, p => p.Input == file);
    }

    [Fact]
    public void A_plan_path_that_climbs_out_of_the_folder_is_refused_at_its_cell()
    {
        _s.Plan("../outside/secret.csv");
        var p = Refused(_s.Analyse(), "../outside/secret.csv");
        // row "R005,../outside/secret.csv,…" is line 6; the file cell starts at character 6
        Assert.Equal(("plan.csv", 6, 6), (p.File, p.Line, p.Column));
        Assert.Equal($"\"../outside/secret.csv\", a path that resolves to {_s.Secret}, outside the series folder {_s.Folder}", p.Found);
        Assert.Equal("a file inside the series folder", p.Expected);
        Assert.Contains("--allow-outside-files", p.Hint);
    }

    [Fact]
    public void An_absolute_plan_path_is_refused_at_its_cell()
    {
        _s.Plan(_s.Secret);
        var p = Refused(_s.Analyse(), _s.Secret);
        Assert.Equal((6, 6), (p.Line, p.Column));
        // the cell is quoted (at most 60 characters); the path it resolves to is given in full
        Assert.StartsWith($"{Fail.Quote(_s.Secret)}, an absolute path that resolves to {_s.Secret}, outside the series folder", p.Found);
    }

    [Fact]
    public void A_symbolic_link_to_a_file_outside_is_refused()
    {
        File.CreateSymbolicLink(Path.Combine(_s.Folder, "r005.csv"), _s.Secret);
        _s.Plan("r005.csv");
        var p = Refused(_s.Analyse(), "r005.csv");
        Assert.Equal($"\"r005.csv\", a path through a symbolic link that resolves to {_s.Secret}, outside the series folder {_s.Folder}", p.Found);
    }

    [Fact]
    public void A_symbolic_link_to_a_folder_outside_is_refused()
    {
        Directory.CreateSymbolicLink(Path.Combine(_s.Folder, "shared"), _s.Outside);
        _s.Plan("shared/secret.csv");
        var p = Refused(_s.Analyse(), "shared/secret.csv");
        Assert.StartsWith("\"shared/secret.csv\", a path through a symbolic link that resolves to " + _s.Secret, p.Found);
    }

    [Fact]
    public void A_symbolic_link_that_stays_inside_the_folder_is_read()
    {
        Directory.CreateDirectory(Path.Combine(_s.Folder, "raw"));
        _s.Write("raw/run5.csv", _s.ExportText());
        File.CreateSymbolicLink(Path.Combine(_s.Folder, "r005.csv"), "raw/run5.csv");
        _s.Plan("r005.csv");
        var result = _s.Analyse();
        Assert.Empty(result.Rejected);
        Assert.Equal(ProbeSeries.GoodRuns + 1, result.Runs.Count);
    }

    [Fact]
    public void The_opt_in_reads_files_outside_the_folder()
    {
        File.CreateSymbolicLink(Path.Combine(_s.Folder, "r005.csv"), _s.Secret);
        _s.Plan("r005.csv", "../outside/secret.csv");
        var result = _s.Analyse(allowOutside: true);
        Assert.Empty(result.Rejected);
        Assert.Equal(["R005", "R006"], result.Runs.Select(r => r.Id).Skip(ProbeSeries.GoodRuns));
    }

    [Fact]
    public void A_named_pipe_in_the_plan_is_refused_without_being_opened()
    {
        var fifo = ProbeSeries.MakeFifo(Path.Combine(_s.Folder, "r005.csv"), out var reason);
        if (fifo is null)
        {
            Assert.True(Environment.GetEnvironmentVariable("CI") is null, $"cannot make a FIFO: {reason}; CI requires this check");
            output.WriteLine($"FIFO check not run: {reason}");
            return;
        }
        _s.Plan("r005.csv");
        var p = Refused(_s.AnalyseGuarded(fifoToRelease: fifo), "r005.csv");
        Assert.Equal((6, 6), (p.Line, p.Column));
        Assert.Equal($"\"r005.csv\", a named pipe (FIFO) ({fifo})", p.Found);
        Assert.Equal("a regular file", p.Expected);
    }

    [Fact]
    public void A_named_pipe_as_plan_csv_is_refused_without_being_opened()
    {
        File.Delete(Path.Combine(_s.Folder, "plan.csv"));
        var fifo = ProbeSeries.MakeFifo(Path.Combine(_s.Folder, "plan.csv"), out var reason);
        if (fifo is null)
        {
            Assert.True(Environment.GetEnvironmentVariable("CI") is null, $"cannot make a FIFO: {reason}; CI requires this check");
            output.WriteLine($"FIFO check not run: {reason}");
            return;
        }
        var p = Assert.Single(_s.AnalyseGuarded(fifoToRelease: fifo).Rejected);
        Assert.Equal(("plan.csv", 1, 1), (p.File, p.Line, p.Column));
        Assert.StartsWith("\"plan.csv\", a named pipe (FIFO)", p.Found);
    }

    [Fact]
    public void A_device_is_refused_as_outside_and_with_the_opt_in_as_not_a_regular_file()
    {
        if (!File.Exists("/dev/zero"))
        {
            output.WriteLine("device check not run: this system has no /dev/zero");
            return;
        }
        _s.Plan("/dev/zero");
        var outside = Refused(_s.AnalyseGuarded(), "/dev/zero");
        Assert.StartsWith("\"/dev/zero\", an absolute path that resolves to /dev/zero, outside the series folder", outside.Found);
        var device = Refused(_s.AnalyseGuarded(allowOutside: true), "/dev/zero");
        Assert.Equal("\"/dev/zero\", a character device (/dev/zero)", device.Found);
        Assert.Equal("a regular file", device.Expected);
    }

    [Fact]
    public void A_file_larger_than_the_limit_is_refused_from_its_size_before_reading()
    {
        // a sparse file: its metadata says 1 GiB + 1 byte, no disk space is used and nothing is read
        using (var fs = new FileStream(Path.Combine(_s.Folder, "r005.csv"), FileMode.CreateNew)) fs.SetLength(ExportReader.MaxBytes + 1);
        _s.Plan("r005.csv");
        var p = Refused(_s.Analyse(), "r005.csv");
        Assert.Equal("\"r005.csv\", a file of 1,073,741,825 bytes", p.Found);
        Assert.Equal("at most 1,073,741,824 bytes", p.Expected);
    }

    [Fact]
    public void A_folder_named_as_an_export_is_refused()
    {
        Directory.CreateDirectory(Path.Combine(_s.Folder, "r005"));
        _s.Plan("r005");
        Assert.Equal("\"r005\", a folder", Refused(_s.Analyse(), "r005").Found);
    }

    [Fact]
    public void A_missing_export_is_located_at_its_plan_cell()
    {
        _s.Plan("r005.csv");
        var p = Refused(_s.Analyse(), "r005.csv");
        Assert.Equal(("plan.csv", 6, 6), (p.File, p.Line, p.Column));
        Assert.StartsWith("\"r005.csv\": no such file", p.Found);
    }

    [Fact]
    public void An_export_cut_off_in_its_last_row_is_rejected_and_the_batch_goes_on()
    {
        var text = _s.ExportText().TrimEnd('\n');
        var lines = text.Split('\n');
        _s.Write("r005.csv", text[..text.LastIndexOf(',')]); // the last row loses its value cell and its line break
        _s.Plan("r005.csv");
        var result = _s.Analyse();
        ProbeSeries.AssertGoodRunsAnalysed(result);
        var p = Assert.Single(result.Rejected);
        Assert.Equal(("r005.csv", lines.Length), (p.File, p.Line));
        Assert.Equal("a last row of 1 cell with no line break after it", p.Found);
    }

    [Fact]
    public void An_export_cut_off_in_its_last_number_is_rejected_and_the_batch_goes_on()
    {
        var text = _s.ExportText().TrimEnd('\n');
        var lines = text.Split('\n');
        var cut = text[..(text.LastIndexOf('.') + 1)]; // "…,0." : the file ends just after a decimal point
        _s.Write("r005.csv", cut);
        _s.Plan("r005.csv");
        var result = _s.Analyse();
        ProbeSeries.AssertGoodRunsAnalysed(result);
        var p = Assert.Single(result.Rejected);
        Assert.Equal(("r005.csv", lines.Length, lines[^1].IndexOf(',') + 2), (p.File, p.Line, p.Column));
        Assert.EndsWith("a number cut short", p.Found);
    }

    private string CalibratedToml(string file)
    {
        var toml = TraceKin.Tests.Watch.SeriesFixture.GoodToml.Replace("kind = \"absorbance\"", "kind = \"calibrated\"", StringComparison.Ordinal);
        foreach (var key in new[] { "molar_absorptivity = 1480\n", "path_length = 1.0\n", "blank = 0.045\n" })
            toml = toml.Replace(key, "", StringComparison.Ordinal);
        File.WriteAllText(Path.Combine(_s.Outside, "std.csv"), "signal,[complex] (mmol/L)\n0.003,0\n0.205,1\n0.398,2\n0.607,3\n0.801,4\n");
        return toml + $"\n[signal.calibration]\nfile = \"{file}\"\n";
    }

    [Fact]
    public void A_calibration_file_outside_the_folder_is_refused_at_its_value_in_series_toml()
    {
        var toml = CalibratedToml("../outside/std.csv");
        _s.Write("series.toml", toml);
        var p = Assert.Single(_s.Analyse().Rejected);
        var lines = toml.Split('\n');
        var line = Array.FindIndex(lines, l => l.StartsWith("file = ", StringComparison.Ordinal)) + 1;
        Assert.Equal(("series.toml", line, 8, "signal.calibration.file"), (p.File, p.Line, p.Column, p.Key));
        Assert.StartsWith("\"../outside/std.csv\", a path that resolves to ", p.Found);
        Assert.Contains("outside the series folder", p.Found);
    }

    [Fact]
    public void A_calibration_file_outside_is_read_with_the_opt_in()
    {
        _s.Write("series.toml", CalibratedToml("../outside/std.csv"));
        Assert.DoesNotContain(_s.Analyse(allowOutside: true).Rejected, p => p.File == "series.toml");
    }

    [Fact]
    public void A_series_folder_reached_through_a_link_still_reads_its_own_files()
    {
        // the folder is compared by its real path too, so a link to the whole series is not "outside"
        var link = Path.Combine(_s.Root, "series-link");
        Directory.CreateSymbolicLink(link, _s.Folder);
        var result = TraceKin.Analysis.SeriesRunner.Analyse(link, new TraceKin.Analysis.AnalysisOptions { Workers = 1 });
        Assert.Empty(result.Rejected);
        Assert.Equal(ProbeSeries.GoodRuns, result.Runs.Count);
    }
}
