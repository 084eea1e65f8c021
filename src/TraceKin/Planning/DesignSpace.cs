namespace TraceKin.Planning;

/// <summary>A species the planner may move, between two starting concentrations (mol/L, low &lt; high).</summary>
public sealed record ConcentrationRange(string Species, double Low, double High);

/// <summary>
/// Where new runs may go: a range per species the planner may move (searched on a log scale, as orders act on ln[X]0),
/// the value every other species of the law is held at, and the temperature range (K, searched on a linear scale) or
/// the one temperature of the series.
/// </summary>
public sealed record DesignSpace(
    IReadOnlyList<ConcentrationRange> Ranges,
    IReadOnlyDictionary<string, double> Held,
    double? TemperatureLowK,
    double? TemperatureHighK)
{
    public bool MovesTemperature => TemperatureLowK is { } lo && TemperatureHighK is { } hi && hi > lo;

    /// <summary>Number of coordinates of one run: the ranged species, then temperature when it moves.</summary>
    public int Dimension => Ranges.Count + (MovesTemperature ? 1 : 0);

    /// <summary>The run at coordinates u ∈ [0, 1]^Dimension.</summary>
    public RunConditions At(ReadOnlySpan<double> u)
    {
        var c = new Dictionary<string, double>(Held, StringComparer.Ordinal);
        for (var j = 0; j < Ranges.Count; j++)
        {
            var r = Ranges[j];
            c[r.Species] = Math.Exp(Math.Log(r.Low) + u[j] * (Math.Log(r.High) - Math.Log(r.Low)));
        }
        double? t = MovesTemperature ? TemperatureLowK + u[Ranges.Count] * (TemperatureHighK - TemperatureLowK) : TemperatureLowK;
        return new RunConditions(c, t);
    }
}
