namespace TraceKin.Signal;

/// <summary>
/// Saturation pressure of water over liquid water (and its inverse), from IAPWS R7-97(2012), "Revised Release on
/// the IAPWS Industrial Formulation 1997 for the Thermodynamic Properties of Water and Steam", Region 4:
/// the saturation-pressure equation (Eq. 30, coefficients Table 34) and the backward saturation-temperature
/// equation (Eq. 31). Valid for 273.15 K ≤ T ≤ 647.096 K and 611.213 Pa ≤ p ≤ 22.064 MPa.
/// </summary>
public static class WaterVapour
{
    /// <summary>Lowest temperature of Eq. 30, K.</summary>
    public const double MinimumTemperature = 273.15;
    /// <summary>Critical temperature, the highest of Eq. 30, K.</summary>
    public const double CriticalTemperature = 647.096;
    /// <summary>Lowest pressure of Eq. 31 (the saturation pressure at 273.15 K), Pa.</summary>
    public const double MinimumPressure = 611.213;
    /// <summary>Critical pressure, the highest of Eq. 31, Pa.</summary>
    public const double CriticalPressure = 22.064e6;

    // IAPWS-IF97 Table 34, n1..n10.
    private const double N1 = 0.11670521452767e4;
    private const double N2 = -0.72421316703206e6;
    private const double N3 = -0.17073846940092e2;
    private const double N4 = 0.12020824702470e5;
    private const double N5 = -0.32325550322333e7;
    private const double N6 = 0.14915108613530e2;
    private const double N7 = -0.48232657361591e4;
    private const double N8 = 0.40511340542057e6;
    private const double N9 = -0.23855557567849;
    private const double N10 = 0.65017534844798e3;

    /// <summary>Saturation vapour pressure p_s(T) in Pa; IAPWS-IF97 Eq. 30 (T* = 1 K, p* = 1 MPa).</summary>
    public static double SaturationPressure(double temperatureK)
    {
        if (!(temperatureK >= MinimumTemperature && temperatureK <= CriticalTemperature))
            throw new ArgumentOutOfRangeException(nameof(temperatureK), temperatureK, "IAPWS-IF97 Eq. 30 holds for 273.15 K to 647.096 K");
        var theta = temperatureK + N9 / (temperatureK - N10);
        var a = theta * theta + N1 * theta + N2;
        var b = N3 * theta * theta + N4 * theta + N5;
        var c = N6 * theta * theta + N7 * theta + N8;
        var ratio = 2 * c / (-b + Math.Sqrt(b * b - 4 * a * c));
        return Math.Pow(ratio, 4) * 1e6;
    }

    /// <summary>Saturation temperature T_s(p) in K; IAPWS-IF97 Eq. 31, the backward equation of Eq. 30.</summary>
    public static double SaturationTemperature(double pressurePa)
    {
        if (!(pressurePa >= MinimumPressure && pressurePa <= CriticalPressure))
            throw new ArgumentOutOfRangeException(nameof(pressurePa), pressurePa, "IAPWS-IF97 Eq. 31 holds for 611.213 Pa to 22.064 MPa");
        var beta = Math.Pow(pressurePa / 1e6, 0.25);
        var e = beta * beta + N3 * beta + N6;
        var f = N1 * beta * beta + N4 * beta + N7;
        var g = N2 * beta * beta + N5 * beta + N8;
        var d = 2 * g / (-f - Math.Sqrt(f * f - 4 * e * g));
        return (N10 + d - Math.Sqrt((N10 + d) * (N10 + d) - 4 * (N9 + N10 * d))) / 2;
    }
}
