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

