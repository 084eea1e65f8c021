using System.Text.Json;
using TraceKin.Cli;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

/// <summary>
/// A stated uncertainty of a conversion constant reaches summary.json as a systematic term beside (not inside) the
/// statistical errors. For Beer–Lambert c = (A − A_blank)/(ε·l), first-order propagation gives u_rel(c) = u_rel(ε)
/// when only ε is uncertain (JCGM 100:2008, eq. 10), and rates and k scale with c.
/// </summary>
public class SystematicUncertaintyTests
{
    [Fact]
    public void Two_percent_uncertainty_of_epsilon_gives_two_percent_systematic_error_of_each_rate_and_of_k()
    {
        using var series = RepoPaths.CopyOf(RepoPaths.Sample("violet-complex-acid"));
        var toml = Path.Combine(series.Path, "series.toml");
        File.WriteAllText(toml, File.ReadAllText(toml).Replace("molar_absorptivity = 1480", "molar_absorptivity = 1480\nmolar_absorptivity_u = 29.6"));
        using var outDir = new RepoPaths.TempDir();

        Assert.Equal(ExitCodes.Ok, Program.BuildRoot().Parse(["analyse", series.Path, "--out", outDir.Path, "--no-plots"]).Invoke());

        using var summary = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir.Path, "summary.json")));
        foreach (var run in summary.RootElement.GetProperty("runs").EnumerateArray())
        {
            var rate = run.GetProperty("initialRate");
            var relative = rate.GetProperty("systematicStdError").GetDouble() / rate.GetProperty("value").GetDouble();
            Assert.Equal(0.02, relative, 1e-8); // the budget differentiates numerically: ~1e-9 relative
            Assert.NotEqual(rate.GetProperty("stdError").GetDouble(), rate.GetProperty("systematicStdError").GetDouble());
        }
        var k = summary.RootElement.GetProperty("rateConstant");
        Assert.Equal(0.02, k.GetProperty("systematicRelativeUncertainty").GetDouble(), 1e-8);
    }
}
