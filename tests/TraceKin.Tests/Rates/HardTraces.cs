using TraceKin.Traces;

namespace TraceKin.Tests.Rates;

/// <summary>
/// A seeded battery of short, awkward traces (invented, for checking the Rates stage against its own known truth):
/// 40–80 readings at 10–60 % conversion, rising product curves and falling reactant curves, with spikes of 1–3
/// consecutive samples, a linear baseline drift, a dead time before the first reading, or all of these.
/// Truths are closed-form or exactly solved rate laws (common practice, no source): v0 = k·[A]0 (first order),
/// k·[A]0² (second order), Vmax·[S]0/(Km + [S]0) (Michaelis–Menten, product P with [S] = [S]0 − [P]; its integrated
/// form Vmax·t = [P] + Km·ln([S]0/([S]0 − [P])), Schnell &amp; Maini 2003, Comments Theor. Biol. 8, 169, from memory).
/// </summary>
internal static class HardTraces
{
    /// <summary>One battery case: the trace, what it is, and the true initial rate of reaction.</summary>
    public sealed record Case(string Name, Trace Trace, double Coefficient, double? Reference, double TrueRate, double Conversion, string Artefact);

    public static readonly string[] Kinds = ["product-mm", "product-first", "reactant-first", "reactant-second"];
    public static readonly string[] Artefacts = ["clean", "spikes", "drift", "dead-time", "all"];

    /// <summary>Michaelis–Menten product at time t: solves Vmax·t = P + Km·ln(S0/(S0 − P)) by bisection (monotone in P).</summary>
    public static double MichaelisMentenProduct(double vmax, double km, double s0, double t)
    {
        double lo = 0, hi = s0;
        for (var it = 0; it < 200; it++)
        {
            var mid = 0.5 * (lo + hi);
            var f = mid + km * Math.Log(s0 / (s0 - mid)) - vmax * t;
            if (f > 0) hi = mid; else lo = mid;
        }
        return 0.5 * (lo + hi);
    }

    /// <summary>Time at which the Michaelis–Menten reaction reaches a conversion fraction x.</summary>
    public static double MichaelisMentenTime(double vmax, double km, double s0, double x) =>
        (x * s0 + km * Math.Log(1 / (1 - x))) / vmax;

    public static Case Make(string kind, string artefact, int seed)
    {
        var rng = new Random(seed);
        var points = 40 + rng.Next(41);
        var conversion = 0.10 + 0.50 * rng.NextDouble();
        Func<double, double> truth;
        double tEnd, trueRate, coefficient; double? reference;
        switch (kind)
        {
            case "product-mm":
            {
                const double km = 5e-4; // 0.5 mmol/L
                var s0 = km * Math.Exp(Math.Log(0.2) + rng.NextDouble() * Math.Log(25)); // 0.2–5 Km
                const double vmax = 2e-7; // mol/(L·s)
                tEnd = MichaelisMentenTime(vmax, km, s0, conversion);
                truth = t => MichaelisMentenProduct(vmax, km, s0, t);
                trueRate = vmax * s0 / (km + s0);
                coefficient = 1; reference = null;
                break;
            }
            case "product-first":
            {
                const double a0 = 2e-4, k = 0.004;
                tEnd = -Math.Log(1 - conversion) / k;
                truth = t => a0 * (1 - Math.Exp(-k * t));
                trueRate = k * a0; coefficient = 1; reference = null;
                break;
            }
            case "reactant-first":
            {
                const double a0 = 0.02, k = 0.002;
                tEnd = -Math.Log(1 - conversion) / k;
                truth = t => a0 * Math.Exp(-k * t);
                trueRate = k * a0; coefficient = -1; reference = a0;
                break;
            }
            case "reactant-second":
            {
                const double a0 = 0.02, k = 0.05;
                tEnd = conversion / (1 - conversion) / (k * a0);
                truth = t => a0 / (1 + k * a0 * t);
                trueRate = k * a0 * a0; coefficient = -1; reference = a0;
                break;
            }
            default: throw new ArgumentException(kind);
        }
        var deadTime = artefact is "dead-time" or "all" ? (0.03 + 0.05 * rng.NextDouble()) * tEnd : 0;
        var change = Math.Abs(truth(tEnd) - truth(0));
        var noise = (0.005 + 0.015 * rng.NextDouble()) * change;
        var drift = artefact is "drift" or "all" ? (rng.Next(2) == 0 ? -1 : 1) * (0.01 + 0.02 * rng.NextDouble()) * change / tEnd : 0;
        var t = new double[points];
        var y = new double[points];
        for (var i = 0; i < points; i++)
        {
            t[i] = deadTime + (tEnd - deadTime) * i / (points - 1);
            y[i] = truth(t[i]) + drift * t[i] + noise * SyntheticTrace.Gaussian(rng);
        }
        if (artefact is "spikes" or "all")
        {
            // 1–2 % of readings in bursts of 1–3 consecutive samples, each displaced by 30–300× the noise.
            var spiky = Math.Max(1, (int)Math.Round((0.01 + 0.01 * rng.NextDouble()) * points));
            var placed = 0;
            while (placed < spiky)
            {
                var burst = Math.Min(1 + rng.Next(3), spiky - placed);
                var start = 2 + rng.Next(points - 4 - burst);
                var size = (rng.Next(2) == 0 ? -1 : 1) * noise * (30 + 270 * rng.NextDouble());
                for (var b = 0; b < burst; b++) y[start + b] += size * (0.8 + 0.4 * rng.NextDouble());
                placed += burst;
            }
        }
        var name = $"{kind}/{artefact}/{seed}";
        return new Case(name, new Trace("X", Quantity.Concentration, "mol/L", t, y), coefficient, reference, trueRate, conversion, artefact);
    }

    /// <summary>A clean Michaelis–Menten product curve at a given [S]0: 40–80 readings, 10–60 % conversion, noise
    /// 0.5–2 % of the product formed, all drawn from the seed.</summary>
    public static Case MakeProductCurve(double vmax, double km, double s0, int seed)
    {
        var rng = new Random(seed);
        var points = 40 + rng.Next(41);
        var conversion = 0.10 + 0.50 * rng.NextDouble();
        var tEnd = MichaelisMentenTime(vmax, km, s0, conversion);
        var change = MichaelisMentenProduct(vmax, km, s0, tEnd);
        var noise = (0.005 + 0.015 * rng.NextDouble()) * change;
        var t = new double[points];
        var y = new double[points];
        for (var i = 0; i < points; i++)
        {
            t[i] = tEnd * i / (points - 1);
            y[i] = MichaelisMentenProduct(vmax, km, s0, t[i]) + noise * SyntheticTrace.Gaussian(rng);
        }
        return new Case($"mm/{s0:G3}/{seed}", new Trace("P", Quantity.Concentration, "mol/L", t, y), 1, null, vmax * s0 / (km + s0), conversion, "clean");
    }

    /// <summary>Every kind × artefact, <paramref name="draws"/> seeds each.</summary>
    public static IEnumerable<Case> Battery(int draws, int firstSeed = 1)
    {
        foreach (var kind in Kinds)
            foreach (var artefact in Artefacts)
                for (var d = 0; d < draws; d++)
                    yield return Make(kind, artefact, firstSeed + 1000 * Array.IndexOf(Kinds, kind) + 100 * Array.IndexOf(Artefacts, artefact) + d);
    }
}
