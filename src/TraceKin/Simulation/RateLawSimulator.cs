using TraceKin.Traces;

namespace TraceKin.Simulation;

/// <summary>
/// A power-law rate law for simulation: v = k(T)·Π[X]^n_X, d[X]/dt = ν_X·v. k(T) follows Arrhenius,
/// k = k_ref·exp(−Ea/R·(1/T − 1/T_ref)), when an activation energy is given. With <see cref="SaturationSpecies"/> the
/// law also saturates in that species: v = k·Π[X]^n·[S]/(Km + [S]) (with no orders, the Michaelis–Menten law
/// v = Vmax·[S]/(Km + [S]), k = Vmax; Michaelis &amp; Menten 1913, from memory).
/// </summary>
public sealed record SimulatedLaw(
    double RateConstant,
    IReadOnlyDictionary<string, double> Orders,
    IReadOnlyDictionary<string, double> Coefficients,
    double ActivationEnergy = 0,
    double ReferenceTemperatureK = 298.15)
{
    /// <summary>The species the law saturates in, or null.</summary>
    public string? SaturationSpecies { get; init; }
    /// <summary>Km of the saturation, mol/L.</summary>
    public double SaturationConstant { get; init; }

    private const double R = PhysicalConstants.GasConstant;

    public double RateConstantAt(double? temperatureK) =>
        temperatureK is { } t && ActivationEnergy != 0
            ? RateConstant * Math.Exp(-ActivationEnergy / R * (1 / t - 1 / ReferenceTemperatureK))
            : RateConstant;
}

/// <summary>
/// Integrates a power-law rate law numerically with the classical fourth-order Runge–Kutta method
/// (Press et al., Numerical Recipes, 3rd ed., §17.1, from memory), using many small sub-steps per sample,
/// so that simulated runs carry no closed-form assumption.
/// </summary>
internal static class RateLawSimulator
{
    /// <summary>Concentrations (mol/L) of every species at each sample time.</summary>
    public static Dictionary<string, double[]> Integrate(SimulatedLaw law, IReadOnlyDictionary<string, double> c0, double? temperatureK,
        double[] times, int substeps = 50)
    {
        var species = law.Coefficients.Keys.Union(law.Orders.Keys).Union(c0.Keys).Distinct().OrderBy(s => s, StringComparer.Ordinal).ToArray();
        var nu = species.Select(s => law.Coefficients.GetValueOrDefault(s, 0)).ToArray();
        var n = species.Select(s => law.Orders.GetValueOrDefault(s, 0)).ToArray();
        var k = law.RateConstantAt(temperatureK);
        var sat = law.SaturationSpecies is { } satName ? Array.IndexOf(species, satName) : -1;
        var km = law.SaturationConstant;
        var x = species.Select(s => c0.GetValueOrDefault(s, 0)).ToArray();
        var result = species.ToDictionary(s => s, _ => new double[times.Length]);
        var t = 0.0;
        var k1 = new double[x.Length];
        var k2 = new double[x.Length];
        var k3 = new double[x.Length];
        var k4 = new double[x.Length];
        var tmp = new double[x.Length];
        double Rate(double[] y)
        {
            var v = k;
            for (var i = 0; i < y.Length; i++)
                if (n[i] != 0) v *= Math.Pow(Math.Max(y[i], 0), n[i]);
            if (sat >= 0) v *= Math.Max(y[sat], 0) / (km + Math.Max(y[sat], 0));
            return v;
        }
        void Deriv(double[] y, double[] dy)
        {
            var v = Rate(y);
            for (var i = 0; i < y.Length; i++) dy[i] = nu[i] * v;
        }
        for (var j = 0; j < times.Length; j++)
        {
            var h = (times[j] - t) / substeps;
            for (var s = 0; s < substeps && h > 0; s++)
            {
                Deriv(x, k1);
                for (var i = 0; i < x.Length; i++) tmp[i] = x[i] + 0.5 * h * k1[i];
                Deriv(tmp, k2);
                for (var i = 0; i < x.Length; i++) tmp[i] = x[i] + 0.5 * h * k2[i];
                Deriv(tmp, k3);
                for (var i = 0; i < x.Length; i++) tmp[i] = x[i] + h * k3[i];
                Deriv(tmp, k4);
                for (var i = 0; i < x.Length; i++) x[i] = Math.Max(0, x[i] + h / 6 * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]));
            }
            t = times[j];
            for (var i = 0; i < x.Length; i++) result[species[i]][j] = x[i];
        }
        return result;
    }

    /// <summary>Gaussian noise N(0, σ²) by the Box–Muller transform from a seeded generator (deterministic).</summary>
    public static double Gaussian(Random rng, double sigma)
    {
        var u1 = 1.0 - rng.NextDouble();
        var u2 = rng.NextDouble();
        return sigma * Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }
}
