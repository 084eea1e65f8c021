namespace TraceKin.Rates;

/// <summary>
/// Pseudo-first order: A reacts with a partner B held in large excess, d[A]/dt = −kk·[B]0·[A], so u = exp(−kk·[B]0·t)
/// and the reported k is the second-order constant (L/(mol·s)). [B]0 is known (fixed). Closed-form integrated rate law,
/// common practice, no source; the ≥ 10-fold excess rule of thumb is common practice, no source.
/// </summary>
public sealed class PseudoFirstOrderLaw(double partner) : RateLaw
{
    public double Partner { get; } = partner;
    public override string Name => "pseudo-first order";
    public override double? OverallOrder => 2;

    public override double Fraction(double t, double kk, double a0, ReadOnlySpan<double> shape, Span<double> grad)
    {
        var u = Math.Exp(-kk * Partner * t);
        grad[0] = -Partner * t * u;
        grad[1] = 0;
        return u;
    }

    public override double InitialFactor(double a0, ReadOnlySpan<double> shape) => Partner;
    public override double HalfLife(double kk, double a0, ReadOnlySpan<double> shape) => Math.Log(2) / (kk * Partner);
}
