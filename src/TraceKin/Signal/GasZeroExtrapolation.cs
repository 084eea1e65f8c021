using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// A gas collector zeroed after mixing (a syringe set to zero when the flask is stoppered) misses the gas formed
/// before its zero. The reading it would have shown at mixing is found by extrapolation: a quadratic fitted by least
/// squares to the first samples, V(t) = c0 + c1·t + c2·t², evaluated at t = 0 (times are from mixing), so c0 ≤ 0 is
/// the lost gas with the opposite sign and serves as the zero offset (a local polynomial extrapolated to t0, as the
/// initial-rate estimator does; Savitzky &amp; Golay 1964, Anal. Chem. 36, 1627).
/// </summary>
internal static class GasZeroExtrapolation
{
    /// <summary>Smallest number of samples fitted (three parameters and at least one degree of freedom more than two).</summary>
    public const int MinimumPoints = 6;

    /// <summary>The fitted reading at mixing (internal unit, L), its standard error and the number of samples used.</summary>
    public static (double Zero, double StdError, int Points) AtMixing(RunExport export, string? channelName, string settingsFile)
    {
        // Extrapolating to mixing needs the moment of mixing: an export whose times start at its first sample cannot say
        // how much gas was made before it.
        var timeZero = export.Detected.FirstOrDefault(kv => kv.Key == "time zero").Value ?? "";
        if (timeZero.Length == 0 || timeZero.StartsWith("first sample", StringComparison.Ordinal))
            throw Fail.Setting(settingsFile, "signal.zeroed_after_mixing", $"{Fail.Quote(export.File)}, whose times start at its first sample",
                "an export that states the moment of mixing, so the gas made before the collector's zero can be extrapolated",
                "add a preamble line such as \"mixed at: -20 s\" (the moment of mixing on the export's time scale); see docs/formats.md, Time");
        var channel = export.Channel(channelName);
        var t = channel.Times;
        var v = channel.Values;
        if (t.Length < MinimumPoints)
            throw Fail.Setting(settingsFile, "signal.zeroed_after_mixing", $"a trace of {t.Length} samples",
                $"at least {MinimumPoints} samples to extrapolate the gas lost before the collector's zero");
        // The first tenth of the recorded time, but never fewer than MinimumPoints samples: early enough that a
        // quadratic follows the curve, long enough to average the noise (common practice, no source).
        var end = t[0] + 0.1 * (t[^1] - t[0]);
        var n = 0;
        while (n < t.Length && (t[n] <= end || n < MinimumPoints)) n++;
        var ts = new double[n];
        var vs = new double[n];
        for (var i = 0; i < n; i++) { ts[i] = t[i]; vs[i] = v[i]; }
        var fit = LinearLeastSquares.Polynomial(ts, vs, 2);
        var c0 = fit.Parameters[0];
        if (!fit.Converged || !double.IsFinite(c0.Value))
            throw Fail.Setting(settingsFile, "signal.zeroed_after_mixing", $"an extrapolation that failed ({fit.ExitDetail})",
                "early samples a quadratic can be fitted to");
        return (c0.Value, c0.StdError, n);
    }
}
