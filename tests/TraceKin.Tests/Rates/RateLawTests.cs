using TraceKin.Fitting;
using TraceKin.Rates;

namespace TraceKin.Tests.Rates;

/// <summary>Each integrated law: its analytic Jacobian against central differences, and recovery of k from an exact trace.</summary>
public sealed class RateLawTests
{
    public static TheoryData<string, bool, bool> Laws()
    {
        var d = new TheoryData<string, bool, bool>();
        // Equal [A]0 = [B]0 is a kink of the mixed law (which species runs out switches), so it is checked by value below.
        foreach (var law in new[] { "zero", "first", "second", "mixed", "mixed-excess", "pseudo", "nth", "nth-1", "nth-0.5" })
            foreach (var fromTrace in new[] { false, true })
                d.Add(law, fromTrace, law == "first");
        return d;
    }

    private static (RateLaw Law, double[] Shape) Make(string name) => name switch
    {
        "zero" => (new ZeroOrderLaw(), []),
        "first" => (new FirstOrderLaw(), []),
        "second" => (new SecondOrderLaw(), []),
        "mixed" => (new MixedSecondOrderLaw(), [0.08]),
        "mixed-excess" => (new MixedSecondOrderLaw(), [0.02]),
        "mixed-equal" => (new MixedSecondOrderLaw(), [0.05]),
        "pseudo" => (new PseudoFirstOrderLaw(0.6), []),
        "nth" => (new NthOrderLaw(), [1.6]),
        "nth-1" => (new NthOrderLaw(), [1.0]),
        "nth-0.5" => (new NthOrderLaw(), [0.5]),
        _ => throw new ArgumentException(name),
    };

    [Theory]
    [MemberData(nameof(Laws))]
    public void Analytic_jacobian_matches_central_differences(string name, bool a0FromTrace, bool drift)
    {
        var (law, shape) = Make(name);
        var t = Enumerable.Range(0, 30).Select(i => 10.0 * i).ToArray();
        var model = new LawModel(law, t, -1, a0FromTrace ? null : 0.05, drift);
        var p = new List<double> { 0.051, 0.001, name is "zero" or "nth-0.5" ? 1e-4 : name is "first" or "nth-1" ? 0.004 : 0.1 };
        p.AddRange(shape);
        if (drift) p.Add(1e-6);
        AssertJacobianMatchesDifferences(model, p.ToArray(), name);
    }

    /// <summary>The model's analytic Jacobian against central differences at <paramref name="par"/> (step 1e-6 relative).</summary>
    internal static void AssertJacobianMatchesDifferences(LawModel model, double[] par, string name)
    {
        var np = par.Length;
        var n = model.PointCount;
        var jac = new double[n * np];
        Assert.True(model.TryJacobian(par, jac));
        var plus = new double[n];
        var minus = new double[n];
        for (var j = 0; j < np; j++)
        {
            var h = 1e-6 * Math.Max(Math.Abs(par[j]), 1e-4);
            var pp = (double[])par.Clone(); pp[j] += h;
            var pm = (double[])par.Clone(); pm[j] -= h;
            model.Evaluate(pp, plus);
            model.Evaluate(pm, minus);
            for (var i = 0; i < n; i++)
            {
                var fd = (plus[i] - minus[i]) / (2 * h);
                var an = jac[i * np + j];
                // Central differences are good to about 1e-7 relative here (step 1e-6, smooth functions);
                // the zero-order kink is avoided because the run is still going at the last time.
                Assert.True(Math.Abs(fd - an) <= 1e-5 * Math.Max(Math.Abs(fd), 1e-3 * ScaleOf(jac, np, j)) + 1e-7, // 1e-7: rounding floor of the differences
                    $"{name}: ∂y/∂{model.ParameterNames[j]} at point {i}: analytic {an:G8}, differences {fd:G8}");
            }
        }
    }

    private static double ScaleOf(double[] jac, int np, int j)
    {
        double m = 0;
        for (var i = j; i < jac.Length; i += np) m = Math.Max(m, Math.Abs(jac[i]));
        return m;
    }

    // Truth: closed-form integrated rate laws (common practice, no source), evaluated independently in SyntheticTrace.
    [Theory]
    [InlineData("zero", 1e-4)]
    [InlineData("first", 0.01)]
    [InlineData("second", 0.5)]
    public void Fit_of_an_exact_trace_returns_the_rate_constant_it_was_made_with(string name, double k)
    {
        const double a0 = 0.05;
        Func<double, double> truth = name switch
        {
            "zero" => t => SyntheticTrace.ZeroOrder(k, a0, t),
            "first" => t => SyntheticTrace.FirstOrder(k, a0, t),
            _ => t => SyntheticTrace.SecondOrder(k, a0, t),
        };
        var t = Enumerable.Range(0, 120).Select(i => 5.0 * i).ToArray();
        var y = t.Select(truth).ToArray();
        var (law, _) = Make(name);
        var w = Enumerable.Repeat(1.0, t.Length).ToArray();
        var (_, fit) = IntegratedLawFitter.FitOne(law, t, y, w, -1, a0, null, false, null);
        Assert.True(fit.Converged, fit.ToReport());
        Assert.Equal(k, fit.Value("k"), k * 1e-6);
    }

    [Fact]
    public void Half_life_of_first_order_is_ln2_over_k_and_of_second_order_one_over_k_a0()
    {
        // t½ = ln 2/k (first order) and 1/(k·[A]0) (second order): closed-form integrated rate laws, common practice, no source.
        Assert.Equal(Math.Log(2) / 0.01, new FirstOrderLaw().HalfLife(0.01, 0.05, []), 1e-12);
        Assert.Equal(1 / (0.5 * 0.05), new SecondOrderLaw().HalfLife(0.5, 0.05, []), 1e-9);
        // Mixed second order at equal concentrations reduces to the second-order half-life.
        Assert.Equal(1 / (0.5 * 0.05), new MixedSecondOrderLaw().HalfLife(0.5, 0.05, [0.05]), 1e-9);
        // Order n = 2 reproduces second order: (2^1 − 1)/(1·k·[A]0).
        Assert.Equal(1 / (0.5 * 0.05), new NthOrderLaw().HalfLife(0.5, 0.05, [2.0]), 1e-9);
    }

    [Fact]
    public void Mixed_second_order_fraction_matches_the_closed_form_for_unequal_concentrations()
    {
        // [A] = Δ·[A]0/([B]0·e^(Δkt) − [A]0): closed-form integrated rate law, common practice, no source.
        var law = new MixedSecondOrderLaw();
        var g = new double[3];
        foreach (var t in new[] { 0.0, 3, 30, 300 })
        {
            var u = law.Fraction(t, 0.5, 0.05, [0.08], g);
            Assert.Equal(SyntheticTrace.MixedSecondOrder(0.5, 0.05, 0.08, t) / 0.05, u, 1e-12);
        }
    }

    [Fact]
    public void Mixed_second_order_at_equal_concentrations_is_the_second_order_law()
    {
        // [A]0 = [B]0: 1/[A] = 1/[A]0 + k·t (closed-form integrated rate law, common practice, no source).
        var g = new double[3];
        foreach (var t in new[] { 0.0, 3, 30, 300 })
            Assert.Equal(1 / (1 + 0.5 * 0.05 * t), new MixedSecondOrderLaw().Fraction(t, 0.5, 0.05, [0.05], g), 1e-12);
    }

    [Fact]
    public void Runs_test_counts_runs_and_gives_the_textbook_mean_and_variance()
    {
        // Wald & Wolfowitz (1940): signs + + − − + have R = 3, n₊ = 3, n₋ = 2, E[R] = 2·3·2/5 + 1 = 3.4,
        // Var[R] = 2·6·(12 − 5)/(25·4) = 0.84, z = (3 − 3.4)/√0.84.
        var r = RunsTest.Of([1.0, 2, -1, -3, 0.5]);
        Assert.Equal(3, r.Runs);
        Assert.Equal(3.4, r.Expected, 1e-12);
        Assert.Equal(-0.4 / Math.Sqrt(0.84), r.Z, 1e-12);
    }
}
