using System.Globalization;
using TraceKin.Series;
using TraceKin.Tests.Fitting;

namespace TraceKin.Tests.Series;

/// <summary>The saturation law against published fits (Puromycin, NIST StRD Misra1d) and a synthetic saturating series.</summary>
public class SaturationTests
{
    internal static (double[] Conc, double[] Rate) PuromycinTreated()
    {
        var lines = File.ReadAllLines(Path.Combine(AppContext.BaseDirectory, "TestData", "kinetics", "puromycin.csv")).Skip(1)
            .Select(l => l.Split(',')).Where(p => p[2] == "treated").ToArray();
        return (lines.Select(p => double.Parse(p[0], CultureInfo.InvariantCulture)).ToArray(),
                lines.Select(p => double.Parse(p[1], CultureInfo.InvariantCulture)).ToArray());
    }

    [Fact]
    public void Puromycin_treated_subset_gives_the_published_Vm_and_K_with_their_standard_errors()
    {
        // R Core Team, "An Introduction to R", §11.7.1 (nls on Puromycin, treated); Bates & Watts (1988), App. A1.3 and ch. 2.
        // Exact optimum recomputed in 40 digits (TestData/kinetics/puromycin.md): Vm 212.683743143, K 0.0641212816816.
        var (x, v) = PuromycinTreated();
        var fit = SaturationAnalysis.FitHyperbola(x, v);
        AssertPublishedTreatedFit(fit);
        Assert.Equal(0.7651, fit.Correlation![0, 1], 1e-4);
    }

    /// <summary>The published nls fit of the treated subset (same sources as above): Vm, K, their standard errors, RSS.</summary>
    internal static void AssertPublishedTreatedFit(TraceKin.Fitting.FitResult fit)
    {
        Assert.True(fit.Converged, fit.ExitDetail);
        Assert.Equal(212.68374, fit.Value("Vmax"), 1e-4);
        Assert.Equal(0.06412128, fit.Value("Km"), 1e-7);
        Assert.Equal(6.94716, fit["Vmax"].StdError, 6.94716 * 1e-5);
        Assert.Equal(0.00828095, fit["Km"].StdError, 0.00828095 * 1e-5);
        Assert.Equal(1195.449, fit.ChiSquare, 1e-3);
    }

    [Fact]
    public void Puromycin_as_a_series_prefers_saturation_over_the_power_law()
    {
        // Same published data (Bates & Watts 1988) fed through the series front door without rate errors (equal weights).
        var (x, v) = PuromycinTreated();
        var runs = x.Select((c, i) => new RunPoint($"P{i + 1}", v[i], 0, new Dictionary<string, double> { ["S"] = c }, 310.15)).ToList();
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        Assert.Equal("saturation", f.ChosenLaw);
        var s = f.Saturation!;
        Assert.Equal(212.68374, s.Vmax.Value, 1e-4);
        Assert.Equal(0.06412128, s.Km.Value, 1e-7);
        Assert.Equal(6.947, s.Vmax.StdError, 1e-3);
        Assert.True(s.EvidenceRatio > 10);
        Assert.Contains(f.Warnings, w => w.Code == "power-law-wrong-shape");
        // The double-reciprocal line is only a cross-check and does not reproduce the least-squares optimum
        // (puromycin.md: "A Lineweaver–Burk linear fit ... will not reproduce these values").
        Assert.NotNull(s.CrossCheck);
        Assert.True(Math.Abs(s.CrossCheck!.Vmax - s.Vmax.Value) > 1);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    public void Misra1d_hyperbola_matches_NIST_certified_values(int startIndex)
    {
        // NIST StRD Misra1d: y = b1·b2·x/(1 + b2·x) = Vmax·x/(Km + x) with Vmax = b1 and Km = 1/b2; se(b2) = se(Km)/Km²
        // (the linearised covariance transforms exactly under a smooth reparameterisation).
        var d = NistStrdFile.Read("nonlinear", "Misra1d.dat");
        var x = d.X.Select(r => r[0]).ToArray();
        var model = SaturationModel.Hyperbola(x);
        var b = d.Starts[startIndex];
        var fit = TraceKin.Fitting.NonlinearLeastSquares.Fit(model, d.Y, [b[0], 1 / b[1]]);
        Assert.True(fit.Converged, fit.ExitDetail);
        var km = fit.Value("Km");
        Assert.True(NistStrdFile.Lre(fit.Value("Vmax"), d.Certified[0]) >= 6);
        Assert.True(NistStrdFile.Lre(1 / km, d.Certified[1]) >= 6);
        Assert.True(NistStrdFile.Lre(fit["Vmax"].StdError, d.CertifiedSd[0]) >= 5);
        Assert.True(NistStrdFile.Lre(fit["Km"].StdError / (km * km), d.CertifiedSd[1]) >= 5);
        Assert.Equal(d.ResidualSumOfSquares, fit.ChiSquare, d.ResidualSumOfSquares * 1e-8);
    }

    [Fact]
    public void Misra1d_from_the_data_driven_start_matches_NIST()
    {
        // NIST StRD Misra1d certified values, starting from SaturationModel.Guess instead of NIST's starts.
        var d = NistStrdFile.Read("nonlinear", "Misra1d.dat");
        var fit = SaturationAnalysis.FitHyperbola(d.X.Select(r => r[0]).ToArray(), d.Y);
        Assert.True(NistStrdFile.Lre(fit.Value("Vmax"), d.Certified[0]) >= 6);
        Assert.True(NistStrdFile.Lre(1 / fit.Value("Km"), d.Certified[1]) >= 6);
    }

    [Fact]
    public void Synthetic_saturating_series_prefers_saturation_and_flags_the_power_law()
    {
        // Truth: v0 = 4e-5·[S]/(2e-3 + [S]) mol/(L·s), [S]0 from Km/5 to 10·Km, 2 % noise (invented series, seed 21).
        var rng = new Random(21);
        var s = new[] { 0.0004, 0.0008, 0.0015, 0.003, 0.006, 0.012, 0.02 };
        var runs = s.Select((c, i) =>
        {
            var v = 4e-5 * c / (2e-3 + c) * (1 + TraceKin.Simulation.RateLawSimulator.Gaussian(rng, 0.02));
            return SeriesData.Point($"S{i + 1}", v, 0.02, 298.15, ("S", c));
        }).ToList();
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        Assert.Equal("saturation", f.ChosenLaw);
        Assert.Equal("saturation", f.Saturation!.Preferred);
        Assert.True(f.Saturation.EvidenceRatio > 10, $"evidence ratio {f.Saturation.EvidenceRatio}");
        Assert.InRange(2e-3, f.Saturation.Km.Ci95Low, f.Saturation.Km.Ci95High);
        Assert.InRange(4e-5, f.Saturation.Vmax.Ci95Low, f.Saturation.Vmax.Ci95High);
        var curv = Assert.Single(f.Curvature);
        Assert.True(curv.Significant);
        Assert.True(curv.Quadratic < 0);
        Assert.Contains(f.Warnings, w => w.Code == "power-law-wrong-shape");
        Assert.Contains(f.Warnings, w => w.Code == "saturation-preferred");

        // The rate-concentration plot draws it (PNG signature, and text rendered: a blank plot is far smaller).
        Assert.Equal("S", TraceKin.Reports.RateConcentrationPlot.Species(f));
        var png = TraceKin.Reports.PlotStyle.ToPng(TraceKin.Reports.RateConcentrationPlot.Build(f, runs));
        Assert.Equal(new byte[] { 0x89, (byte)'P', (byte)'N', (byte)'G' }, png[..4]);
        Assert.True(png.Length > 5000);
    }

    [Fact]
    public void A_true_power_law_series_keeps_the_power_law()
    {
        // Truth: first order in A, 2 % noise, eight levels over a 128-fold range (invented series): saturation must not win
        // and the 5 %-level curvature test must stay quiet for this seed.
        var runs = SeriesData.PowerLaw(0.1, [("A", 1, [0.001, 0.002, 0.004, 0.008, 0.016, 0.032, 0.064, 0.128])], 0.02, seed: 8);
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
        Assert.Equal("power", f.ChosenLaw);
        Assert.False(f.Curvature.Single().Significant, $"{f.Curvature.Single()}");
    }

    [Fact]
    public void Saturation_with_a_varied_co_reactant_recovers_its_order()
    {
        // Truth: v0 = 1e-4·[S]/(5e-3 + [S])·[B]^1, 1 % noise, 4×3 factorial (invented series, seed 4).
        var rng = new Random(4);
        var runs = new List<RunPoint>();
        foreach (var s in new[] { 0.001, 0.004, 0.01, 0.04 })
            foreach (var b in new[] { 0.05, 0.1, 0.2 })
            {
                var v = 1e-4 * s / (5e-3 + s) * b * (1 + TraceKin.Simulation.RateLawSimulator.Gaussian(rng, 0.01));
                runs.Add(SeriesData.Point($"R{runs.Count + 1}", v, 0.01, 298.15, ("S", s), ("B", b)));
            }
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default with { Substrate = "S" });
        Assert.Equal("saturation", f.ChosenLaw);
        Assert.Equal(1.0, f.Saturation!.CoReactantOrders.Single().Value, 0.05);
        Assert.InRange(5e-3, f.Saturation.Km.Ci95Low, f.Saturation.Km.Ci95High);
    }
}
