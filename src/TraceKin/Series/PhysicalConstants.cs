namespace TraceKin.Series;

/// <summary>
/// CODATA 2018 values (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021); SI Brochure 9th ed., 2019): h, k_B and N_A
/// are exact by definition, so R = N_A·k_B and k_B/h are exact too.
/// </summary>
public static class PhysicalConstants
{
    /// <summary>Planck constant h, J·s (exact).</summary>
    public const double Planck = 6.62607015e-34;

    /// <summary>Boltzmann constant k_B, J/K (exact).</summary>
    public const double Boltzmann = 1.380649e-23;

    /// <summary>Avogadro constant N_A, 1/mol (exact).</summary>
    public const double Avogadro = 6.02214076e23;

    /// <summary>Molar gas constant R = N_A·k_B, J/(mol·K): the exact decimal product 8.314 462 618 153 24.</summary>
    public const double GasConstant = 8.31446261815324;

    /// <summary>k_B/h in 1/(s·K): 2.083 661 912 332 757 × 10¹⁰ (exact quotient, CODATA 2018 listing).</summary>
    public const double BoltzmannOverPlanck = 2.083661912332757e10;

    /// <summary>ln(k_B/h / (1/(s·K))) = 23.759 977 810 504 (computed from the exact quotient).</summary>
    public static double LnBoltzmannOverPlanck => Math.Log(BoltzmannOverPlanck);
}
