using TraceKin.Reports;
using TraceKin.Series;

namespace TraceKin.Planning;

/// <summary>
/// The standard error an initial rate is expected to carry at a new run, se(v0) = c·v0^p with 0 ≤ p ≤ 1: p = 0 is a constant
/// error, p = 1 a constant relative error. From a series, ln se = ln c + p·ln v0 is fitted to the runs' own standard errors
/// (the weights TraceKin's series fits use are 1/se², <see cref="OrderAnalysis.RateWeights"/>), p clipped to [0, 1]; with
/// fewer than three runs or rates spanning less than 10 % the median relative error is used (p = 1).
/// </summary>
public sealed record RateNoise(double Scale, double Exponent)
{
    public double StdError(double rate) => Scale * Math.Pow(Math.Abs(rate), Exponent);

    public static RateNoise Constant(double se) => new(se, 0);
    public static RateNoise Relative(double fraction) => new(fraction, 1);

    public static RateNoise FromRuns(IReadOnlyList<RunPoint> runs)
    {
        var ok = runs.Where(r => r.Rate > 0 && r.RateStdError > 0 && double.IsFinite(r.RateStdError)).ToList();
        if (ok.Count == 0) throw new ArgumentException("no run with a positive rate and standard error");
        var x = ok.Select(r => Math.Log(r.Rate)).ToArray();
        var y = ok.Select(r => Math.Log(r.RateStdError)).ToArray();
        var mx = x.Average();
        var sxx = x.Sum(v => (v - mx) * (v - mx));
        if (ok.Count < 3 || Math.Exp(x.Max() - x.Min()) < 1.1 || sxx <= 0)
            return Relative(Math.Exp(y.Zip(x, (a, b) => a - b).Order().ElementAt(ok.Count / 2)));
        var my = y.Average();
        var p = Math.Clamp(x.Zip(y, (a, b) => (a - mx) * (b - my)).Sum() / sxx, 0, 1);
        // Intercept refitted at the clipped slope: ln c = mean(ln se − p·ln v0).
        var lnc = y.Zip(x, (a, b) => a - p * b).Average();
        return new RateNoise(Math.Exp(lnc), p);
    }

    public string Describe() => Exponent switch
    {
        0 => $"constant standard error {ReportNumber.Plain(Scale, 3)} mol/(L·s)",
        1 => $"constant relative standard error {ReportNumber.Plain(100 * Scale, 3)} %",
        _ => $"se(v0) = {ReportNumber.Plain(Scale, 3)}·v0^{ReportNumber.Plain(Exponent, 2)} (fitted to the runs' standard errors)",
    };
}
