using TraceKin.Setup;

namespace TraceKin.Signal;

/// <summary>
/// The [signal] table of series.toml: what the signal is, which species it follows and how to turn it into
/// that species' concentration.
/// </summary>
public sealed record SignalSettings
{
    /// <summary>"absorbance" (Beer–Lambert) for now; more kinds follow.</summary>
    public string Kind { get; init; } = "absorbance";
    /// <summary>Column header of the signal channel; null when the export has only one.</summary>
    public string? Channel { get; init; }
    /// <summary>The species the signal follows, as named in plan.csv's [X]0 columns.</summary>
    public string Species { get; init; } = "A";
    /// <summary>Stoichiometric coefficient ν of that species (negative for a reactant): rate = (1/ν)·d[X]/dt.</summary>
    public double Coefficient { get; init; } = -1;
    /// <summary>Molar absorptivity ε in L/(mol·cm).</summary>
    public double? MolarAbsorptivity { get; init; }
    /// <summary>Optical path length l in cm.</summary>
    public double PathLength { get; init; } = 1.0;
    /// <summary>Absorbance of the blank (everything but the absorbing species), subtracted before Beer–Lambert.</summary>
    public double Blank { get; init; }

    public static SignalSettings FromToml(TomlSection s)
    {
        var d = new SignalSettings();
        var pathUnit = s.Choice("path_length_unit", "cm", "cm", "mm");
        var path = s.Positive("path_length") ?? d.PathLength;
        var coefficient = s.Double("coefficient", d.Coefficient);
        if (coefficient == 0)
            throw Traces.Fail.Setting(s.File, s.KeyName("coefficient"), "0", "a non-zero stoichiometric coefficient (negative for a reactant, positive for a product)");
        return d with
        {
            Kind = s.Choice("kind", d.Kind, "absorbance"),
            Channel = s.String("channel"),
            Species = s.String("species", d.Species),
            Coefficient = coefficient,
            MolarAbsorptivity = s.Positive("molar_absorptivity"),
            PathLength = pathUnit == "mm" ? path / 10 : path,
            Blank = s.Double("blank", 0),
        };
    }
}
