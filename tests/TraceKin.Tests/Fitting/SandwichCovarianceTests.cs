using MathNet.Numerics.LinearAlgebra;
using TraceKin.Fitting;

namespace TraceKin.Tests.Fitting;

/// <summary>
/// The HC3 sandwich standard errors (Fitting/SandwichCovariance) against a closed form and against the same formula
/// written with MathNet's general matrices on NIST StRD data.
/// </summary>
public sealed class SandwichCovarianceTests
{
    [Fact]
    public void For_a_mean_the_HC3_standard_error_is_the_root_of_the_residual_sum_of_squares_over_n_minus_one()
    {
        // A fit of the mean alone: every leverage is 1/n, so Var_HC3 = Σ e²/(1 − 1/n)²/n² = Σ e²/(n − 1)² (common
        // practice, no source: the hat matrix of a column of ones is J/n). Data: NIST StRD Norris, its y column.
        var y = NistStrdFile.Read("linear", "Norris.dat").Y;
        var n = y.Length;
        var mean = y.Average();
        var r = y.Select(v => v - mean).ToArray();
        var se = SandwichCovariance.StdErrors(Enumerable.Repeat(1.0, n).ToArray(), n, 1, null, r)!;
        var expected = Math.Sqrt(r.Sum(e => e * e)) / (n - 1);
        Assert.Equal(expected, se[0], expected * 1e-12);
    }

    [Fact]
    public void A_weighted_straight_line_matches_the_sandwich_written_with_general_matrices()
    {
        // NIST StRD Norris (x, y), fitted with weights 1/x (invented weights, so the errors are not the certified ones).
        // Reference: B = (XᵀWX)⁻¹, H = W^½·X·B·Xᵀ·W^½, Cov = B·Xᵀ·W·diag(e²/(1 − h)²)·W·X·B, with MathNet's dense
        // matrices (MacKinnon & White 1985, HC3, from memory).
        var nist = NistStrdFile.Read("linear", "Norris.dat");
        var n = nist.Y.Length;
        var x = nist.X.Select(v => v[0]).ToArray();
        var w = x.Select(v => 1 / Math.Max(v, 1)).ToArray();
        var design = new double[n, 2];
        for (var i = 0; i < n; i++) { design[i, 0] = 1; design[i, 1] = x[i]; }
        var fit = LinearLeastSquares.Fit("line", ["B0", "B1"], design, nist.Y, w);
        var b0 = fit.Parameters[0].Value;
        var b1 = fit.Parameters[1].Value;
        var r = nist.Y.Select((v, i) => v - b0 - b1 * x[i]).ToArray();
        var jac = new double[n * 2];
        for (var i = 0; i < n; i++) { jac[2 * i] = 1; jac[2 * i + 1] = x[i]; }
        var se = SandwichCovariance.StdErrors(jac, n, 2, w, r)!;

        var X = Matrix<double>.Build.DenseOfArray(design);
        var W = Matrix<double>.Build.DenseOfDiagonalArray(w);
        var B = (X.Transpose() * W * X).Inverse();
        var Wh = Matrix<double>.Build.DenseOfDiagonalArray(w.Select(Math.Sqrt).ToArray());
        var H = Wh * X * B * X.Transpose() * Wh;
        var omega = Matrix<double>.Build.DenseOfDiagonalArray(Enumerable.Range(0, n).Select(i => r[i] * r[i] / Math.Pow(1 - H[i, i], 2)).ToArray());
        var cov = B * X.Transpose() * W * omega * W * X * B;
        Assert.Equal(Math.Sqrt(cov[0, 0]), se[0], Math.Sqrt(cov[0, 0]) * 1e-9);
        Assert.Equal(Math.Sqrt(cov[1, 1]), se[1], Math.Sqrt(cov[1, 1]) * 1e-9);
    }

    [Fact]
    public void Scaling_every_weight_by_one_factor_leaves_the_sandwich_unchanged()
    {
        // The sandwich is invariant to a common factor in the weights (common practice, no source).
        var nist = NistStrdFile.Read("linear", "Norris.dat");
        var n = nist.Y.Length;
        var x = nist.X.Select(v => v[0]).ToArray();
        var jac = new double[n * 2];
        for (var i = 0; i < n; i++) { jac[2 * i] = 1; jac[2 * i + 1] = x[i]; }
        var r = nist.Y.Select((v, i) => v - 0.5 - 1.0 * x[i]).ToArray();
        var w = x.Select(v => 1 / Math.Max(v, 1)).ToArray();
        var a = SandwichCovariance.StdErrors(jac, n, 2, w, r)!;
        var b = SandwichCovariance.StdErrors(jac, n, 2, w.Select(v => v * 1e6).ToArray(), r)!;
        Assert.Equal(a[1], b[1], a[1] * 1e-10);
    }
}
