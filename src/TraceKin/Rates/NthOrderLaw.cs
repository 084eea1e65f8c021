namespace TraceKin.Rates;

/// <summary>
/// Order n in one species, n fitted: d[A]/dt = −kk·[A]^n. With q = kk·[A]0^(n−1)·t and B = 1 + (n−1)·q,
/// u = B^(−1/(n−1)) (u = 0 once B ≤ 0, for n &lt; 1), the first-order limit exp(−q) as n → 1 (one smooth formula);
/// t½ = (2^(n−1) − 1)/((n−1)·kk·[A]0^(n−1)). Closed-form integrated rate law, common practice, no source.
/// </summary>
public sealed class NthOrderLaw : RateLaw
{
    public override string Name => "order n";
    public override double? OverallOrder => null;
    public override IReadOnlyList<string> ShapeNames => ["n"];
    public override (double Low, double High)[] ShapeBounds => [(0, 4)];

    public override double Fraction(double t, double kk, double a0, ReadOnlySpan<double> shape, Span<double> grad)
    {
        // With x = (n−1)·q: ln u = −q·L(x)/x, L = ln(1 + x), which is smooth through n = 1 (L(x)/x → 1).
        // ∂ln u/∂n = q²·φ(x) − q·ln a0/(1 + x), φ(x) = L(x)/x² − 1/(x(1 + x)) = Σ (−1)^j (j+1) x^j/(j+2) (Taylor
        // series of ln(1 + x), from memory); the series is used for |x| < 0.01 to avoid cancellation (10 terms reach
        // 1e-20 there; beyond it the closed form loses at most ε/x² ≈ 1e-12 of φ to cancellation).
        var m = shape[0] - 1;
        var (lnA, scale) = Powers(a0, m);
        var q = kk * scale * t;
        var x = m * q;
        if (1 + x <= 0) { grad[0] = 0; grad[1] = 0; grad[2] = 0; return 0; }
        double lOverX, phi;
        if (Math.Abs(x) < 0.01)
        {
            double sumL = 0, sumPhi = 0, xp = 1;
            for (var j = 0; j < 10; j++)
            {
                var sign = (j & 1) == 0 ? 1.0 : -1.0;
                sumL += sign * xp / (j + 1);            // L(x)/x = Σ (−x)^j/(j+1)
                sumPhi += sign * (j + 1) * xp / (j + 2);
                xp *= x;
            }
            lOverX = sumL; phi = sumPhi;
        }
        else
        {
            var l = Math.Log(1 + x);
            lOverX = l / x;
            phi = l / (x * x) - 1 / (x * (1 + x));
        }
        var u = Math.Exp(-q * lOverX);
        grad[0] = -u * scale * t / (1 + x);
        grad[1] = -u * m * q / (a0 * (1 + x));
        grad[2] = u * (q * q * phi - q * lnA / (1 + x));
        return u;
    }

    public override double Value(double t, double kk, double a0, ReadOnlySpan<double> shape)
    {
        // The arithmetic of Fraction for u, without the gradient.
        var m = shape[0] - 1;
        var (_, scale) = Powers(a0, m);
        var q = kk * scale * t;
        var x = m * q;
        if (1 + x <= 0) return 0;
        double lOverX;
        if (Math.Abs(x) < 0.01)
        {
            double sumL = 0, xp = 1;
            for (var j = 0; j < 10; j++)
            {
                var sign = (j & 1) == 0 ? 1.0 : -1.0;
                sumL += sign * xp / (j + 1);
                xp *= x;
            }
            lOverX = sumL;
        }
        else lOverX = Math.Log(1 + x) / x;
        return Math.Exp(-q * lOverX);
    }

    /// <summary>ln a0 and a0^(n−1) = e^((n−1)·ln a0): the same at every point of one evaluation, so kept for the last
    /// (a0, n − 1) asked for (an immutable pair, safe to read from any thread).</summary>
    private (double LnA, double Scale) Powers(double a0, double m)
    {
        var p = _powers;
        if (p is null || !(p.A0 == a0) || !(p.M == m))
        {
            var lnA = Math.Log(a0);
            _powers = p = new PowerMemo(a0, m, lnA, Math.Exp(m * lnA));
        }
        return (p.LnA, p.Scale);
    }

    private sealed record PowerMemo(double A0, double M, double LnA, double Scale);
    private PowerMemo? _powers;

    public override double InitialFactor(double a0, ReadOnlySpan<double> shape) => Math.Pow(a0, shape[0] - 1);

    public override double HalfLife(double kk, double a0, ReadOnlySpan<double> shape)
    {
        var m = shape[0] - 1;
        var scale = Math.Pow(a0, m);
        return Math.Abs(m) < 1e-7 ? Math.Log(2) / (kk * scale) : (Math.Pow(2, m) - 1) / (m * kk * scale);
    }

    public override double[] GuessShape(double a0, double? partner) => [1.5];
}
