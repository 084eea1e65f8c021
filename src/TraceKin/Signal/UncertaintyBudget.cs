namespace TraceKin.Signal;

/// <summary>One input of a conversion that carries a standard uncertainty, and how the concentration scale depends on it.</summary>
/// <param name="Key">The series.toml key of the input (e.g. <c>signal.molar_absorptivity</c>).</param>
/// <param name="Value">Its value.</param>
/// <param name="StdUncertainty">Its standard uncertainty u (same unit as the value).</param>
/// <param name="ScaleAt">The conversion's scale factor (concentration per unit signal) as a function of this input, the others held.</param>
public sealed record UncertainInput(string Key, double Value, double StdUncertainty, Func<double, double> ScaleAt);

/// <summary>
/// First-order propagation of independent input uncertainties into the relative uncertainty of a conversion's
/// scale factor: u_c²(y) = Σ (∂f/∂x_i)²·u²(x_i), JCGM 100:2008 (GUM), §5.1.2, Eq. (10). The sensitivity
/// coefficients ∂f/∂x_i are evaluated numerically by a central difference with a step of 10⁻³·u(x_i), which is
/// exact to far below the precision anyone reports an uncertainty to.
/// </summary>
public static class UncertaintyBudget
{
    /// <summary>The relative combined standard uncertainty of <paramref name="scale"/>, and each input's relative contribution.</summary>
    public static (double Relative, IReadOnlyList<KeyValuePair<string, double>> Contributions) Relative(double scale, IEnumerable<UncertainInput> inputs,
        IEnumerable<KeyValuePair<string, double>>? extraRelative = null)
    {
        var parts = new List<KeyValuePair<string, double>>();
        double sum = 0;
        foreach (var input in inputs)
        {
            if (!(input.StdUncertainty > 0)) continue;
            var h = 1e-3 * input.StdUncertainty;
            var derivative = (input.ScaleAt(input.Value + h) - input.ScaleAt(input.Value - h)) / (2 * h);
            var rel = Math.Abs(derivative * input.StdUncertainty / scale);
            parts.Add(new(input.Key, rel));
            sum += rel * rel;
        }
        foreach (var extra in extraRelative ?? [])
        {
            parts.Add(extra);
            sum += extra.Value * extra.Value;
        }
        return (Math.Sqrt(sum), parts);
    }
}
