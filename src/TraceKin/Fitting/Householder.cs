namespace TraceKin.Fitting;

/// <summary>
/// Householder QR on caller-owned, column-major buffers (column j of an r×c matrix at [j·r, j·r + r)), so the
/// nonlinear fitter can factor its Jacobian every iteration without allocating. Golub &amp; Van Loan,
/// "Matrix Computations", 4th ed., §5.1–5.2 (Householder vectors, Householder QR, back substitution).
/// </summary>
internal static class Householder
{
    /// <summary>
    /// Factor A = Q·R in place. Afterwards the strict upper triangle of A holds R, <paramref name="rDiag"/> its
    /// diagonal, and column k below (and on) the diagonal holds the Householder vector v_k with I − τ_k·v_k·v_kᵀ.
    /// </summary>
    public static void Factor(Span<double> a, int rows, int cols, Span<double> tau, Span<double> rDiag)
    {
        for (var k = 0; k < cols; k++)
        {
            var col = a.Slice(k * rows, rows);
            // Scaled norm avoids overflow/underflow for columns with extreme magnitudes. (Math.Max's result for
            // non-negative values, NaN kept once met, in a loop the compiler can keep free of bounds checks.)
            double scale = 0;
            for (var i = k; i < col.Length; i++)
            {
                var m = Math.Abs(col[i]);
                if (m > scale || double.IsNaN(m)) scale = double.IsNaN(scale) ? scale : m;
            }
            if (scale == 0) { tau[k] = 0; rDiag[k] = 0; continue; }
            double ss = 0;
            for (var i = k; i < col.Length; i++) { var v = col[i] / scale; ss += v * v; }
            var norm = scale * Math.Sqrt(ss);
            var alpha = col[k] > 0 ? -norm : norm;
            col[k] -= alpha;
            // vᵀv = 2·norm·(norm + |x_k|)  (G&V eq. 5.1.3 rearranged), so τ = 2 / vᵀv without another pass.
            var vtv = 2 * norm * (norm + Math.Abs(col[k] + alpha));
            tau[k] = 2 / vtv;
            rDiag[k] = alpha;
            var v0 = col[k..];
            for (var j = k + 1; j < cols; j++)
            {
                var cj = a.Slice(j * rows + k, v0.Length);
                double s = 0;
                for (var i = 0; i < v0.Length && i < cj.Length; i++) s += v0[i] * cj[i];
                s *= tau[k];
                for (var i = 0; i < v0.Length && i < cj.Length; i++) cj[i] -= s * v0[i];
            }
        }
    }

    /// <summary>Overwrite b with Qᵀ·b using the reflectors stored by <see cref="Factor"/>.</summary>
    public static void ApplyQt(ReadOnlySpan<double> a, int rows, int cols, ReadOnlySpan<double> tau, Span<double> b)
    {
        for (var k = 0; k < cols; k++)
        {
            if (tau[k] == 0) continue;
            var v0 = a.Slice(k * rows + k, rows - k);
            var bk = b.Slice(k, rows - k);
            double s = 0;
            for (var i = 0; i < v0.Length && i < bk.Length; i++) s += v0[i] * bk[i];
            s *= tau[k];
            for (var i = 0; i < v0.Length && i < bk.Length; i++) bk[i] -= s * v0[i];
        }
    }

    /// <summary>Solve R·x = c by back substitution (R from <see cref="Factor"/>). Returns false on a zero pivot.</summary>
    public static bool SolveR(ReadOnlySpan<double> a, int rows, int cols, ReadOnlySpan<double> rDiag, ReadOnlySpan<double> c, Span<double> x)
    {
        for (var i = cols - 1; i >= 0; i--)
        {
            if (rDiag[i] == 0) return false;
            var s = c[i];
            for (var j = i + 1; j < cols; j++) s -= a[j * rows + i] * x[j];
            x[i] = s / rDiag[i];
        }
        return true;
    }
}
