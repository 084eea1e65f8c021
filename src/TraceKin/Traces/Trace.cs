namespace TraceKin.Traces;

/// <summary>
/// One time series. <see cref="Times"/> are seconds from the run's zero (the moment of mixing when known,
/// else the first sample); <see cref="Values"/> are in <see cref="Unit"/>, the internal unit of
/// <see cref="Quantity"/>. <see cref="SourceUnit"/> is the unit the export was written in.
/// </summary>
public sealed record Trace(string Name, Quantity Quantity, string Unit, double[] Times, double[] Values, string? SourceUnit = null)
{
    public int Count => Times.Length;

    /// <summary>A copy with other values (same times), e.g. after a signal conversion.</summary>
    public Trace WithValues(string name, Quantity quantity, string unit, double[] values) =>
        new(name, quantity, unit, Times, values, SourceUnit);
}
