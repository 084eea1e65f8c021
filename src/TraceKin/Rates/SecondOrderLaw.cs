namespace TraceKin.Rates;

/// <summary>
/// Second order in one species (2A → P, or A + A): d[A]/dt = −kk·[A]², u = 1/(1 + kk·[A]0·t), t½ = 1/(kk·[A]0).
/// Closed-form integrated rate law, common practice, no source. Start from the linearisation
/// 1/u = 1 + kk·[A]0·t over the early trace.
/// </summary>
public sealed class SecondOrderLaw : RateLaw
{
    public override string Name => "second order";
    public override double? OverallOrder => 2;

    public override double Fraction(double t, double kk, double a0, ReadOnlySpan<double> shape, Span<double> grad)
    {
        var u = 1 / (1 + kk * a0 * t);
        var u2 = u * u;
        grad[0] = -a0 * t * u2;
        grad[1] = -kk * t * u2;
        return u;
    }

    public override double InitialFactor(double a0, ReadOnlySpan<double> shape) => a0;
    public override double HalfLife(double kk, double a0, ReadOnlySpan<double> shape) => 1 / (kk * a0);

    public override double GuessKk(ReadOnlySpan<double> t, ReadOnlySpan<double> y, double y0, double yEnd, double a0, ReadOnlySpan<double> shape, double initialSlope)
    {
        // Slope of 1/u = (y0 − y_end)/(y − y_end) against t, over points still more than 30 % from the end value.
        var span = y0 - yEnd;
        double sx = 0, sy = 0, sxx = 0, sxy = 0; var m = 0;
        for (var i = 0; i < t.Length; i++)
        {
            var u = (y[i] - yEnd) / span;
            if (!(u > 0.3)) continue;
            var inv = 1 / u;
            sx += t[i]; sy += inv; sxx += t[i] * t[i]; sxy += t[i] * inv; m++;
        }
        var slope = m >= 3 ? (m * sxy - sx * sy) / (m * sxx - sx * sx) : double.NaN;
        return double.IsFinite(slope) && slope > 0 ? slope / a0 : base.GuessKk(t, y, y0, yEnd, a0, shape, initialSlope);
    }
}
