using System.Globalization;
using System.Text;
using TraceKin.Setup;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Simulation;

/// <summary>How simulated exports are sampled and how noisy they are.</summary>
public sealed record SamplingPlan(double Duration, double Interval, double Noise, int Seed, double DeadTime = 0);

/// <summary>
/// Writes one export per plan row from a simulated rate law, through the forward signal conversion of series.toml
/// (concentration → signal), with seeded Gaussian noise. The text format is the plain one `analyse` reads.
/// </summary>
public static class SampleWriter
{
    public static string ExportText(PlanRow row, SeriesConfig config, SimulatedLaw law, SamplingPlan sampling)
    {
        var count = (int)Math.Floor(sampling.Duration / sampling.Interval) + 1;
        var times = Enumerable.Range(0, count).Select(i => sampling.DeadTime + i * sampling.Interval).ToArray();
        var conc = RateLawSimulator.Integrate(law, row.InitialConcentrations, row.TemperatureK, times);
        var s = config.Signal;
        if (!conc.TryGetValue(s.Species, out var tracked))
            throw Fail.Setting(config.File, "signal.species", Fail.Quote(s.Species), "a species of the simulated law or of plan.csv");
        // A seed per run, derived from the run id, so runs do not share noise and adding a run changes no other.
        var rng = new Random(unchecked(sampling.Seed * 31 + StableHash(row.Run)));
        var ci = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        sb.AppendLine(ci, $"# simulated by TraceKin {Analysis.SeriesRunner.ToolVersion}; seed {sampling.Seed}");
        sb.AppendLine(ci, $"run: {row.Run}");
        if (row.TemperatureK is { } tk) sb.AppendLine(ci, $"temperature: {tk - 273.15:0.00} °C");
        var header = s.Kind switch
        {
            "absorbance" => s.Channel ?? "A",
            _ => throw Fail.Setting(config.File, "signal.kind", Fail.Quote(s.Kind), "absorbance (the kinds simulate can write)"),
        };
        sb.AppendLine($"time (s),{header}");
        var eps = s.MolarAbsorptivity ?? throw Fail.Setting(config.File, "signal.molar_absorptivity", "no value", "ε in L/(mol·cm)");
        for (var i = 0; i < count; i++)
        {
            var signal = s.Blank + eps * s.PathLength * tracked[i] + RateLawSimulator.Gaussian(rng, sampling.Noise);
            sb.AppendLine(ci, $"{times[i]:0.###},{signal:0.000000}");
        }
        return sb.ToString();
    }

    private static int StableHash(string s)
    {
        var h = 17;
        foreach (var ch in s) h = unchecked(h * 31 + ch);
        return h;
    }
}
