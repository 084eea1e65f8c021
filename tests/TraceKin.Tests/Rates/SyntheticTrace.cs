using TraceKin.Traces;

namespace TraceKin.Tests.Rates;

/// <summary>
/// Synthetic traces from closed-form integrated rate laws (common practice, no source) for the reactant A, with
/// Gaussian noise from a fixed seed (Box–Muller), optional spikes and a linear baseline drift.
/// Rate of reaction v = k·Π[X]^n; d[A]/dt = −v for ν = −1.
/// </summary>
internal static class SyntheticTrace
{
    public static double FirstOrder(double k, double a0, double t) => a0 * Math.Exp(-k * t);
    public static double SecondOrder(double k, double a0, double t) => a0 / (1 + k * a0 * t);
    public static double ZeroOrder(double k, double a0, double t) => Math.Max(a0 - k * t, 0);

    /// <summary>A + B → P with [B]0 ≠ [A]0: [A] = Δ·[A]0 / ([B]0·e^(Δkt) − [A]0), Δ = [B]0 − [A]0.</summary>
    public static double MixedSecondOrder(double k, double a0, double b0, double t)
    {
        var d = b0 - a0;
        return d * a0 / (b0 * Math.Exp(d * k * t) - a0);
    }

    public static Trace Make(Func<double, double> truth, double tEnd, int points, double noise, int seed,
        double spikeFraction = 0, double driftFraction = 0)
    {
        var rng = new Random(seed);
        var t = new double[points];
        var y = new double[points];
        for (var i = 0; i < points; i++) { t[i] = tEnd * i / (points - 1); y[i] = truth(t[i]); }
        var range = y.Max() - y.Min();
        for (var i = 0; i < points; i++)
        {
            y[i] += noise * Gaussian(rng);
            y[i] += driftFraction * range * t[i] / tEnd;
        }
        var spikes = (int)Math.Round(spikeFraction * points);
        for (var s = 0; s < spikes; s++)
        {
            var i = 5 + rng.Next(points - 10);
            y[i] += (rng.Next(2) == 0 ? -1 : 1) * (0.1 + 0.2 * rng.NextDouble()) * range;
        }
        return new Trace("A", Quantity.Concentration, "mol/L", t, y);
    }

    /// <summary>Standard normal deviate by the Box–Muller transform (Box &amp; Muller 1958, Ann. Math. Stat. 29, 610).</summary>
    public static double Gaussian(Random rng)
    {
        var u1 = 1.0 - rng.NextDouble();
        var u2 = rng.NextDouble();
        return Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }
}
