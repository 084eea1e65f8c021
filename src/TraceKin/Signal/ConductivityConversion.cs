namespace TraceKin.Signal;

/// <summary>
/// Conductivity of a reaction in which one ion replaces another (e.g. a fast hydroxide ion replaced by a slower
/// anion): at fixed total ion concentration each ion adds its own share (Kohlrausch's law of independent migration
/// of ions, from memory), so κ is linear in the extent and a two-point reading between κ0 (at mixing) and κ∞
/// (complete reaction) gives the fraction converted f = (κ − κ0)/(κ∞ − κ0) and the limiting reactant
/// [X] = [X]0·(1 − f). Optional linear temperature compensation to a reference temperature,
/// κ_ref = κ/(1 + α·(T − T_ref)), with α stated by the user (common practice, no source).
/// </summary>
/// <param name="KappaInitial">κ0 at the reference temperature, S/m.</param>
/// <param name="KappaFinal">κ∞ at the reference temperature, S/m.</param>
/// <param name="Initial">[X]0 of the followed (limiting) reactant, mol/L.</param>
/// <param name="TemperatureCoefficient">α, 1/K; null for no compensation.</param>
/// <param name="ReferenceTemperature">T_ref, K.</param>
public sealed record ConductivityConversion(double KappaInitial, double KappaFinal, double Initial, double? TemperatureCoefficient = null, double ReferenceTemperature = 298.15)
{
    public double KappaInitialU { get; init; }
    public double KappaFinalU { get; init; }
    public double TemperatureCoefficientU { get; init; }

    /// <summary>Factor 1 + α·(T − T_ref) that a reading at T carries relative to T_ref.</summary>
    public double TemperatureFactor(double temperature) =>
        TemperatureCoefficient is { } a ? 1 + a * (temperature - ReferenceTemperature) : 1;

    /// <summary>A reading at T referred to T_ref.</summary>
    public double Compensate(double kappa, double temperature) => kappa / TemperatureFactor(temperature);

    public double ToConcentration(double kappa, double temperature) =>
        Initial * (KappaFinal - Compensate(kappa, temperature)) / (KappaFinal - KappaInitial);

    public double ToConductivity(double concentration, double temperature) =>
        (KappaFinal - concentration / Initial * (KappaFinal - KappaInitial)) * TemperatureFactor(temperature);

    /// <summary>d[X]/dκ at temperature T, mol/L per S/m.</summary>
    public double Scale(double temperature) => -Initial / ((KappaFinal - KappaInitial) * TemperatureFactor(temperature));

    public IEnumerable<UncertainInput> UncertainInputs(double temperature)
    {
        yield return new("signal.kappa_initial", KappaInitial, KappaInitialU, k => (this with { KappaInitial = k }).Scale(temperature));
        yield return new("signal.kappa_final", KappaFinal, KappaFinalU, k => (this with { KappaFinal = k }).Scale(temperature));
        if (TemperatureCoefficient is { } a)
            yield return new("signal.temperature_coefficient", a, TemperatureCoefficientU, x => (this with { TemperatureCoefficient = x }).Scale(temperature));
    }
}
