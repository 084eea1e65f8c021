namespace TraceKin.Traces;

/// <summary>What a trace measures. Internal units: s, mol/L, K, Pa, L, S/m; absorbance is dimensionless.</summary>
public enum Quantity
{
    Time,
    Absorbance,
    GasVolume,
    Pressure,
    Conductivity,
    Concentration,
    Temperature,
    Other,
}
