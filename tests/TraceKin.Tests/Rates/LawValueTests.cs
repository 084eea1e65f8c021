using TraceKin.Rates;

namespace TraceKin.Tests.Rates;

/// <summary>
/// A law's <see cref="RateLaw.Value"/> (used where no gradient is needed) must give exactly the u of
/// <see cref="RateLaw.Fraction"/>: the fits and every reported number rest on the two agreeing bit for bit. The grid
/// covers each branch (order n: the series near n = 1, the closed form, a curve that has run out; mixed second order:
/// equal and unequal starting concentrations) and changes [A]0 and n from call to call, as a fit does.
/// </summary>
public sealed class LawValueTests
{
    public static TheoryData<string> Laws() => ["zero order", "first order", "second order", "order n", "mixed second order", "pseudo-first order"];

    [Theory]
    [MemberData(nameof(Laws))]
    public void Value_is_the_u_of_Fraction_bit_for_bit(string name)
    {
        RateLaw law = name switch
        {
            "zero order" => new ZeroOrderLaw(),
            "first order" => new FirstOrderLaw(),
            "second order" => new SecondOrderLaw(),
            "order n" => new NthOrderLaw(),
            "mixed second order" => new MixedSecondOrderLaw(),
            _ => new PseudoFirstOrderLaw(0.05),
        };
        var rng = new Random(17);
        var grad = new double[3];
        var compared = 0;
        foreach (var a0 in new[] { 1e-6, 3e-4, 0.02, 1.0, 7.5 })
            foreach (var shape in ShapesFor(law, a0))
                foreach (var kk in new[] { 1e-4, 0.03, 2.0, 500.0 })
                    for (var i = 0; i < 40; i++)
                    {
                        var t = i == 0 ? 0 : Math.Exp(rng.NextDouble() * 12 - 6);
                        var u = law.Fraction(t, kk, a0, shape, grad);
                        var v = law.Value(t, kk, a0, shape);
                        Assert.True(BitConverter.DoubleToInt64Bits(u) == BitConverter.DoubleToInt64Bits(v),
                            $"{law.Name}: t={t:R} kk={kk} a0={a0} shape=[{string.Join(", ", shape)}]: Fraction {u:R}, Value {v:R}");
                        compared++;
                    }
        Assert.True(compared > 500);
    }

    private static IEnumerable<double[]> ShapesFor(RateLaw law, double a0) => law switch
    {
        // n = 1 exactly and within 1e-3 of it (the series), far from it, and a fractional order that runs out (n < 1).
        NthOrderLaw => [[1.0], [1.0004], [0.9993], [0.5], [1.5], [2.0], [3.7], [0.05]],
        // [B]0 equal to [A]0 (the second-order limit), barely above it, and in excess.
        MixedSecondOrderLaw => [[a0], [a0 * (1 + 1e-12)], [a0 * 1.5], [a0 * 100], [a0 / 3]],
        _ => [[]],
    };
}
