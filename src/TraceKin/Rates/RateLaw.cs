namespace TraceKin.Rates;

/// <summary>
/// A closed-form integrated rate law for the decline of a reacting species A, written as the fraction
/// u(t) = [A](t)/[A]0 still unreacted (u(0) = 1). A trace is then modelled as
/// y(t) = y_end + (y0 − y_end)·u(t) (+ drift·t), so the same law fits a falling reactant or a rising product.
/// Laws take the effective constant kk = |ν|·k, where ν is the traced species' coefficient and k the rate constant
/// of the rate of reaction v = k·Π[X]^n (IUPAC Gold Book, "rate of reaction", from memory).
/// Integrated forms: closed-form integrated rate laws, common practice, no source (see docs/methods.md).
/// </summary>
public abstract class RateLaw
{
    /// <summary>Plain name used in reports, e.g. "first order".</summary>
    public abstract string Name { get; }

    /// <summary>Extra shape parameters beyond k (e.g. "n", "[B]0"); empty for most laws.</summary>
    public virtual IReadOnlyList<string> ShapeNames => [];

    /// <summary>Overall order in concentration (for the unit of k); null when it is fitted.</summary>
    public abstract double? OverallOrder { get; }

    /// <summary>Bounds of the shape parameters (same order as <see cref="ShapeNames"/>).</summary>
    public virtual (double Low, double High)[] ShapeBounds => [];

    /// <summary>
    /// u(t) and its gradient into <paramref name="grad"/>: [∂u/∂kk, ∂u/∂a0, ∂u/∂shape…].
    /// </summary>
    public abstract double Fraction(double t, double kk, double a0, ReadOnlySpan<double> shape, Span<double> grad);

    /// <summary>
    /// u(t) alone, the same value as <see cref="Fraction"/> (a law overrides it only to skip its gradient, with the
    /// same arithmetic for u).
    /// </summary>
    public virtual double Value(double t, double kk, double a0, ReadOnlySpan<double> shape)
    {
        Span<double> grad = stackalloc double[2 + shape.Length];
        return Fraction(t, kk, a0, shape, grad);
    }

    /// <summary>g in u′(0) = −kk·g(a0, shape); so d[A]/dt at t0 = −|ν|·k·[A]0·g.</summary>
    public abstract double InitialFactor(double a0, ReadOnlySpan<double> shape);

    /// <summary>Time for u to fall to ½; NaN where undefined.</summary>
    public abstract double HalfLife(double kk, double a0, ReadOnlySpan<double> shape);

    /// <summary>Start values of the shape parameters for a trace (default: none).</summary>
    public virtual double[] GuessShape(double a0, double? partner) => [];

    /// <summary>
    /// A cheap start for kk from the early trace: by default the initial-slope linearisation
    /// kk ≈ |dy/dt(t0)| / (|y0 − y_end|·g). Laws with a classic linearisation (ln u, 1/u) override it.
    /// </summary>
    public virtual double GuessKk(ReadOnlySpan<double> t, ReadOnlySpan<double> y, double y0, double yEnd, double a0, ReadOnlySpan<double> shape, double initialSlope)
    {
        var g = InitialFactor(a0, shape);
        var kk = Math.Abs(initialSlope) / (Math.Abs(y0 - yEnd) * g);
        return double.IsFinite(kk) && kk > 0 ? kk : 1.0 / Math.Max(t[^1] - t[0], 1e-9);
    }

    /// <summary>The unit of k for this law (internal units mol/L and s).</summary>
    public virtual string RateConstantUnit(ReadOnlySpan<double> shape) => OverallOrder switch
    {
        0 => "mol/(L·s)",
        1 => "1/s",
        2 => "L/(mol·s)",
        { } m => $"(mol/L)^{1 - m:G4}/s",
        null => "(mol/L)^(1−n)/s",
    };

    public override string ToString() => Name;
}
