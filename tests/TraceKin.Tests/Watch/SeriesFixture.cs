using TraceKin.Analysis;
using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using TraceKin.Setup;
using TraceKin.Simulation;

namespace TraceKin.Tests.Watch;

/// <summary>
/// Invented series folders for the watch tests (round-trip data, no reference values): an absorbance series whose
/// exports are simulated from a known first-order-in-each-species law with <see cref="SampleWriter"/>.
/// </summary>
public static class SeriesFixture
{
    public const string GoodToml = """
        name = "watch-demo"
        [signal]
        kind = "absorbance"
        channel = "A530"
        species = "complex"
        coefficient = -1
        molar_absorptivity = 1480
        path_length = 1.0
        blank = 0.045
        [rates]
        method = "auto"
        window_conversion = 0.2
        [model]
        species = ["complex", "H+"]
        """;

    /// <summary>series.toml with a misspelt key in [signal]: rejected with the key named.</summary>
    public static readonly string BadToml = GoodToml.Replace("[signal]\n", "[signal]\nwavelenght = 530\n", StringComparison.Ordinal);

    /// <summary>An export whose second data line has a word where a number belongs.</summary>
    public const string BadExport = "time (s),A530\n0,0.341\n1,not-a-number\n2,0.339\n";

    public static readonly SimulatedLaw Law = new(0.35, new Dictionary<string, double> { ["complex"] = 1, ["H+"] = 1 },
        new Dictionary<string, double> { ["complex"] = -1, ["H+"] = -1 });

    public static string FileOf(int run) => $"r{run:000}.csv";

    public static string PlanText(int runs)
    {
        var sb = new StringBuilder("run,file,temperature (°C),[complex]0 (mmol/L),[H+]0 (mmol/L)\n");
        for (var i = 1; i <= runs; i++)
        {
            // complex 0.2–0.8 mmol/L, acid 50–250 mmol/L, varied independently.
            var c = 0.2 + 0.2 * (i % 4);
            var h = 50 + 50 * (i / 4 % 5);
            sb.Append(CultureInfo.InvariantCulture, $"R{i:000},{FileOf(i)},25.0,{c:0.0},{h}\n");
        }
        return sb.ToString();
    }

    public static (SeriesConfig Config, Plan Plan) Parse(int runs) =>
        (SeriesConfig.FromText(GoodToml, "series.toml"), Plan.FromText(PlanText(runs), "plan.csv"));

    public static string ExportText(Plan plan, SeriesConfig config, int run, int seed, int points = 121) =>
        SampleWriter.ExportText(plan.Rows[run - 1], config, Law, new SamplingPlan((points - 1) * 0.5, 0.5, 0.002, seed));

    public static string Sha256(string path)
    {
        using var fs = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete);
        return Convert.ToHexStringLower(SHA256.HashData(fs));
    }

    public static string Sha256Text(string text) => Convert.ToHexStringLower(SHA256.HashData(new UTF8Encoding(false).GetBytes(text)));

    public static string TempFolder(string tag)
    {
        var dir = Path.Combine(Path.GetTempPath(), $"tracekin-{tag}-{Guid.NewGuid():N}");
        Directory.CreateDirectory(dir);
        return dir;
    }
}
