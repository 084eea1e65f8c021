using TraceKin.Signal;

namespace TraceKin.Tests.Signal;

public class BeerLambertTests
{
    [Fact]
    public void Absorbance_over_epsilon_times_path_gives_concentration()
    {
        // Beer–Lambert (IUPAC Gold Book): c = (A − A_blank)/(ε·l). 0.512 − 0.012 = 0.500; ε·l = 12500 × 0.5 → c = 8.0e-5 mol/L.
        var bl = new BeerLambert(12500, 0.5, 0.012);
        Assert.Equal(8.0e-5, bl.ToConcentration(0.512), 1e-17);
    }

    [Fact]
    public void An_absorbing_product_is_accounted_for_by_the_mass_balance()
    {
        // A → P, both absorb: A = l·(ε_A[A] + ε_P[P]), [P] = [A]0 − [A]. Invented numbers, worked by hand:
        // ε_A = 1000, ε_P = 250, l = 1, [A]0 = 1e-3: at [A] = 4e-4, A = 0.4 + 0.25×6e-4×1000 = 0.55.
        var bl = new BeerLambert(1000, 1, 0, -1, 1e-3, [new Absorber("P", 250, 1)]);
        Assert.Equal(0.55, bl.ToAbsorbance(4e-4), 1e-15);
        Assert.Equal(4e-4, bl.ToConcentration(0.55), 1e-17);
        // The scale is 1/(l·(ε_A − ε_P)): a reading changes by 750 per mol/L consumed.
        Assert.Equal(1.0 / 750, bl.Scale, 1e-18);
    }

    [Fact]
    public void A_product_present_at_mixing_shifts_the_baseline()
    {
        var bl = new BeerLambert(1000, 1, 0.02, -1, 1e-3, [new Absorber("P", 250, 1)]) { OthersInitial = new Dictionary<string, double> { ["P"] = 2e-4 } };
        // At mixing: A = 0.02 + 1000×1e-3 + 250×2e-4 = 1.07.
        Assert.Equal(1.07, bl.ToAbsorbance(1e-3), 1e-14);
        Assert.Equal(1e-3, bl.ToConcentration(1.07), 1e-15);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(3.1e-5)]
    [InlineData(7.77e-4)]
    public void Concentration_to_absorbance_and_back_round_trips(double c)
    {
        // Round trips (invented values) to 1e-12 relative, with and without an absorbing product.
        var simple = new BeerLambert(4321, 1.0, 0.031);
        Assert.Equal(c, simple.ToConcentration(simple.ToAbsorbance(c)), 1e-12 * Math.Max(c, 1e-4));
        var withProduct = new BeerLambert(4321, 0.2, 0.031, -1, 8e-4, [new Absorber("P", 900, 2), new Absorber("Q", 50, 1)]);
        Assert.Equal(c, withProduct.ToConcentration(withProduct.ToAbsorbance(c)), 1e-12 * Math.Max(c, 1e-4));
    }

    [Fact]
    public void Uncertainty_of_epsilon_and_path_combine_in_quadrature()
    {
        // c ∝ 1/(ε·l): u_rel = √((u_ε/ε)² + (u_l/l)²) (JCGM 100:2008 eq. 10, relative form). 2 % and 0.5 %.
        var bl = new BeerLambert(5000, 1, 0, -1, 0, [], 100, 0.005);
        var (rel, _) = UncertaintyBudget.Relative(bl.Scale, bl.UncertainInputs());
        Assert.Equal(Math.Sqrt(0.02 * 0.02 + 0.005 * 0.005), rel, 1e-9);
    }

    [Fact]
    public void Whole_trace_conversion_gives_the_same_doubles_as_point_by_point()
    {
        // Round trip against our own per-point conversion (invented absorbances, fixed seed), bit for bit, with and
        // without absorbing products (the bulk form only hoists the constants out of the loop).
        var rng = new Random(5210);
        var absorbances = Enumerable.Range(0, 10_000).Select(_ => rng.NextDouble() * 1.5 - 0.01).ToArray();
        BeerLambert[] conversions =
        [
            new(12500, 0.5, 0.012),
            new(4321, 0.2, 0.031, -1, 8e-4, [new Absorber("P", 900, 2), new Absorber("Q", 50, 1)]) { OthersInitial = new Dictionary<string, double> { ["P"] = 2e-5 } },
        ];
        foreach (var bl in conversions)
        {
            var response = bl.Response;
            var bulk = new double[absorbances.Length];
            response.ToConcentrations(absorbances, bulk);
            for (var i = 0; i < absorbances.Length; i++)
                Assert.Equal(BitConverter.DoubleToInt64Bits(bl.ToConcentration(absorbances[i])), BitConverter.DoubleToInt64Bits(bulk[i]));
        }
    }
}
