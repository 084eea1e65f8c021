namespace TraceKin.Traces;

/// <summary>
/// Physical constants shared by every stage, CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)) with the SI Brochure,
/// 9th ed. (BIPM 2019), which fixes h, k, N_A and e exactly. R = N_A·k and F = N_A·e are exact products; the
/// decimal expansions below were checked against the exact products.
/// </summary>
public static class PhysicalConstants
{
    /// <summary>Planck constant h, J s (exact).</summary>
    public const double Planck = 6.62607015e-34;
    /// <summary>Boltzmann constant k_B, J/K (exact).</summary>
    public const double Boltzmann = 1.380649e-23;
    /// <summary>Avogadro constant N_A, 1/mol (exact).</summary>
    public const double Avogadro = 6.02214076e23;
    /// <summary>Elementary charge e, C (exact).</summary>
    public const double ElementaryCharge = 1.602176634e-19;
    /// <summary>Molar gas constant R = N_A·k_B, J/(mol K) (exact product 8.314 462 618 153 24).</summary>
    public const double GasConstant = 8.31446261815324;
    /// <summary>Faraday constant F = N_A·e, C/mol (exact product 96 485.332 123 310 0184).</summary>
    public const double Faraday = 96485.3321233100184;
    /// <summary>Standard atmosphere, Pa (exact by definition).</summary>
    public const double StandardAtmosphere = 101325;
    /// <summary>IUPAC standard-state pressure, Pa (1 bar).</summary>
    public const double StandardPressure = 100000;
    /// <summary>0 °C in kelvin (SI Brochure, 9th ed.).</summary>
    public const double CelsiusZero = 273.15;
    /// <summary>k_B/h in 1/(s·K): 2.083 661 912 332 757 × 10¹⁰ (exact quotient, CODATA 2018 listing).</summary>
    public const double BoltzmannOverPlanck = 2.083661912332757e10;
    /// <summary>ln(k_B/h / (1/(s·K))) = 23.759 977 810 504 (computed from the exact quotient).</summary>
    public static double LnBoltzmannOverPlanck => Math.Log(BoltzmannOverPlanck);
}
