namespace TraceKin.Signal;

/// <summary>An absorbing species other than the followed one (e.g. a product that absorbs at the same wavelength).</summary>
public sealed record Absorber(string Species, double MolarAbsorptivity, double Coefficient, double MolarAbsorptivityU = 0);

/// <summary>
/// Beer–Lambert law with blank subtraction: A − A_blank = l·Σ ε_k·c_k (IUPAC Compendium of Chemical Terminology,
/// "Beer–Lambert law"; absorbances of several absorbers add). ε in L/(mol·cm), l in cm, c in mol/L.
/// When other species absorb, their concentrations follow from the followed species' through the stoichiometry
/// (<see cref="LinearResponse"/>), so the followed species' initial concentration (from the plan) is needed.
/// </summary>
public sealed record BeerLambert(double MolarAbsorptivity, double PathLength, double Blank, double Coefficient, double Initial, IReadOnlyList<Absorber> Others,
    double MolarAbsorptivityU = 0, double PathLengthU = 0)
{
    public BeerLambert(double molarAbsorptivity, double pathLength, double blank = 0)
        : this(molarAbsorptivity, pathLength, blank, -1, 0, []) { }

    public LinearResponse Response => new(Blank, MolarAbsorptivity * PathLength, Coefficient, Initial,
        Others.Select(o => new Contributor(o.Species, o.MolarAbsorptivity * PathLength, o.Coefficient, InitialOf(o))).ToArray());

    /// <summary>Initial concentrations of the other absorbers (mol/L), filled from the plan; absent ones start at 0.</summary>
    public IReadOnlyDictionary<string, double> OthersInitial { get; init; } = new Dictionary<string, double>();

    private double InitialOf(Absorber o) => OthersInitial.TryGetValue(o.Species, out var c) ? c : 0;

    public double ToConcentration(double absorbance) => Response.ToConcentration(absorbance);

    public double ToAbsorbance(double concentration) => Response.ToSignal(concentration);

    /// <summary>Concentration per unit absorbance.</summary>
    public double Scale => Response.Scale;

    /// <summary>Inputs that carry a standard uncertainty, for <see cref="UncertaintyBudget"/>.</summary>
    public IEnumerable<UncertainInput> UncertainInputs()
    {
        yield return new("signal.molar_absorptivity", MolarAbsorptivity, MolarAbsorptivityU, e => (this with { MolarAbsorptivity = e }).Scale);
        yield return new("signal.path_length", PathLength, PathLengthU, l => (this with { PathLength = l }).Scale);
        for (var i = 0; i < Others.Count; i++)
        {
            var k = i;
            yield return new($"signal.absorber[{k}].molar_absorptivity", Others[k].MolarAbsorptivity, Others[k].MolarAbsorptivityU,
                e => (this with { Others = Others.Select((o, j) => j == k ? o with { MolarAbsorptivity = e } : o).ToArray() }).Scale);
        }
    }
}
