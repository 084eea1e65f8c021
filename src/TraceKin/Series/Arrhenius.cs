using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// Arrhenius law k = A·exp(−Ea/(R·T)) (Arrhenius 1889; IUPAC Gold Book, "Arrhenius equation"), fitted on k, not on ln k,
/// in the centred form k = k_ref·exp(−(Ea/R)·(1/T − 1/T_ref)) with T_ref inside the measured range so that k_ref and Ea
/// are nearly uncorrelated (the standard reparameterisation; Bates &amp; Watts 1988, §3.4, from memory). Then
/// ln A = ln k_ref + Ea/(R·T_ref), with var(ln A) = var(k_ref)/k_ref² + var(Ea)/(R·T_ref)² + 2·cov(k_ref, Ea)/(k_ref·R·T_ref)
/// (delta method); A's interval is exp of ln A's. R is CODATA 2018.
/// </summary>
public static class Arrhenius
{
    /// <summary>T_ref = 1/mean(1/T): the centre of the 1/T abscissa.</summary>
    public static double DefaultReference(IReadOnlyList<double> t) => 1 / t.Average(x => 1 / x);

    /// <summary>The model k(T) for given k_ref (at T_ref) and Ea (J/mol).</summary>
    public static double RateConstant(double kRef, double ea, double tRef, double t) =>
        kRef * Math.Exp(-ea / PhysicalConstants.GasConstant * (1 / t - 1 / tRef));

    public static ArrheniusFindings? Fit(double[] t, double[] k, double[]? weights, double? referenceK, string kUnit, List<Warning> warnings)
    {
        const double R = PhysicalConstants.GasConstant;
        var tRef = referenceK ?? DefaultReference(t);
        if (tRef < t.Min() - 1e-9 || tRef > t.Max() + 1e-9)
            warnings.Add(new Warning("reference-temperature-outside", "model.reference_temperature", FormattableString.Invariant(
                $"T_ref = {tRef:0.##} K lies outside the measured temperatures ({t.Min():0.##}–{t.Max():0.##} K); k_ref is then an extrapolation and strongly correlated with Ea")));

        // Start from the ln k against (1/T − 1/T_ref) line, weighted by (k/se)² (delta-method variance of ln k).
        var x = t.Select(v => 1 / v - 1 / tRef).ToArray();
        var lnk = k.Select(v => Math.Log(v)).ToArray();
        var lw = weights?.Select((w, i) => w * k[i] * k[i]).ToArray();
        var line = LinearLeastSquares.Line(x, lnk, lw);
        Estimate? linear = null;
        double[] start;
        if (line.Converged)
        {
            var slope = line.Parameters[1];
            linear = Estimate.Symmetric("Ea", -slope.Value * R / 1000, slope.StdError * R / 1000, "kJ/mol", line.DegreesOfFreedom, "ln k against 1/T line (cross-check)");
            start = [Math.Exp(line.Parameters[0].Value), -slope.Value * R];
        }
        else start = [k.Average(), 50e3];

        var model = new CurveModel("k = k_ref·exp(−Ea/R·(1/T − 1/T_ref))", ["k_ref", "Ea"], t,
            (p, tt) => RateConstant(p[0], p[1], tRef, tt),
            (p, tt, g) =>
            {
                var e = Math.Exp(-p[1] / R * (1 / tt - 1 / tRef));
                g[0] = e;
                g[1] = -p[0] * e * (1 / tt - 1 / tRef) / R;
            });
        var fit = NonlinearLeastSquares.Fit(model, k, start, new FitOptions { Weights = weights });
        if (!fit.HasUsableErrors)
        {
            warnings.Add(new Warning("arrhenius-fit-failed", "series", $"the Arrhenius fit did not converge ({fit.Exit}: {fit.ExitDetail}); no activation energy is reported"));
            return null;
        }
        int dof = fit.DegreesOfFreedom;
        double kRef = fit.Parameters[0].Value, seK = fit.Parameters[0].StdError, ea = fit.Parameters[1].Value, seEa = fit.Parameters[1].StdError;
        var cov = fit.Covariance[0, 1];
        var lnA = Math.Log(kRef) + ea / (R * tRef);
        var varLnA = seK * seK / (kRef * kRef) + seEa * seEa / (R * R * tRef * tRef) + 2 * cov / (kRef * R * tRef);
        var seLnA = Math.Sqrt(Math.Max(varLnA, 0));
        var a = Math.Exp(lnA);
        var h = FitResult.StudentT95(dof) * seLnA;
        var pre = new Estimate("A", a, a * seLnA, kUnit, dof, Math.Exp(lnA - h), Math.Exp(lnA + h), "from k_ref and Ea (delta method; interval from ln A)");
        var corrLnAEa = (cov / kRef + seEa * seEa / (R * tRef)) / (seLnA * seEa);
        return new ArrheniusFindings(
            Estimate.Symmetric("Ea", ea / 1000, seEa / 1000, "kJ/mol", dof, "weighted nonlinear least squares on k"),
            pre,
            Estimate.Symmetric("k_ref", kRef, seK, kUnit, dof, "weighted nonlinear least squares on k"),
            tRef, fit.Correlation![0, 1], corrLnAEa, fit, linear);
    }
}
