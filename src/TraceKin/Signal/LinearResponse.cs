namespace TraceKin.Signal;

/// <summary>A species that contributes to the signal besides the followed one.</summary>
/// <param name="Species">Its name, as in plan.csv's [X]0 columns.</param>
/// <param name="Sensitivity">Signal per mol/L (for absorbance ε·l).</param>
/// <param name="Coefficient">Its stoichiometric coefficient ν (negative for a reactant).</param>
/// <param name="Initial">Its concentration at mixing, mol/L.</param>
public sealed record Contributor(string Species, double Sensitivity, double Coefficient, double Initial);

/// <summary>
/// A signal that is linear in the concentrations of one or more species, tied together by the reaction's
/// stoichiometry: signal = baseline + Σ_k S_k·c_k with c_k = c_k0 + ν_k·ξ (ξ the extent of reaction per volume).
/// Linear superposition of contributions is Beer's law for mixtures (IUPAC Gold Book, "Beer–Lambert law": the
/// absorbances of independent absorbers add) and the same assumption for any linear detector. Solving for ξ gives
/// c_X = c_X0 + ν_X·(signal − baseline − Σ S_k·c_k0)/(Σ S_k·ν_k). With no other contributor this is
/// c_X = (signal − baseline)/S_X and the initial concentration is not needed.
/// </summary>
public sealed record LinearResponse(double Baseline, double Sensitivity, double Coefficient, double Initial, IReadOnlyList<Contributor> Others)
{
    /// <summary>Σ S_k·ν_k over all contributors: signal change per unit extent. Zero means the signal does not follow the reaction.</summary>
    public double SignalPerExtent => Sensitivity * Coefficient + Others.Sum(o => o.Sensitivity * o.Coefficient);

    /// <summary>d c_X / d signal: concentration per unit signal.</summary>
    public double Scale => Others.Count == 0 ? 1 / Sensitivity : Coefficient / SignalPerExtent;

    public double ToConcentration(double signal)
    {
        if (Others.Count == 0) return (signal - Baseline) / Sensitivity;
        var atStart = Baseline + Sensitivity * Initial + Others.Sum(o => o.Sensitivity * o.Initial);
        return Initial + Coefficient * (signal - atStart) / SignalPerExtent;
    }

    /// <summary>
    /// <see cref="ToConcentration"/> for a whole trace, with the constants worked out once: the same operations in the
    /// same order, so the same doubles.
    /// </summary>
    public void ToConcentrations(ReadOnlySpan<double> signal, Span<double> concentration)
    {
        if (concentration.Length < signal.Length) throw new ArgumentException("shorter than the signal", nameof(concentration));
        if (Others.Count == 0)
        {
            var baseline = Baseline;
            var sensitivity = Sensitivity;
            for (var i = 0; i < signal.Length; i++) concentration[i] = (signal[i] - baseline) / sensitivity;
            return;
        }
        var atStart = Baseline + Sensitivity * Initial + Others.Sum(o => o.Sensitivity * o.Initial);
        var perExtent = SignalPerExtent;
        var initial = Initial;
        var coefficient = Coefficient;
        for (var i = 0; i < signal.Length; i++) concentration[i] = initial + coefficient * (signal[i] - atStart) / perExtent;
    }

    public double ToSignal(double concentration)
    {
        if (Others.Count == 0) return Baseline + Sensitivity * concentration;
        var extent = (concentration - Initial) / Coefficient;
        return Baseline + Sensitivity * concentration + Others.Sum(o => o.Sensitivity * (o.Initial + o.Coefficient * extent));
    }
}
