using TraceKin.Fitting;

namespace TraceKin.Tests.Fitting;

/// <summary>
/// NIST StRD linear least squares regression, certified values: estimates, their standard deviations, the residual
/// standard deviation and R² (uncentred for the no-intercept problems NoInt1/NoInt2), each to ≥ 9 significant digits.
/// </summary>
public sealed class NistLinearTests
{
    private const double Digits = 9;

    private static FitResult FitFile(NistStrdFile nist, string file)
    {
        var n = nist.Y.Length;
        double[,] design;
        string[] names;
        switch (file)
        {
            case "Norris":
                design = new double[n, 2];
                for (var i = 0; i < n; i++) { design[i, 0] = 1; design[i, 1] = nist.X[i][0]; }
                names = ["B0", "B1"];
                break;
            case "Pontius":
                design = new double[n, 3];
                for (var i = 0; i < n; i++) { var x = nist.X[i][0]; design[i, 0] = 1; design[i, 1] = x; design[i, 2] = x * x; }
                names = ["B0", "B1", "B2"];
                break;
            case "NoInt1" or "NoInt2":
                design = new double[n, 1];
                for (var i = 0; i < n; i++) design[i, 0] = nist.X[i][0];
                names = ["B1"];
                break;
            case "Longley":
                design = new double[n, 7];
                for (var i = 0; i < n; i++) { design[i, 0] = 1; for (var k = 0; k < 6; k++) design[i, k + 1] = nist.X[i][k]; }
                names = ["B0", "B1", "B2", "B3", "B4", "B5", "B6"];
                break;
            default: throw new ArgumentException(file);
        }
        return LinearLeastSquares.Fit(file, names, design, nist.Y);
    }

    // Source: NIST StRD linear least squares regression, <file>.dat, certified values.
    [Theory]
    [InlineData("Norris")]
    [InlineData("Pontius")]
    [InlineData("NoInt1")]
    [InlineData("NoInt2")]
    [InlineData("Longley")]
    public void Linear_fit_matches_certified_estimates_errors_residual_sd_and_r_squared(string file)
    {
        var nist = NistStrdFile.Read("linear", file + ".dat");
        Assert.True(nist.Certified.Length > 0 && nist.Y.Length > 0, "the .dat file was read");
        var fit = FitFile(nist, file);
        Assert.True(fit.Converged, fit.ExitDetail);
        Assert.Equal(nist.Certified.Length, fit.Parameters.Count);
        for (var j = 0; j < nist.Certified.Length; j++)
        {
            var p = fit.Parameters[j];
            Assert.True(NistStrdFile.Lre(p.Value, nist.Certified[j]) >= Digits, $"{file} {p.Name}: {p.Value:R} vs certified {nist.Certified[j]:R}");
            Assert.True(NistStrdFile.Lre(p.StdError, nist.CertifiedSd[j]) >= Digits, $"{file} sd({p.Name}): {p.StdError:R} vs certified {nist.CertifiedSd[j]:R}");
        }
        Assert.True(NistStrdFile.Lre(fit.ResidualStdDev, nist.ResidualSd) >= Digits, $"{file} residual sd {fit.ResidualStdDev:R} vs {nist.ResidualSd:R}");
        Assert.True(NistStrdFile.Lre(fit.RSquared, nist.RSquared) >= Digits, $"{file} R² {fit.RSquared:R} vs {nist.RSquared:R}");
        Assert.True(NistStrdFile.Lre(fit.ChiSquare, nist.ResidualSumOfSquares) >= Digits, $"{file} RSS {fit.ChiSquare:R} vs {nist.ResidualSumOfSquares:R}");
    }
}
