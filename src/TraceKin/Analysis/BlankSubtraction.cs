using System.Globalization;
using TraceKin.Rates;
using TraceKin.Setup;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Analysis;

/// <summary>
/// A blank subtracted from a run's signal point by point before conversion: one blank run's trace, or the mean of a
/// group of blank runs (plan columns `subtract`, `role`, `group`; docs/methods.md, "Blank wells").
/// The blank's point-to-point noise is in the corrected trace and so in the fit's residuals; what the residuals cannot
/// see is the error of the blank's own slope, common to every point, which is added in quadrature to the initial
/// rate's standard error (<see cref="CarryUncertainty"/>).
/// </summary>
internal sealed record BlankSubtraction(string What, double[] Mean, double[] Times, IReadOnlyList<string> Members, double SlopeStdError, string SignalUnit)
{
    /// <summary>The blank for a run, or a located problem (at the run's subtract cell) when a blank cannot be read.</summary>
    /// <param name="made">Blanks already made in this analysis, by what they subtract: the mean of a group is the same
    /// for every run of the plate that subtracts it (at the same times), so it is made once, not once per well.</param>
    public static BlankSubtraction Of(PlanRow row, Trace own, IReadOnlyList<(PlanRow Row, SeriesRunner.ExportRead Read)> blanks, SeriesConfig config,
        System.Collections.Concurrent.ConcurrentDictionary<string, BlankSubtraction>? made = null)
    {
        var key = made is null ? null : string.Join('\n', blanks.Select(b => b.Row.Run).Prepend(row.Subtract ?? ""));
        if (key is not null && made!.TryGetValue(key, out var done) && done.SignalUnit == own.Unit && done.Times.AsSpan().SequenceEqual(own.Times)) return done;
        var blank = Make(row, own, blanks, config);
        if (key is not null) made!.TryAdd(key, blank);
        return blank;
    }

    private static BlankSubtraction Make(PlanRow row, Trace own, IReadOnlyList<(PlanRow Row, SeriesRunner.ExportRead Read)> blanks, SeriesConfig config)
    {
        var traces = new List<Trace>();
        foreach (var (b, read) in blanks)
        {
            string? why = read.AtFile is { } f ? f.Found
                : read.Parse is { } p ? p.Message
                : read.Defect is { } d ? $"an internal error ({d.GetType().Name}: {d.Message})" : null;
            Trace? trace = null;
            if (why is null)
            {
                var name = b.Channel ?? config.Signal.Channel;
                trace = name is null ? (read.Export!.Channels.Count == 1 ? read.Export.Channels[0] : null) : read.Export!.FindChannel(name);
                if (trace is null) why = $"its channel {Fail.Quote(name ?? "(none named)")} is not in {Fail.Quote(b.File)}";
            }
            if (why is not null)
                throw At(row, $"blank run {Fail.Quote(b.Run)}, which is itself rejected: {why}", "a blank run that reads", "fix the blank run first, or subtract another blank");
            if (!trace!.Times.AsSpan().SequenceEqual(own.Times))
                throw At(row, $"blank run {Fail.Quote(b.Run)} with {trace.Count} readings at other times than this run's {own.Count}",
                    "a blank read at the same times (the same plate export)", "a saturated reading taken out of one well also moves its times");
            traces.Add(trace);
        }
        var n = own.Count;
        var mean = new double[n];
        foreach (var t in traces)
            for (var i = 0; i < n; i++) mean[i] += t.Values[i] / traces.Count;
        // The slope's standard error: between wells when there are several (the spread of their own slopes, over √m),
        // else the ordinary least-squares error of the one blank's slope (residual scatter), both in signal units per s.
        double se;
        if (traces.Count >= 2)
        {
            var slopes = traces.Select(t => Slope(t.Times, t.Values).Slope).ToArray();
            var avg = slopes.Average();
            var sd = Math.Sqrt(slopes.Sum(x => (x - avg) * (x - avg)) / (slopes.Length - 1));
            se = sd / Math.Sqrt(slopes.Length);
        }
        else se = Slope(own.Times, mean).StdError;
        var what = blanks.Count == 1 && blanks[0].Row.Role != "blank" || blanks.Count == 1 && blanks[0].Row.Group != row.Subtract ? $"run {blanks[0].Row.Run}" : $"the mean of {blanks.Count} blank run(s) of group {row.Subtract}";
        return new BlankSubtraction(what, mean, own.Times, blanks.Select(b => b.Row.Run).ToList(), se, own.Unit);
    }

    /// <summary>The export with the run's channel corrected (signal − blank, point by point).</summary>
    public RunExport Apply(RunExport export, string? channel)
    {
        var own = export.Channel(channel);
        var corrected = new double[own.Count];
        for (var i = 0; i < corrected.Length; i++) corrected[i] = own.Values[i] - Mean[i];
        var replaced = own with { Values = corrected };
        return export with { Channels = export.Channels.Select(c => ReferenceEquals(c, own) ? replaced : c).ToArray() };
    }

    /// <summary>
    /// Adds the blank slope's error to the initial rate's standard error: u_v² = u_fit² + (s·u_b/|ν|)², with s the
    /// conversion's d[X]/d(signal) (the least-squares slope of concentration on the corrected signal, exact for a
    /// linear conversion) and ν the coefficient; propagation of uncertainty for a sum (JCGM 100:2008, GUM, §5.1.2).
    /// </summary>
    public (ConvertedRun, RunRates) CarryUncertainty(ConvertedRun converted, RunRates rates, Trace corrected)
    {
        var scale = Math.Abs(Slope(corrected.Values, converted.Concentration.Values).Slope);
        var added = double.IsFinite(scale) && converted.Coefficient != 0 ? scale * SlopeStdError / Math.Abs(converted.Coefficient) : 0;
        var h = rates.Headline;
        var widened = h with { StdError = Math.Sqrt(h.StdError * h.StdError + added * added) };
        var estimates = rates.Estimates.Select(e => ReferenceEquals(e, h) ? widened : e).ToList();
        var ci = CultureInfo.InvariantCulture;
        var note = string.Create(ci, $"{What} subtracted point by point ({string.Join(", ", Members.Take(8))}{(Members.Count > 8 ? ", …" : "")}); its slope's standard error {SlopeStdError:G3} {SignalUnit}/s adds {added:G3} {h.Unit} in quadrature to the initial rate's standard error");
        return (converted with { ConstantsUsed = [.. converted.ConstantsUsed, new("blank subtracted", note)] },
            rates with { Headline = widened, Estimates = estimates });
    }

    /// <summary>Ordinary least-squares slope of y on x and its standard error (common practice, no source).</summary>
    internal static (double Slope, double StdError) Slope(double[] x, double[] y)
    {
        var n = Math.Min(x.Length, y.Length);
        if (n < 3) return (double.NaN, 0);
        double mx = 0, my = 0;
        for (var i = 0; i < n; i++) { mx += x[i]; my += y[i]; }
        mx /= n; my /= n;
        double sxx = 0, sxy = 0;
        for (var i = 0; i < n; i++) { sxx += (x[i] - mx) * (x[i] - mx); sxy += (x[i] - mx) * (y[i] - my); }
        if (sxx <= 0) return (double.NaN, 0);
        var b = sxy / sxx;
        double rss = 0;
        for (var i = 0; i < n; i++) { var r = y[i] - my - b * (x[i] - mx); rss += r * r; }
        return (b, Math.Sqrt(rss / (n - 2) / sxx));
    }

    private static InputException At(PlanRow row, string found, string expected, string hint) =>
        new(new Problem(SeriesRunner.PlanFile, row.SubtractCell.Line > 0 ? row.SubtractCell.Line : row.Line, Math.Max(1, row.SubtractCell.Column), found, expected, hint) { Input = row.File });
}
