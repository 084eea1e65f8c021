using TraceKin.Traces;
namespace TraceKin.Signal;

/// <summary>
/// A gas-phase reaction followed by the total pressure in a closed vessel of fixed volume and temperature.
/// With Δν the change in moles of gas per unit extent, Dalton's law and the perfect-gas equation give
/// p = p0 + Δν·ξ·R·T/V, so the followed species' partial pressure is p_X = p_X0 + ν_X·(p − p0)/Δν and its
/// concentration c_X = p_X/(R·T) (Dalton's law and the perfect-gas equation, Atkins &amp; de Paula, Physical Chemistry,
/// ch. 1; following a gas-phase reaction by its total pressure is standard practice, from memory). Concentrations in mol/L: c = p/(R·T)/1000 with p in Pa.
/// </summary>
/// <param name="Temperature">T, K.</param>
/// <param name="GasMoleChange">Δν = Σν(gas products) − Σ|ν|(gas reactants), non-zero.</param>
/// <param name="Coefficient">ν_X of the followed species (negative for a reactant).</param>
/// <param name="InitialPressure">Total pressure at mixing p0, Pa.</param>
/// <param name="InitialPartialPressure">The followed species' partial pressure at mixing p_X0, Pa.</param>
public sealed record PressureConversion(double Temperature, double GasMoleChange, double Coefficient, double InitialPressure, double InitialPartialPressure)
{
    public double TemperatureU { get; init; }

    public double PartialPressure(double totalPressure) => InitialPartialPressure + Coefficient * (totalPressure - InitialPressure) / GasMoleChange;

    public double ToConcentration(double totalPressure) => PartialPressure(totalPressure) / (PhysicalConstants.GasConstant * Temperature) / 1000;

    public double ToPressure(double concentration)
    {
        var partial = concentration * 1000 * PhysicalConstants.GasConstant * Temperature;
        return InitialPressure + (partial - InitialPartialPressure) * GasMoleChange / Coefficient;
    }

    /// <summary>d c_X/d p, mol/L per Pa.</summary>
    public double Scale => Coefficient / (GasMoleChange * PhysicalConstants.GasConstant * Temperature * 1000);

    public IEnumerable<UncertainInput> UncertainInputs()
    {
        yield return new("signal.temperature", Temperature, TemperatureU, t => (this with { Temperature = t }).Scale);
    }
}
