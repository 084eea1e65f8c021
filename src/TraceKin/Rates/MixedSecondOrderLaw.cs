namespace TraceKin.Rates;

/// <summary>
/// Mixed second order A + B → P: d[A]/dt = −kk·[A]·[B] with [B] − [A] constant. With lo = min([A]0, [B]0),
/// hi = max(…), D = hi − lo, ε = D/hi and κ = kk·D, the species that runs out follows
/// u = ε / (expm1(κ·t) + ε), which tends to the equal-concentration form 1/(1 + kk·hi·t) as D → 0 (written with
/// expm1 so that equal and unequal c0 share one formula without cancellation). The traced species' end value absorbs
/// any excess. u′(0) = −kk·hi. Closed-form integrated rate law, common practice, no source.
/// The partner's initial concentration [B]0 is a shape parameter, fixed when the plan gives it.
/// </summary>
public sealed class MixedSecondOrderLaw : RateLaw
{
    public override string Name => "mixed second order";
    public override double? OverallOrder => 2;
    public override IReadOnlyList<string> ShapeNames => ["[B]0"];
    public override (double Low, double High)[] ShapeBounds => [(1e-300, double.PositiveInfinity)];

    /// <summary>The quantities u and its gradient are built from, for <see cref="Fraction"/> and <see cref="Value"/> alike.</summary>
    private static (bool AIsLo, double Lo, double Hi, double D, double Eps, double Em1, double Den) Terms(double t, double kk, double a0, double b0)
    {
        var aIsLo = a0 <= b0;
        double lo = aIsLo ? a0 : b0, hi = aIsLo ? b0 : a0;
        var d = hi - lo;
        var eps = d / hi;
        var kappa = kk * d;
        var em1 = Expm1(kappa * t);
        return (aIsLo, lo, hi, d, eps, em1, em1 + eps);
    }

    public override double Fraction(double t, double kk, double a0, ReadOnlySpan<double> shape, Span<double> grad)
    {
        var (aIsLo, lo, hi, d, eps, em1, den) = Terms(t, kk, a0, shape[0]);
        double u, duKappa, duEps;
        if (eps < 1e-9)
        {
            // Equal starting concentrations: the second-order limit, with first-order corrections in D.
            var q = 1 + kk * hi * t;
            u = 1 / q;
            grad[0] = -hi * t * u * u;
            var duHi = -kk * t * u * u;
            grad[1] = aIsLo ? 0 : duHi;
            grad[2] = aIsLo ? duHi : 0;
            return u;
        }
        u = eps / den;
        duKappa = -eps * t * (em1 + 1) / (den * den);
        duEps = em1 / (den * den);
        grad[0] = duKappa * d;
        // ∂/∂lo = −(∂u/∂κ·kk + ∂u/∂ε/hi);  ∂/∂hi = ∂u/∂κ·kk + ∂u/∂ε·lo/hi².
        var dLo = -(duKappa * kk + duEps / hi);
        var dHi = duKappa * kk + duEps * lo / (hi * hi);
        grad[1] = aIsLo ? dLo : dHi;
        grad[2] = aIsLo ? dHi : dLo;
        return u;
    }

    public override double Value(double t, double kk, double a0, ReadOnlySpan<double> shape)
    {
        // The arithmetic of Fraction for u, without the gradient.
        var (_, _, hi, _, eps, _, den) = Terms(t, kk, a0, shape[0]);
        if (eps < 1e-9) return 1 / (1 + kk * hi * t);
        return eps / den;
    }

    public override double InitialFactor(double a0, ReadOnlySpan<double> shape) => Math.Max(a0, shape[0]);

    public override double HalfLife(double kk, double a0, ReadOnlySpan<double> shape)
    {
        double lo = Math.Min(a0, shape[0]), hi = Math.Max(a0, shape[0]);
        var d = hi - lo;
        // u = ½ ⇔ expm1(κt) = ε ⇔ t = ln(1 + ε)/κ; the equal-c0 limit is 1/(kk·hi).
        return d / hi < 1e-9 ? 1 / (kk * hi) : Math.Log(1 + d / hi) / (kk * d);
    }

    /// <summary>
    /// exp(x) − 1 without cancellation, by Kahan's trick (u − 1)·x/ln u (Higham, "Accuracy and Stability of Numerical
    /// Algorithms", 2nd ed., §1.14.1, from memory); .NET's double.ExpM1 is computed as Exp(x) − 1. For |x| ≥ ½ the
    /// plain difference loses at most two bits (e^x − 1 ≥ 0.39·e^x there), so the logarithm is spared.
    /// </summary>
    internal static double Expm1(double x)
    {
        var u = Math.Exp(x);
        var um1 = u - 1.0;
        if (Math.Abs(x) >= 0.5) return um1;
        if (u == 1.0) return x;
        return um1 * x / Math.Log(u);
    }

    public override double[] GuessShape(double a0, double? partner) => [partner ?? 2 * a0];
}
