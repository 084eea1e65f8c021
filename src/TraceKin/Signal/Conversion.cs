using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// A run's signal turned into the concentration (mol/L) of the species the signal follows.
/// <see cref="RelativeSystematicUncertainty"/> is the relative standard uncertainty of the concentration scale
/// from the conversion's constants (reported beside, not mixed into, fit statistics).
/// </summary>
public sealed record ConvertedRun(
    Trace Concentration,
    string Species,
    double Coefficient,
    double RelativeSystematicUncertainty,
    IReadOnlyList<KeyValuePair<string, string>> ConstantsUsed,
    IReadOnlyList<Warning> Warnings);

/// <summary>The Signal stage's front door: picks the conversion named by signal.kind.</summary>
public static class Conversion
{
    public static ConvertedRun ToConcentration(RunExport export, PlanRow row, SignalSettings settings, string configFile = "series.toml")
    {
        var channel = export.Channel(settings.Channel);
        return settings.Kind switch
        {
            "absorbance" => BeerLambert(export, channel, settings, configFile),
            _ => throw Fail.Setting(configFile, "signal.kind", Fail.Quote(settings.Kind), "absorbance"),
        };
    }

    /// <summary>
    /// Beer–Lambert law A − A_blank = ε·l·c (IUPAC Gold Book, "Beer–Lambert law", doi:10.1351/goldbook.B00626).
    /// </summary>
    private static ConvertedRun BeerLambert(RunExport export, Trace channel, SignalSettings s, string configFile)
    {
        if (channel.Quantity != Quantity.Absorbance)
            throw Fail.Setting(configFile, "signal.channel", $"{channel.Name} ({channel.Quantity})", "an absorbance channel for signal.kind = \"absorbance\"");
        var eps = s.MolarAbsorptivity ?? throw Fail.Setting(configFile, "signal.molar_absorptivity", "no value", "the molar absorptivity ε in L/(mol·cm)");
        var el = eps * s.PathLength;
        var c = new double[channel.Count];
        var warnings = new List<Warning>();
        var maxA = 0.0;
        for (var i = 0; i < c.Length; i++)
        {
            c[i] = (channel.Values[i] - s.Blank) / el;
            maxA = Math.Max(maxA, channel.Values[i]);
        }
        // Absorbance above ~1.5 leaves the linear range of most spectrophotometers (common practice, no source).
        if (maxA > 1.5)
            warnings.Add(new Warning("absorbance-above-linear-range", export.File, $"absorbance reaches {maxA:0.###}; above about 1.5 Beer–Lambert may not hold for this instrument"));
        var used = new List<KeyValuePair<string, string>>
        {
            new("conversion", "Beer–Lambert"),
            new("molar absorptivity", $"{eps:G6} L/(mol·cm)"),
            new("path length", $"{s.PathLength:G6} cm"),
            new("blank absorbance", $"{s.Blank:G6}"),
            new("channel", channel.Name),
        };
        var trace = channel.WithValues($"[{s.Species}]", Quantity.Concentration, Units.MolPerLitre, c);
        return new ConvertedRun(trace, s.Species, s.Coefficient, 0, used, warnings);
    }
}
