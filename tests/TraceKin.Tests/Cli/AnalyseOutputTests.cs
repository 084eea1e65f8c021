using TraceKin.Cli;
using TraceKin.Cli.Commands;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Cli;

// What `analyse` does with a --out it cannot or must not use: a clear message and exit 1, never a stack trace, and
// nothing written outside --out (robustness, no source needed). The series is the bundled invented sample.
public sealed class AnalyseOutputTests : IDisposable
{
    private static readonly string Sample = RepoPaths.Sample("violet-complex-acid");
    private readonly RepoPaths.TempDir _dir = new();
    private readonly RepoPaths.TempDir _elsewhere = new();

    public void Dispose()
    {
        _dir.Dispose();
        _elsewhere.Dispose();
    }

    private static (int Code, string Error) Analyse(string outDir, bool plots = true)
    {
        var error = new StringWriter();
        var code = AnalyseCommand.Run(new DirectoryInfo(Sample), new DirectoryInfo(outDir), plots, workers: 2, error: error);
        return (code, error.ToString());
    }

    private static void NoStackTrace(string error)
    {
        Assert.DoesNotContain("   at ", error, StringComparison.Ordinal);
        Assert.DoesNotContain("Exception", error, StringComparison.Ordinal);
    }

    private string[] Elsewhere() => Directory.EnumerateFileSystemEntries(_elsewhere.Path, "*", SearchOption.AllDirectories).Order(StringComparer.Ordinal).ToArray();

    [Fact]
    public void An_out_that_is_an_existing_file_is_a_usage_error_and_the_file_is_left_as_it_was()
    {
        var file = Path.Combine(_dir.Path, "results.txt");
        File.WriteAllText(file, "mine");
        var (code, error) = Analyse(file);
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains("is a file, not a folder", error, StringComparison.Ordinal);
        NoStackTrace(error);
        Assert.Equal("mine", File.ReadAllText(file));
    }

    [Fact]
    public void An_out_whose_parent_is_a_file_is_a_usage_error()
    {
        var file = Path.Combine(_dir.Path, "blocker");
        File.WriteAllText(file, "x");
        var (code, error) = Analyse(Path.Combine(file, "sub", "out"));
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains($"{file} is a file, not a folder", error, StringComparison.Ordinal);
        NoStackTrace(error);
    }

    [Fact]
    public void An_out_that_cannot_be_created_is_a_usage_error()
    {
        // /proc accepts no new folders, even from root (the tests may run as root, which ignores permissions).
        if (!Directory.Exists("/proc/self")) return;
        var (code, error) = Analyse("/proc/tracekin-cannot-be-here/out");
        Assert.Equal(ExitCodes.Usage, code);
        Assert.StartsWith("tracekin: cannot use --out /proc/tracekin-cannot-be-here/out:", error, StringComparison.Ordinal);
        NoStackTrace(error);
    }

    [Theory]
    [InlineData("summary.json")]
    [InlineData("report.html")]
    [InlineData("runs.csv")]
    [InlineData("tracekin.log")]
    public void An_output_file_that_is_a_link_is_refused_before_anything_is_written_and_its_target_is_untouched(string name)
    {
        var outDir = Path.Combine(_dir.Path, "out");
        Directory.CreateDirectory(outDir);
        var target = Path.Combine(_elsewhere.Path, "precious");
        File.WriteAllText(target, "keep");
        File.CreateSymbolicLink(Path.Combine(outDir, name), target);

        var (code, error) = Analyse(outDir);

        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains($"{Path.Combine(outDir, name)} is a symbolic link (to {target})", error, StringComparison.Ordinal);
        NoStackTrace(error);
        Assert.Equal("keep", File.ReadAllText(target));
        Assert.Equal([target], Elsewhere());
        Assert.False(File.Exists(Path.Combine(outDir, "summary.json")) && name != "summary.json");
        Assert.False(Directory.Exists(Path.Combine(outDir, "plots")));
    }

    [Fact]
    public void A_plots_folder_that_is_a_link_is_refused_and_nothing_is_written_where_it_points()
    {
        var outDir = Path.Combine(_dir.Path, "out");
        Directory.CreateDirectory(outDir);
        Directory.CreateSymbolicLink(Path.Combine(outDir, "plots"), _elsewhere.Path);

        var (code, error) = Analyse(outDir);

        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains("plots is a symbolic link", error, StringComparison.Ordinal);
        NoStackTrace(error);
        Assert.Empty(Elsewhere());
        Assert.False(File.Exists(Path.Combine(outDir, "summary.json")));
    }

    [Fact]
    public void A_linked_run_plot_inside_plots_is_refused_and_its_target_is_untouched()
    {
        var outDir = Path.Combine(_dir.Path, "out");
        Directory.CreateDirectory(Path.Combine(outDir, "plots"));
        var target = Path.Combine(_elsewhere.Path, "secret.png");
        File.WriteAllText(target, "keep");
        File.CreateSymbolicLink(Path.Combine(outDir, "plots", "run-R1.png"), target);

        var (code, error) = Analyse(outDir);

        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains("run-R1.png is a symbolic link", error, StringComparison.Ordinal);
        Assert.Equal("keep", File.ReadAllText(target));
    }

    [Fact]
    public void A_folder_where_report_html_goes_is_refused_before_anything_is_written()
    {
        var outDir = Path.Combine(_dir.Path, "out");
        Directory.CreateDirectory(Path.Combine(outDir, "report.html"));
        var (code, error) = Analyse(outDir);
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Contains("report.html is a folder where TraceKin writes a file", error, StringComparison.Ordinal);
        Assert.False(File.Exists(Path.Combine(outDir, "summary.json")));
    }

    [Fact]
    public void A_run_plot_that_cannot_be_written_gives_exit_1_and_every_other_output_is_still_written()
    {
        var outDir = Path.Combine(_dir.Path, "out");
        Directory.CreateDirectory(Path.Combine(outDir, "plots", "run-R2.png")); // a folder where the picture goes
        var (code, error) = Analyse(outDir);
        Assert.Equal(ExitCodes.CannotWrite, code);
        Assert.Contains("1 output file(s) could not be written", error, StringComparison.Ordinal);
        NoStackTrace(error);
        foreach (var f in new[] { "summary.json", "runs.csv", "report.html", "plots/run-R1.png", "plots/run-R8.png", "plots/orders.png" })
            Assert.True(File.Exists(Path.Combine(outDir, f)), f);
        Assert.Contains("run-R2.png is a folder where TraceKin writes a file", File.ReadAllText(Path.Combine(outDir, AnalyseCommand.LogFile)), StringComparison.Ordinal);
    }

    [Fact]
    public void An_analysis_into_an_out_whose_lock_is_held_is_refused_naming_the_holder_and_writes_nothing()
    {
        var outDir = Path.Combine(_dir.Path, "out");
        using (var held = OutputLock.TryTake(outDir, "analyse", out _))
        {
            Assert.NotNull(held);
            var (code, error) = Analyse(outDir);
            Assert.Equal(ExitCodes.Usage, code);
            Assert.Contains($"another tracekin (process {Environment.ProcessId}, tracekin analyse) is already writing to {outDir}", error, StringComparison.Ordinal);
            NoStackTrace(error);
            Assert.False(File.Exists(Path.Combine(outDir, "summary.json")));
            Assert.False(File.Exists(Path.Combine(outDir, AnalyseCommand.LogFile)));
        }
        Assert.Equal(ExitCodes.Ok, Analyse(outDir, plots: false).Code);
    }

    [Fact]
    public void Two_analyses_into_the_same_out_at_once_never_leave_a_mixed_result_set_or_a_lost_log()
    {
        var reference = Path.Combine(_dir.Path, "reference");
        Assert.Equal(ExitCodes.Ok, Analyse(reference).Code);
        var outDir = Path.Combine(_dir.Path, "shared");
        using var start = new Barrier(2);
        var results = new (int Code, string Error)[2];
        var threads = Enumerable.Range(0, 2).Select(i => new Thread(() =>
        {
            start.SignalAndWait();
            results[i] = Analyse(outDir);
        })).ToList();
        threads.ForEach(t => t.Start());
        threads.ForEach(t => t.Join());

        // Either one ran while the other was refused, or (had the first already finished) both ran one after the other.
        var codes = results.Select(r => r.Code).Order().ToArray();
        Assert.True(codes.SequenceEqual([0, 0]) || codes.SequenceEqual([0, 1]), string.Join(" | ", results.Select(r => $"{r.Code}: {r.Error}")));
        foreach (var r in results.Where(r => r.Code == 1)) Assert.Contains("is already writing to", r.Error, StringComparison.Ordinal);

        // The result set is complete and the same as a single analysis gives (outputs are deterministic).
        foreach (var f in new[] { "summary.json", "runs.csv" })
            Assert.Equal(File.ReadAllBytes(Path.Combine(reference, f)), File.ReadAllBytes(Path.Combine(outDir, f)));
        Assert.Equal(Directory.EnumerateFiles(Path.Combine(reference, "plots")).Select(Path.GetFileName).Order(StringComparer.Ordinal),
            Directory.EnumerateFiles(Path.Combine(outDir, "plots")).Select(Path.GetFileName).Order(StringComparer.Ordinal));
        foreach (var png in Directory.EnumerateFiles(Path.Combine(reference, "plots")))
            Assert.Equal(File.ReadAllBytes(png), File.ReadAllBytes(Path.Combine(outDir, "plots", Path.GetFileName(png))));
        Assert.True(File.Exists(Path.Combine(outDir, "report.html")));

        // The log is the whole log of the analysis that ran last: one start line and one closing line, in that order
        // (each analysis replaces the log of the one before).
        var log = File.ReadAllLines(Path.Combine(outDir, AnalyseCommand.LogFile));
        var starts = log.Select((l, i) => (l, i)).Where(x => x.l.Contains(": analysing ", StringComparison.Ordinal)).Select(x => x.i).ToList();
        var ends = log.Select((l, i) => (l, i)).Where(x => x.l.Contains("run(s) analysed, ", StringComparison.Ordinal)).Select(x => x.i).ToList();
        Assert.Single(starts);
        Assert.Single(ends);
        Assert.True(starts[0] < ends[0]);
    }

    [Fact]
    public void The_analyse_command_line_reports_a_file_as_out_with_exit_1()
    {
        var file = Path.Combine(_dir.Path, "results.txt");
        File.WriteAllText(file, "mine");
        Assert.Equal(ExitCodes.Usage, Program.BuildRoot().Parse(["analyse", Sample, "--out", file, "--no-plots"]).Invoke());
    }
}
