using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// Eyring–Evans–Polanyi law k = κ·(k_B·T/h)·exp(ΔS‡/R)·exp(−ΔH‡/(R·T)) with κ = 1 (Eyring 1935, J. Chem. Phys. 3, 107;
/// IUPAC Gold Book, "Eyring equation"), fitted on k by weighted nonlinear least squares with parameters ΔH‡ (J/mol) and
/// ΔS‡ (J/(mol·K)), started from the ln(k/T) against 1/T line. ΔG‡(T*) = ΔH‡ − T*·ΔS‡ with
/// var = var(ΔH‡) + T*²·var(ΔS‡) − 2·T*·cov(ΔH‡, ΔS‡). k_B/h and R are CODATA 2018. For k in concentration units the
/// activation parameters refer to the standard state 1 mol/L.
/// </summary>
public static class Eyring
{
    /// <summary>The model k(T) for given ΔH‡ (J/mol) and ΔS‡ (J/(mol·K)).</summary>
    public static double RateConstant(double dH, double dS, double t) =>
        PhysicalConstants.BoltzmannOverPlanck * t * Math.Exp(dS / PhysicalConstants.GasConstant - dH / (PhysicalConstants.GasConstant * t));

    public static EyringFindings? Fit(double[] t, double[] k, double[]? weights, double atK, List<Warning> warnings)
    {
        const double R = PhysicalConstants.GasConstant;
        var x = t.Select(v => 1 / v).ToArray();
        var y = k.Select((v, i) => Math.Log(v / t[i])).ToArray();
        var lw = weights?.Select((w, i) => w * k[i] * k[i]).ToArray();
        var line = LinearLeastSquares.Line(x, y, lw);
        double[] start = line.Converged
            ? [-line.Parameters[1].Value * R, (line.Parameters[0].Value - PhysicalConstants.LnBoltzmannOverPlanck) * R]
            : [50e3, 0];
        var model = new CurveModel("k = (k_B·T/h)·exp(ΔS‡/R − ΔH‡/(R·T))", ["ΔH‡", "ΔS‡"], t,
            (p, tt) => RateConstant(p[0], p[1], tt),
            (p, tt, g) =>
            {
                var v = RateConstant(p[0], p[1], tt);
                g[0] = -v / (R * tt);
                g[1] = v / R;
            });
        var fit = NonlinearLeastSquares.Fit(model, k, start, new FitOptions { Weights = weights });
        if (!fit.HasUsableErrors)
        {
            warnings.Add(new Warning("eyring-fit-failed", "series", $"the Eyring fit did not converge ({fit.Exit}: {fit.ExitDetail}); no activation parameters are reported"));
            return null;
        }
        var dof = fit.DegreesOfFreedom;
        double dH = fit.Parameters[0].Value, seH = fit.Parameters[0].StdError, dS = fit.Parameters[1].Value, seS = fit.Parameters[1].StdError;
        var cov = fit.Covariance[0, 1];
        var dG = dH - atK * dS;
        var seG = Math.Sqrt(Math.Max(seH * seH + atK * atK * seS * seS - 2 * atK * cov, 0));
        return new EyringFindings(
            Estimate.Symmetric("ΔH‡", dH / 1000, seH / 1000, "kJ/mol", dof, "weighted nonlinear least squares on k"),
            Estimate.Symmetric("ΔS‡", dS, seS, "J/(mol·K)", dof, "weighted nonlinear least squares on k"),
            Estimate.Symmetric("ΔG‡", dG / 1000, seG / 1000, "kJ/mol", dof, FormattableString.Invariant($"ΔH‡ − T·ΔS‡ at {atK:0.##} K")),
            atK, fit.Correlation![0, 1], fit);
    }
}
