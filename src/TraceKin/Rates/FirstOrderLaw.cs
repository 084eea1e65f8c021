namespace TraceKin.Rates;

/// <summary>
/// First order: d[A]/dt = −kk·[A], u = exp(−kk·t), t½ = ln 2 / kk. Closed-form integrated rate law, common practice,
/// no source. Start from the ln-linearisation ln|y − y_end| = ln|y0 − y_end| − kk·t over the early trace.
/// </summary>
public class FirstOrderLaw : RateLaw
{
    public override string Name => "first order";
    public override double? OverallOrder => 1;

    public override double Fraction(double t, double kk, double a0, ReadOnlySpan<double> shape, Span<double> grad)
    {
        var u = Math.Exp(-kk * t);
        grad[0] = -t * u;
        grad[1] = 0;
        return u;
    }

    public override double InitialFactor(double a0, ReadOnlySpan<double> shape) => 1;
    public override double HalfLife(double kk, double a0, ReadOnlySpan<double> shape) => Math.Log(2) / kk;

    public override double GuessKk(ReadOnlySpan<double> t, ReadOnlySpan<double> y, double y0, double yEnd, double a0, ReadOnlySpan<double> shape, double initialSlope)
    {
        // Least-squares slope of ln|y − y_end| over points still more than 30 % from the end value.
        var span = Math.Abs(y0 - yEnd);
        double sx = 0, sy = 0, sxx = 0, sxy = 0; var m = 0;
        for (var i = 0; i < t.Length; i++)
        {
            var d = Math.Abs(y[i] - yEnd);
            if (d < 0.3 * span) continue;
            var l = Math.Log(d);
            sx += t[i]; sy += l; sxx += t[i] * t[i]; sxy += t[i] * l; m++;
        }
        var slope = m >= 3 ? (m * sxy - sx * sy) / (m * sxx - sx * sx) : double.NaN;
        return double.IsFinite(slope) && slope < 0 ? -slope : base.GuessKk(t, y, y0, yEnd, a0, shape, initialSlope);
    }
}
