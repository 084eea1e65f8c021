namespace TraceKin.Rates;

/// <summary>
/// Zero order: d[A]/dt = −kk, so u = 1 − kk·t/[A]0 until A is used up at t = [A]0/kk, then u = 0 (flat tail).
/// Closed-form integrated rate law, common practice, no source.
/// </summary>
public sealed class ZeroOrderLaw : RateLaw
{
    public override string Name => "zero order";
    public override double? OverallOrder => 0;

    public override double Fraction(double t, double kk, double a0, ReadOnlySpan<double> shape, Span<double> grad)
    {
        var u = 1 - kk * t / a0;
        if (u <= 0) { grad[0] = 0; grad[1] = 0; return 0; }
        grad[0] = -t / a0;
        grad[1] = kk * t / (a0 * a0);
        return u;
    }

    public override double InitialFactor(double a0, ReadOnlySpan<double> shape) => 1 / a0;
    public override double HalfLife(double kk, double a0, ReadOnlySpan<double> shape) => a0 / (2 * kk);
}
