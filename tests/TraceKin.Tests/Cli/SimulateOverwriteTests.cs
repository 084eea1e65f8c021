using TraceKin.Cli;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Cli;

/// <summary>`simulate` never replaces an export that exists unless told to (robustness; no source needed).</summary>
public sealed class SimulateOverwriteTests
{
    [Fact]
    public void Simulate_onto_an_existing_export_exits_1_and_leaves_it_untouched_unless_forced()
    {
        using var dir = new RepoPaths.TempDir();
        foreach (var f in Directory.GetFiles(RepoPaths.Sample("violet-complex-acid")))
            File.Copy(f, Path.Combine(dir.Path, Path.GetFileName(f)));
        var r1 = Path.Combine(dir.Path, "r1.csv");
        File.WriteAllText(r1, "a real export\n");
        var args = new[] { "simulate", dir.Path, "--rate-constant", "0.35", "--order", "complex=1", "--order", "H+=1", "--duration", "30", "--interval", "1" };
        var code = Program.BuildRoot().Parse(args).Invoke();
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Equal("a real export\n", File.ReadAllText(r1));
        Assert.Equal(ExitCodes.Ok, Program.BuildRoot().Parse([.. args, "--force"]).Invoke());
        Assert.StartsWith("# simulated by TraceKin", File.ReadAllText(r1));
    }
}

/// <summary>Progress lines of a batch (presentation; no source needed).</summary>
public sealed class BatchProgressTests
{
    [Theory]
    [InlineData(120, 400, 2.0, "120 of 400 run(s) done, 60 runs/s, about 5 s left")]
    [InlineData(30, 20000, 10.0, "30 of 20000 run(s) done, 3.0 runs/s, about 1 h 51 min left")]
    [InlineData(900, 1000, 3.0, "900 of 1000 run(s) done, 300 runs/s, about 1 s left")]
    [InlineData(12, 0, 4.0, "12 run(s) done, 3.0 runs/s")]
    public void A_progress_line_gives_the_total_the_pace_and_the_time_left(int done, int total, double seconds, string expected) =>
        Assert.Equal(expected, TraceKin.Cli.Commands.BatchProgress.Line(done, total, seconds));
}
