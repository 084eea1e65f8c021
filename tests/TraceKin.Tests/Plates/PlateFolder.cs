using System.Globalization;
using System.Text;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Plates;

/// <summary>
/// A temporary series folder holding one multi-channel export: absorbance A(t) = blank + ε·l·c0·exp(−k·t) per well
/// (first-order loss of the followed species; closed-form integrated law, common practice, no source), so each
/// well's initial rate is k·c0. Invented round-trip data.
/// </summary>
internal sealed class PlateFolder : IDisposable
{
    public const double Epsilon = 1000;   // L/(mol·cm), invented
    public const double Blank = 0.04;
    private readonly RepoPaths.TempDir _dir = new();
    public string Path => _dir.Path;

    public const string Toml = """
        [signal]
        kind = "absorbance"
        species = "S"
        coefficient = -1
        molar_absorptivity = 1000
        path_length = 1.0
        blank = 0.04

        [rates]
        method = "auto"
        window_conversion = 0.2
        """;

    public PlateFolder(string? toml = null)
    {
        File.WriteAllText(System.IO.Path.Combine(Path, "series.toml"), toml ?? Toml);
    }

    public void Write(string name, string text) => File.WriteAllText(System.IO.Path.Combine(Path, name), text);

    /// <summary>The absorbance of a well at time t (s) for [S]0 in mol/L and k in 1/s, plus a small seeded noise.</summary>
    public static double Absorbance(double c0, double k, double t, Random? noise = null) =>
        Blank + Epsilon * c0 * Math.Exp(-k * t) + (noise is null ? 0 : 0.0005 * Gaussian(noise));

    public static double Gaussian(Random r) => Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())) * Math.Cos(2 * Math.PI * r.NextDouble());

    /// <summary>A wide export: "time (s)", then one column per well (headers as given), 120 readings every 2 s.</summary>
    public static string Wide(IReadOnlyList<(string Header, double C0, double K)> wells, int readings = 120, int seed = 3)
    {
        var r = new Random(seed);
        var sb = new StringBuilder("time (s)");
        foreach (var w in wells) sb.Append(',').Append(w.Header);
        sb.Append('\n');
        for (var i = 0; i < readings; i++)
        {
            var t = 2.0 * i;
            sb.Append(t.ToString("R", CultureInfo.InvariantCulture));
            foreach (var w in wells) sb.Append(',').Append(Absorbance(w.C0, w.K, t, r).ToString("F5", CultureInfo.InvariantCulture));
            sb.Append('\n');
        }
        return sb.ToString();
    }

    public void Dispose() => _dir.Dispose();
}
