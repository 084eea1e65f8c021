using System.Globalization;
using MathNet.Numerics.Distributions;

namespace TraceKin.Series;

/// <summary>What can be said of a fitted order against the simple values 0, ½, 1, 3/2, 2.</summary>
public enum OrderVerdictKind
{
    /// <summary>Shown equal to the simple value within the practical margin (two one-sided tests at 5 % each).</summary>
    Equivalent,
    /// <summary>The 95 % interval contains the simple value, but is too wide to show equivalence within the margin.</summary>
    ConsistentButImprecise,
    /// <summary>Neither: the 95 % interval excludes every simple value and none is shown equivalent.</summary>
    Different,
}

/// <summary>
/// The verdict on one order: the simple value it is judged against (the nearest, or the nearest one its 95 % interval
/// contains), the practical margin δ, the 90 % interval the two one-sided tests rest on, their two p-values
/// (H0: n ≤ n0 − δ and H0: n ≥ n0 + δ), and one sentence in the trade's words.
/// </summary>
public sealed record OrderVerdict(string Species, double Order, double SimpleValue, OrderVerdictKind Verdict, double Margin,
    double Ci90Low, double Ci90High, double PLower, double PUpper, string Text);

/// <summary>
/// Two one-sided tests for equivalence (Schuirmann 1987, J. Pharmacokinet. Biopharm. 15, 657): an order n̂ with
/// standard error s and ν degrees of freedom is equivalent to a simple value n0 within ±δ when both
/// t₁ = (n̂ − (n0 − δ))/s and t₂ = ((n0 + δ) − n̂)/s exceed t(0.95, ν), i.e. when the 90 % interval
/// n̂ ± t(0.95, ν)·s lies inside [n0 − δ, n0 + δ]. A p-value below 0.05 is then a statement about a difference that
/// matters to the chemist, not about any difference at all: with enough runs an order of 1.0005 is "significantly"
/// not 1, yet equivalent to 1 within ±0.05.
/// </summary>
internal static class OrderEquivalence
{
    /// <summary>Default practical margin on an order (docs/methods.md, "Verdicts on orders", says why ±0.05).</summary>
    public const double DefaultMargin = 0.05;

    public static OrderVerdict Judge(Order o, double margin)
    {
        var ci = CultureInfo.InvariantCulture;
        var dof = Math.Max(o.Dof, 1);
        // The statistical and the systematic (law-choice) standard uncertainties together.
        var se = LawChoiceUncertainty.Combined(o.StdError, o.LawChoiceStdError);
        var t90 = StudentT.InvCDF(0, 1, dof, 0.95);
        var lo90 = o.Value - t90 * se;
        var hi90 = o.Value + t90 * se;
        var nearest = OrderAnalysis.SimpleOrders.MinBy(s => Math.Abs(s - o.Value));
        double POneSided(double t) => se > 0 ? 1 - StudentT.CDF(0, 1, dof, t) : t > 0 ? 0 : 1;
        var pLower = POneSided((o.Value - (nearest - margin)) / se);
        var pUpper = POneSided((nearest + margin - o.Value) / se);
        var m = margin.ToString("0.###", ci);
        if (pLower < 0.05 && pUpper < 0.05)
            return new OrderVerdict(o.Species, o.Value, nearest, OrderVerdictKind.Equivalent, margin, lo90, hi90, pLower, pUpper,
                string.Format(ci, "n({0}) = {1:0.000} is equivalent to {2} within ±{3} (90 % interval {4:0.000} to {5:0.000})",
                    o.Species, o.Value, Simple(nearest), m, lo90, hi90));
        var inside = OrderAnalysis.SimpleOrders.Where(s => o.Ci95Low <= s && s <= o.Ci95High).OrderBy(s => Math.Abs(s - o.Value)).ToList();
        if (inside.Count > 0)
            return new OrderVerdict(o.Species, o.Value, inside[0], OrderVerdictKind.ConsistentButImprecise, margin, lo90, hi90, pLower, pUpper,
                string.Format(ci, "n({0}) = {1:0.000} is consistent with {2}, but too imprecise to call it {2} within ±{3} (90 % interval {4:0.000} to {5:0.000}); more runs or a wider span of [{0}]0 would settle it",
                    o.Species, o.Value, Simple(inside[0]), m, lo90, hi90));
        return new OrderVerdict(o.Species, o.Value, nearest, OrderVerdictKind.Different, margin, lo90, hi90, pLower, pUpper,
            string.Format(ci, "n({0}) = {1:0.000} differs from every simple value (95 % interval {2:0.000} to {3:0.000}; the nearest, {4}, is not within ±{5})",
                o.Species, o.Value, o.Ci95Low, o.Ci95High, Simple(nearest), m));
    }

    /// <summary>A simple order as a chemist writes it.</summary>
    public static string Simple(double n) => n switch { 0.5 => "½", 1.5 => "3/2", _ => n.ToString("0", CultureInfo.InvariantCulture) };
}
