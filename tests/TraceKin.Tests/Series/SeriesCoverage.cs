using TraceKin.Rates;
using TraceKin.Series;
using TraceKin.Tests.Rates;

namespace TraceKin.Tests.Series;

/// <summary>
/// A series-level coverage study (invented series with a known truth; fixed seeds): each replicate is a series of N runs
/// whose traces follow the exact A + B law, [A] = Δ·[A]0/([B]0·e^(Δkt) − [A]0) with Δ = [B]0 − [A]0 (closed form,
/// common practice, no source), 200 readings to 95 % conversion, noise 0.5 % of [A]0, optionally with spikes or a
/// drift of 5 % of the signal range over the run as in the Rates tests. Each run goes through the Rates stage, the series through the Series stage, and the
/// study counts how often the 95 % intervals of n(A), n(B) and k contain the truth (orders 1 and 1, k = 0.5 L/(mol·s)).
/// "first": [B]0 in a 6- to 100-fold excess; "mixed": [B]0 only 2- to 10-fold above [A]0.
/// Shared by the tests (small N) and bench/TraceKin.Bench.Coverage (N = 200).
/// </summary>
internal static class SeriesCoverage
{
    public const double K = 0.5;

    public sealed record Result(string Law, int Runs, string Condition, int Series, double OrderA, double OrderB, double RateConstant,
        double RateConstantFree, double MeanRunError, double MeanKError)
    {
        public override string ToString() => FormattableString.Invariant(
            $"{Law}, N = {Runs}, {Condition}: {Series} series; 95 % intervals cover n(A) {OrderA:P1}, n(B) {OrderB:P1}, k {RateConstant:P1} (k at the fitted orders {RateConstantFree:P1}); mean run error {MeanRunError:P3}, mean k error {MeanKError:P3}");
    }

    public static Result Run(string law, int runsPerSeries, int series, string condition, int firstSeed)
    {
        int coverA = 0, coverB = 0, coverK = 0, coverKFree = 0, done = 0;
        double runErr = 0, kErr = 0; var runCount = 0;
        for (var rep = 0; rep < series; rep++)
        {
            var rng = new Random(firstSeed + 7919 * rep + runsPerSeries);
            var runs = new List<RunPoint>();
            for (var i = 0; i < runsPerSeries; i++)
            {
                var a0 = 0.002 * Math.Pow(4, rng.NextDouble());
                var b0 = law == "first" ? 0.05 * Math.Pow(4, rng.NextDouble()) : a0 * (2 + 3 * rng.NextDouble()) * Math.Pow(2, rng.NextDouble());
                double Truth(double t) => SyntheticTrace.MixedSecondOrder(K, a0, b0, t);
                var tEnd = 0.5;
                while (Truth(tEnd) > 0.05 * a0 && tEnd < 4000) tEnd += 0.5;
                var trace = SyntheticTrace.Make(Truth, tEnd, 200, 0.005 * a0, rng.Next(), condition == "spikes" ? 0.01 : 0, condition == "drift" ? 0.05 : 0);
                var r = RateAnalysis.Analyse(trace, -1, a0, RateSettings.Default, $"R{i}", b0);
                runErr += r.Headline.Value / (K * a0 * b0) - 1; runCount++;
                if (!r.IsResolved) continue;
                runs.Add(new RunPoint($"R{i}", r.Headline.Value, r.Headline.StdError, new Dictionary<string, double> { ["A"] = a0, ["B"] = b0 }, 298.15)
                {
                    RateSystematicError = r.Headline.ModelStdError,
                });
            }
            var f = OrderAnalysis.Analyse(runs, ModelSettings.Default with { Laws = ["power"] });
            if (f.Orders.Count < 2 || f.RateConstant is null || f.RateConstantAtFittedOrders is null) continue;
            done++;
            var oa = f.Orders.Single(o => o.Species == "A");
            var ob = f.Orders.Single(o => o.Species == "B");
            if (oa.Ci95Low <= 1 && 1 <= oa.Ci95High) coverA++;
            if (ob.Ci95Low <= 1 && 1 <= ob.Ci95High) coverB++;
            if (f.RateConstant.Ci95Low <= K && K <= f.RateConstant.Ci95High) coverK++;
            if (f.RateConstantAtFittedOrders.Ci95Low <= K && K <= f.RateConstantAtFittedOrders.Ci95High) coverKFree++;
            kErr += f.RateConstant.Value / K - 1;
        }
        return new Result(law, runsPerSeries, condition, done, (double)coverA / done, (double)coverB / done, (double)coverK / done,
            (double)coverKFree / done, runErr / runCount, kErr / done);
    }
}
