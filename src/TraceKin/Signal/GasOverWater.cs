using TraceKin.Traces;
namespace TraceKin.Signal;

/// <summary>
/// A gas evolved by the reaction and collected over water (or dry) at barometric pressure, read as a volume.
/// Dalton's law of partial pressures gives the gas's own pressure p = p_bar − p_H2O(T), and the perfect-gas
/// equation its amount n = p·V/(R·T) (both laws as in Atkins &amp; de Paula, Physical Chemistry, ch. 1, from memory;
/// the correction for water vapour is the standard practice of general-chemistry texts, from memory). p_H2O is the saturation pressure of
/// IAPWS-IF97 Eq. 30 (<see cref="WaterVapour"/>). With ν_gas moles of gas per unit extent and ν_X for the followed
/// species, in a solution of volume V_soln: [X] = [X]0 + ν_X·n/(ν_gas·V_soln).
/// </summary>
/// <param name="BarometricPressure">p_bar, Pa.</param>
/// <param name="Temperature">T of the collected gas, K.</param>
/// <param name="SolutionVolume">Volume of the reacting solution, L.</param>
/// <param name="GasCoefficient">ν_gas, moles of gas formed per unit extent (positive).</param>
/// <param name="Coefficient">ν_X of the followed species (negative for a reactant).</param>
/// <param name="Initial">[X]0, mol/L (0 for a product not present at the start).</param>
/// <param name="DryGas">True when the gas is collected dry (no water-vapour correction).</param>
/// <param name="ZeroOffset">Volume the collector reads before any gas has formed, L (a syringe's zero offset).</param>
public sealed record GasOverWater(double BarometricPressure, double Temperature, double SolutionVolume, double GasCoefficient, double Coefficient,
    double Initial, bool DryGas = false, double ZeroOffset = 0)
{
    public double BarometricPressureU { get; init; }
    public double TemperatureU { get; init; }
    public double SolutionVolumeU { get; init; }

    /// <summary>Water vapour pressure over the collecting water, Pa (0 for a dry gas).</summary>
    public double WaterVapourPressure => DryGas ? 0 : WaterVapour.SaturationPressure(Temperature);

    /// <summary>The collected gas's own partial pressure, Pa.</summary>
    public double GasPressure => BarometricPressure - WaterVapourPressure;

    /// <summary>Moles of gas in a collected volume (L): n = (p_bar − p_H2O)·V/(R·T), V in m³.</summary>
    public double MolesOfGas(double volume) => GasPressure * (volume - ZeroOffset) * 1e-3 / (PhysicalConstants.GasConstant * Temperature);

    public double ToConcentration(double volume) => Initial + Coefficient * MolesOfGas(volume) / (GasCoefficient * SolutionVolume);

    public double ToVolume(double concentration)
    {
        var moles = (concentration - Initial) * GasCoefficient * SolutionVolume / Coefficient;
        return ZeroOffset + moles * PhysicalConstants.GasConstant * Temperature / (GasPressure * 1e-3);
    }

    /// <summary>d[X]/dV, mol/L per L of gas.</summary>
    public double Scale => Coefficient * GasPressure * 1e-3 / (PhysicalConstants.GasConstant * Temperature * GasCoefficient * SolutionVolume);

    public IEnumerable<UncertainInput> UncertainInputs()
    {
        yield return new("signal.barometric_pressure", BarometricPressure, BarometricPressureU, p => (this with { BarometricPressure = p }).Scale);
        yield return new("signal.temperature", Temperature, TemperatureU, t => (this with { Temperature = t }).Scale);
        yield return new("signal.solution_volume", SolutionVolume, SolutionVolumeU, v => (this with { SolutionVolume = v }).Scale);
    }
}
