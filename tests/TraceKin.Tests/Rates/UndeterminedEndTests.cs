using TraceKin.Fitting;
using TraceKin.Rates;

namespace TraceKin.Tests.Rates;

/// <summary>
/// The integrated-law fitter's second attempt when the data do not determine the end level: it is decided on the
/// singular fit's <see cref="FitResult.SingularParameter"/>, never on the wording of its message.
/// </summary>
public sealed class UndeterminedEndTests
{
    [Fact]
    public void A_straight_trace_with_a_known_start_has_its_end_held_fixed_by_the_second_attempt()
    {
        // A straight line has no curvature to place the end level (common practice, no source); invented values.
        var t = Enumerable.Range(0, 60).Select(i => i * 10.0).ToArray();
        var y = t.Select(x => 1.0 - 1e-4 * x).ToArray();
        var w = t.Select(_ => 1.0).ToArray();
        var sel = IntegratedLawFitter.Fit(t, y, w, -1, 1.0, null, "none");
        var fit = sel.Fits.Single(f => f.Law == "zero order + drift").Fit;
        Assert.Equal(FitExit.Converged, fit.Exit);
        Assert.EndsWith("end value held fixed (not determined by the trace)", fit.ExitDetail, StringComparison.Ordinal);
        Assert.False(fit["yEnd"].Varied);
    }
}
