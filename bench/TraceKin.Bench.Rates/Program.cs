using System.Diagnostics;
using System.Globalization;
using TraceKin.Rates;
using TraceKin.Traces;
using Trace = TraceKin.Traces.Trace;

// Times the Rates stage (spikes, every integrated law with and without drift, three initial-rate estimators) on
// synthetic first- and second-order traces (invented: closed-form laws, Gaussian noise 0.4 % of [A]0, 0.5 % spikes,
// fixed seeds). Usage: dotnet run -c Release --project bench/TraceKin.Bench.Rates -- [traces=1000] [points=10000]
var ci = CultureInfo.InvariantCulture;
var traces = args.Length > 0 ? int.Parse(args[0], ci) : 1000;
var points = args.Length > 1 ? int.Parse(args[1], ci) : 10000;
const double a0 = 0.05;

Trace Make(int seed)
{
    var rng = new Random(seed);
    var t = new double[points];
    var y = new double[points];
    var second = seed % 2 == 1;
    for (var i = 0; i < points; i++)
    {
        t[i] = 400.0 * i / (points - 1);
        var truth = second ? a0 / (1 + 0.5 * a0 * t[i]) : a0 * Math.Exp(-0.01 * t[i]);
        // Box–Muller normal deviate (Box & Muller 1958).
        var g = Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
        y[i] = truth + 2e-4 * g;
        if (rng.NextDouble() < 0.005) y[i] += 0.01;
    }
    return new Trace("A", Quantity.Concentration, "mol/L", t, y);
}

// Warm-up (JIT) outside the timing.
RateAnalysis.Analyse(Make(-1), -1, a0, RateSettings.Default, "warm-up");
var times = new List<double>(traces);
var total = Stopwatch.StartNew();
double worstBias = 0;
for (var s = 0; s < traces; s++)
{
    var trace = Make(s);
    var sw = Stopwatch.StartNew();
    var r = RateAnalysis.Analyse(trace, -1, a0, RateSettings.Default, $"trace {s}");
    times.Add(sw.Elapsed.TotalMilliseconds);
    var truth = s % 2 == 1 ? 0.5 * a0 * a0 : 0.01 * a0;
    var err = Math.Abs(r.Headline.Value / truth - 1);
    worstBias = Math.Max(worstBias, err);
    if (err > 0.01)
        Console.WriteLine(string.Format(ci, "  trace {0}: v0 off by {1:P2} ({2}; {3})", s, err, r.Headline.Method, r.HeadlineRule));
}
total.Stop();
times.Sort();
double Pct(double p) => times[Math.Min(times.Count - 1, (int)Math.Ceiling(p * times.Count) - 1)];
Console.WriteLine(string.Format(ci, "{0} traces x {1} points: total {2:F1} s, per trace mean {3:F1} ms, p50 {4:F1} ms, p95 {5:F1} ms; worst |v0 error| {6:P2}; load average {7}",
    traces, points, total.Elapsed.TotalSeconds, times.Average(), Pct(0.5), Pct(0.95), worstBias,
    File.Exists("/proc/loadavg") ? File.ReadAllText("/proc/loadavg").Split(' ')[0] : "n/a"));
