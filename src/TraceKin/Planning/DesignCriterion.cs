using MathNet.Numerics.LinearAlgebra;

namespace TraceKin.Planning;

/// <summary>
/// What the planner maximises: ln det M (D-optimal: the smallest joint confidence region of all parameters; Kiefer &amp;
/// Wolfowitz 1960, from memory), or −var of one parameter ((M⁻¹)_jj, c-optimal for that parameter). Written on the
/// command line as "d" or "variance:NAME" (e.g. "variance:n(A)", "variance:Ea", "variance:Km").
/// </summary>
public sealed record DesignCriterion(string? Parameter)
{
    public static DesignCriterion D { get; } = new((string?)null);

    public bool IsD => Parameter is null;

    public string Describe() => IsD ? "D-optimal (largest determinant of the Fisher information)" : $"smallest variance of {Parameter}";

    /// <summary>The value to maximise; −∞ for a design that cannot estimate the parameters.</summary>
    public double Score(Matrix<double> m, DesignLaw law)
    {
        if (IsD) return FisherInformation.LogDet(m);
        var cov = FisherInformation.Covariance(m);
        if (cov is null) return double.NegativeInfinity;
        var j = law.IndexOf(Parameter!);
        var v = cov[j, j];
        return v > 0 ? -Math.Log(v) : double.NegativeInfinity;
    }

    /// <summary>Null when the text is not a criterion; the parameter name is checked against the law by the planner.</summary>
    public static DesignCriterion? Parse(string text)
    {
        var t = text.Trim();
        if (t.Equals("d", StringComparison.OrdinalIgnoreCase) || t.Equals("d-optimal", StringComparison.OrdinalIgnoreCase)) return D;
        const string prefix = "variance:";
        if (t.StartsWith(prefix, StringComparison.OrdinalIgnoreCase) && t.Length > prefix.Length) return new DesignCriterion(t[prefix.Length..].Trim());
        return null;
    }
}
