using TraceKin.Traces;

namespace TraceKin.Planning;

/// <summary>The conditions of one run as the planner sees them: starting concentrations (mol/L) and temperature (K).</summary>
public sealed record RunConditions(IReadOnlyDictionary<string, double> Concentrations, double? TemperatureK);

/// <summary>
/// A rate law on initial rates written for design: the rate at given conditions and its gradient with respect to the
/// parameters, from which the Fisher information of the weighted fit is built (<see cref="FisherInformation"/>).
/// </summary>
public abstract class DesignLaw
{
    /// <summary>"power" or "saturation" (the names of [model] laws).</summary>
    public abstract string Law { get; }
    public abstract IReadOnlyList<string> ParameterNames { get; }
    /// <summary>Unit of each parameter as shown to the user (Ea is carried in J/mol and shown in kJ/mol).</summary>
    public abstract IReadOnlyList<string> ParameterUnits { get; }
    /// <summary>Species whose starting concentration enters the law.</summary>
    public abstract IReadOnlyList<string> Species { get; }
    /// <summary>True when k follows Arrhenius across temperature (the parameters include Ea).</summary>
    public virtual bool HasTemperature => false;

    public abstract double Rate(RunConditions x, ReadOnlySpan<double> p);

    /// <summary>∂v/∂p_j at the conditions, written into <paramref name="g"/> (length = parameter count).</summary>
    public abstract void Gradient(RunConditions x, ReadOnlySpan<double> p, Span<double> g);

    /// <summary>The value shown to the user for parameter j (Ea in kJ/mol).</summary>
    public virtual double Shown(int j, double value) => value;

    public int IndexOf(string name)
    {
        for (var j = 0; j < ParameterNames.Count; j++)
            if (string.Equals(ParameterNames[j], name, StringComparison.Ordinal)) return j;
        return -1;
    }
}

/// <summary>
/// v0 = k·exp(−Ea/R·(1/T − 1/T_ref))·Π[X]0^n: the power law of <see cref="Series.PowerLawModel"/> with, when temperature is
/// in play, k following Arrhenius (<see cref="Series.Arrhenius"/>, centred form). Parameters: k (at T_ref), n(X)…, Ea (J/mol).
/// ∂v/∂k = v/k, ∂v/∂n = v·ln[X]0, ∂v/∂Ea = −v·(1/T − 1/T_ref)/R.
/// </summary>
internal sealed class PowerLawDesign : DesignLaw
{
    private readonly string[] _species;
    private readonly string _kUnit;

    public PowerLawDesign(IReadOnlyList<string> species, double? referenceTemperatureK)
    {
        _species = species.ToArray();
        ReferenceTemperatureK = referenceTemperatureK;
        var names = new List<string> { "k" };
        names.AddRange(_species.Select(s => $"n({s})"));
        if (referenceTemperatureK is not null) names.Add("Ea");
        ParameterNames = names;
        _kUnit = "(mol/L)^(1−Σn)/s";
        var units = new List<string> { _kUnit };
        units.AddRange(_species.Select(_ => ""));
        if (referenceTemperatureK is not null) units.Add("kJ/mol");
        ParameterUnits = units;
    }

    /// <summary>T_ref of k when temperature is in play, else null.</summary>
    public double? ReferenceTemperatureK { get; }
    public override string Law => Series.ModelSettings.Power;
    public override IReadOnlyList<string> ParameterNames { get; }
    public override IReadOnlyList<string> ParameterUnits { get; }
    public override IReadOnlyList<string> Species => _species;
    public override bool HasTemperature => ReferenceTemperatureK is not null;

    public override double Shown(int j, double value) => HasTemperature && j == ParameterNames.Count - 1 ? value / 1000 : value;

    public override double Rate(RunConditions x, ReadOnlySpan<double> p)
    {
        double s = Math.Log(p[0]);
        for (var j = 0; j < _species.Length; j++) s += p[1 + j] * Math.Log(x.Concentrations[_species[j]]);
        if (ReferenceTemperatureK is { } tref) s -= p[1 + _species.Length] / PhysicalConstants.GasConstant * (1 / Temperature(x) - 1 / tref);
        return Math.Exp(s);
    }

    public override void Gradient(RunConditions x, ReadOnlySpan<double> p, Span<double> g)
    {
        var v = Rate(x, p);
        g[0] = v / p[0];
        for (var j = 0; j < _species.Length; j++) g[1 + j] = v * Math.Log(x.Concentrations[_species[j]]);
        if (ReferenceTemperatureK is { } tref) g[1 + _species.Length] = -v * (1 / Temperature(x) - 1 / tref) / PhysicalConstants.GasConstant;
    }

    private static double Temperature(RunConditions x) =>
        x.TemperatureK ?? throw new InvalidOperationException("a run without a temperature in a design over temperature");
}

/// <summary>
/// v0 = Vmax·[S]0/(Km + [S]0)·Π[Y]0^m: the saturation law of <see cref="Series.SaturationModel"/> (same parameters, same
/// analytic derivatives). Parameters: Vmax, Km (mol/L), n(Y)… for the co-reactants.
/// </summary>
internal sealed class SaturationDesign : DesignLaw
{
    private readonly string[] _co;

    public SaturationDesign(string substrate, IReadOnlyList<string> coReactants)
    {
        Substrate = substrate;
        _co = coReactants.ToArray();
        ParameterNames = new[] { "Vmax", "Km" }.Concat(_co.Select(c => $"n({c})")).ToArray();
        ParameterUnits = new[] { "(mol/L)^(1−Σn)/s", "mol/L" }.Concat(_co.Select(_ => "")).ToArray();
        Species = new[] { substrate }.Concat(_co).ToArray();
    }

    public string Substrate { get; }
    public IReadOnlyList<string> CoReactants => _co;
    public override string Law => Series.ModelSettings.Saturation;
    public override IReadOnlyList<string> ParameterNames { get; }
    public override IReadOnlyList<string> ParameterUnits { get; }
    public override IReadOnlyList<string> Species { get; }

    public override double Rate(RunConditions x, ReadOnlySpan<double> p)
    {
        var s = x.Concentrations[Substrate];
        return p[0] * s / (p[1] + s) * Co(x, p);
    }

    public override void Gradient(RunConditions x, ReadOnlySpan<double> p, Span<double> g)
    {
        var s = x.Concentrations[Substrate];
        var co = Co(x, p);
        var d = p[1] + s;
        var v = p[0] * s / d * co;
        g[0] = s / d * co;
        g[1] = -p[0] * s / (d * d) * co;
        for (var j = 0; j < _co.Length; j++) g[2 + j] = v * Math.Log(x.Concentrations[_co[j]]);
    }

    private double Co(RunConditions x, ReadOnlySpan<double> p)
    {
        double s = 0;
        for (var j = 0; j < _co.Length; j++) s += p[2 + j] * Math.Log(x.Concentrations[_co[j]]);
        return Math.Exp(s);
    }
}
