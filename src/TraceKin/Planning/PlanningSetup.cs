using System.Globalization;
using TraceKin.Series;
using TraceKin.Traces;

namespace TraceKin.Planning;

/// <summary>The experimenter's limits: concentration ranges (mol/L), temperature range (K), how many new runs and in
/// groups of how many identical runs.</summary>
public sealed record PlanningLimits(IReadOnlyList<ConcentrationRange> Ranges, double? TemperatureLowK, double? TemperatureHighK, int Runs, int Replicates = 1);

/// <summary>
/// Turns an analysed series or prior guesses, plus the limits, into a <see cref="PlanningRequest"/>, checking every value
/// and naming the option or key at fault (errors are <see cref="InputException"/>s located at "command line" and the
/// option, or at the summary.json key).
/// </summary>
public static class PlanningSetup
{
    public const string CommandLine = "command line";

    /// <summary>Orders outside this range are not taken as a guess (common practice, no source: observed orders lie
    /// between −2 and 4).</summary>
    public const double MinOrder = -2, MaxOrder = 4;

    /// <summary>Activation energies outside (1, 400] kJ/mol are not taken as a guess (common practice, no source).</summary>
    public const double MinEaKJ = 1, MaxEaKJ = 400;

    /// <summary>The law and its parameters from the series' findings; guesses override single parameters.</summary>
    public static (DesignLaw Law, double[] Theta) FromSeries(AnalysedSeries s, string? law, IReadOnlyDictionary<string, double> guesses,
        bool temperatureMoves, string file)
    {
        foreach (var (n, v) in guesses) CheckGuess(n, v);
        var f = s.Findings;
        law ??= f.ChosenLaw;
        if (law == ModelSettings.Saturation)
        {
            if (f.Saturation is not { } sat)
                throw Fail.Setting(CommandLine, "--law", "saturation", "a law the series was fitted with: this series has no saturation fit (see its warnings)", "plan with --law power");
            if (temperatureMoves)
                throw Fail.Setting(CommandLine, "--temperature-range", "a temperature range", "no temperature range with the saturation law (TraceKin fits it at one temperature; Km depends on temperature)");
            var co = sat.CoReactantOrders.Select(o => o.Species).ToArray();
            var d = new SaturationDesign(sat.Substrate, co);
            var theta = new[] { sat.Vmax.Value, sat.Km.Value }.Concat(sat.CoReactantOrders.Select(o => o.Value)).ToArray();
            return (d, Override(d, theta, guesses));
        }
        var species = f.Orders.Select(o => o.Species).ToArray();
        var groups = f.Temperature?.Groups ?? [];
        if (f.Temperature?.Arrhenius is { } arr)
        {
            var orders = species.Select(sp => f.RoundedOrders is { } r && r.TryGetValue(sp, out var v) ? v : f.Orders.First(o => o.Species == sp).Value);
            var d = new PowerLawDesign(species, arr.ReferenceTemperatureK);
            var theta = new[] { arr.RateConstantAtReference.Value }.Concat(orders).Append(arr.ActivationEnergy.Value * 1000).ToArray();
            return (d, Override(d, theta, guesses));
        }
        var fitted = f.Orders.Select(o => o.Value).ToArray();
        var temps = s.Runs.Select(r => r.TemperatureK).Distinct().ToList();
        if (temperatureMoves || temps.Count > 1)
        {
            if (!guesses.ContainsKey("Ea"))
                throw Fail.Setting(CommandLine, "--guess Ea", "no activation energy", "a guess of Ea in kJ/mol (e.g. --guess Ea=60): the series gives no Arrhenius fit to plan runs at other temperatures from");
            double tref, k;
            if (groups.Count > 0) { tref = groups[0].TemperatureK; k = groups[0].RateConstant.Value; fitted = species.Select(sp => f.RoundedOrders?.GetValueOrDefault(sp) ?? f.Orders.First(o => o.Species == sp).Value).ToArray(); }
            else
            {
                tref = temps[0] ?? throw Fail.Setting(file, "runs[0].temperature", "null", "runs with a temperature, to plan runs at other temperatures");
                k = f.RateConstantAtFittedOrders?.Value ?? f.PowerLawFit!.Parameters[0].Value;
            }
            var d = new PowerLawDesign(species, tref);
            var theta = new[] { k }.Concat(fitted).Append(0.0).ToArray();
            return (d, Override(d, theta, guesses));
        }
        {
            var d = new PowerLawDesign(species, null);
            var k = f.RateConstantAtFittedOrders?.Value ?? f.PowerLawFit!.Parameters[0].Value;
            var theta = new[] { k }.Concat(fitted).ToArray();
            return (d, Override(d, theta, guesses));
        }
    }

    /// <summary>A new study: the law named, every parameter guessed. Ea (kJ/mol) only with a temperature range; k is then at
    /// <paramref name="referenceTemperatureK"/>.</summary>
    public static (DesignLaw Law, double[] Theta) FromGuesses(string law, IReadOnlyList<string> species, string? substrate,
        IReadOnlyDictionary<string, double> guesses, bool temperatureMoves, double referenceTemperatureK)
    {
        foreach (var (n, v) in guesses) CheckGuess(n, v);
        DesignLaw d;
        if (law == ModelSettings.Saturation)
        {
            var s = substrate ?? (species.Count == 1 ? species[0] : throw Fail.Setting(CommandLine, "--substrate", "no substrate", "the species the saturation law saturates in (one of " + string.Join(", ", species) + ")"));
            if (!species.Contains(s)) throw Fail.Setting(CommandLine, "--substrate", Fail.Quote(s), "a species with a --range (" + string.Join(", ", species) + ")");
            if (temperatureMoves) throw Fail.Setting(CommandLine, "--temperature-range", "a temperature range", "no temperature range with the saturation law (it is fitted at one temperature)");
            d = new SaturationDesign(s, species.Where(x => x != s).ToArray());
        }
        else if (law == ModelSettings.Power) d = new PowerLawDesign(species, temperatureMoves ? referenceTemperatureK : null);
        else throw Fail.Setting(CommandLine, "--law", Fail.Quote(law), "\"power\" or \"saturation\"");
        var theta = new double[d.ParameterNames.Count];
        for (var j = 0; j < theta.Length; j++)
        {
            var name = d.ParameterNames[j];
            if (!guesses.TryGetValue(name, out var v))
                throw Fail.Setting(CommandLine, $"--guess {name}", "no value", $"a guess for every parameter of the {law} law: {string.Join(", ", d.ParameterNames)}", $"e.g. --guess {name}={(name.StartsWith("n(") ? "1" : name == "Ea" ? "60" : "0.01")}");
            theta[j] = name == "Ea" ? v * 1000 : v;
        }
        foreach (var g in guesses.Keys.Where(g => d.IndexOf(g) < 0))
            throw Fail.Setting(CommandLine, $"--guess {g}", Fail.Quote(g), $"a parameter of the {law} law: {string.Join(", ", d.ParameterNames)}");
        return (d, theta);
    }

    /// <summary>Checks a guess of a named parameter is in the range a rate law can have.</summary>
    public static void CheckGuess(string name, double value)
    {
        var ci = CultureInfo.InvariantCulture;
        var found = value.ToString("G6", ci);
        if (!double.IsFinite(value)) throw Fail.Setting(CommandLine, $"--guess {name}", found, "a finite number");
        if (name.StartsWith("n(", StringComparison.Ordinal))
        {
            if (value < MinOrder || value > MaxOrder) throw Fail.Setting(CommandLine, $"--guess {name}", found, $"an order between {MinOrder} and {MaxOrder}");
        }
        else if (name == "Ea")
        {
            if (!(value > MinEaKJ && value <= MaxEaKJ)) throw Fail.Setting(CommandLine, "--guess Ea", found + " kJ/mol", $"an activation energy above {MinEaKJ} and at most {MaxEaKJ} kJ/mol");
        }
        else if (name is "k" or "Vmax" or "Km")
        {
            if (!(value > 0)) throw Fail.Setting(CommandLine, $"--guess {name}", found, $"{name} above 0");
        }
        else throw Fail.Setting(CommandLine, $"--guess {name}", Fail.Quote(name), "k, n(SPECIES), Ea, Vmax or Km");
    }

    private static double[] Override(DesignLaw d, double[] theta, IReadOnlyDictionary<string, double> guesses)
    {
        foreach (var (name, v) in guesses)
        {
            var j = d.IndexOf(name);
            if (j < 0) throw Fail.Setting(CommandLine, $"--guess {name}", Fail.Quote(name), $"a parameter of the {d.Law} law: {string.Join(", ", d.ParameterNames)}");
            theta[j] = name == "Ea" ? v * 1000 : v;
        }
        return theta;
    }

    /// <summary>
    /// Where new runs may go. Species of the law without a range are held at the median of their levels in the series;
    /// other species of the series too. Temperature: the range given; else the series' span when it has several
    /// temperatures; else its one temperature (or <paramref name="fallbackTemperatureK"/> for a new study).
    /// </summary>
    public static DesignSpace Space(PlanningLimits limits, DesignLaw law, IReadOnlyList<RunPoint> existing, double? fallbackTemperatureK)
    {
        var ci = CultureInfo.InvariantCulture;
        if (limits.Runs < 1) throw Fail.Setting(CommandLine, "--runs", limits.Runs.ToString(ci), "at least 1 new run");
        if (limits.Replicates < 1 || limits.Runs % limits.Replicates != 0)
            throw Fail.Setting(CommandLine, "--replicates", limits.Replicates.ToString(ci), $"a whole number ≥ 1 that divides --runs ({limits.Runs})");
        foreach (var r in limits.Ranges)
        {
            if (!law.Species.Contains(r.Species))
                throw Fail.Setting(CommandLine, $"--range {r.Species}", Fail.Quote(r.Species), $"a species of the law ({string.Join(", ", law.Species)})");
            if (!(r.Low > 0) || !(r.High > r.Low) || !double.IsFinite(r.High))
                throw Fail.Setting(CommandLine, $"--range {r.Species}", string.Format(ci, "{0:G4} to {1:G4} mol/L", r.Low, r.High),
                    "a range that leaves room for a run: lowest above 0 and below highest", "e.g. --range A=0.1..2 mmol/L");
        }
        if (limits.Ranges.Select(r => r.Species).Distinct().Count() != limits.Ranges.Count)
            throw Fail.Setting(CommandLine, "--range", "the same species twice", "one --range per species");
        var held = new Dictionary<string, double>(StringComparer.Ordinal);
        var all = law.Species.Union(existing.SelectMany(r => r.InitialConcentrations.Keys)).Distinct();
        foreach (var sp in all.Where(sp => limits.Ranges.All(r => r.Species != sp)))
        {
            var v = existing.Select(r => r.InitialConcentrations.GetValueOrDefault(sp)).Where(x => x > 0).Order().ToArray();
            if (v.Length == 0)
            {
                if (law.Species.Contains(sp)) throw Fail.Setting(CommandLine, $"--range {sp}", "no range", $"a range for [{sp}]0 (a new study has no level to hold it at)");
                continue;
            }
            held[sp] = v[v.Length / 2];
        }
        double? lo = limits.TemperatureLowK, hi = limits.TemperatureHighK;
        if (lo is not null || hi is not null)
        {
            if (lo is not { } l || hi is not { } h || !(l > 0) || !(h > l))
                throw Fail.Setting(CommandLine, "--temperature-range", string.Format(ci, "{0} to {1} K", lo?.ToString("0.##", ci) ?? "?", hi?.ToString("0.##", ci) ?? "?"),
                    "a range that leaves room for a run: lowest above 0 K and below highest", "e.g. --temperature-range 20..45 (°C)");
            if (!law.HasTemperature)
                throw Fail.Setting(CommandLine, "--temperature-range", "a temperature range", "a law over temperature (give --guess Ea for a series at one temperature)");
        }
        else
        {
            var temps = existing.Where(r => r.TemperatureK is not null).Select(r => r.TemperatureK!.Value).ToArray();
            if (temps.Length > 0 && temps.Max() - temps.Min() > 0.05 && law.HasTemperature) { lo = temps.Min(); hi = temps.Max(); }
            else if (temps.Length > 0) lo = hi = temps.Order().ElementAt(temps.Length / 2);
            else if (existing.Count == 0) lo = hi = fallbackTemperatureK; // a new study: the reference temperature
            // else a series planned without temperatures: the new runs have none either.
        }
        var space = new DesignSpace(limits.Ranges, held, lo, hi);
        if (space.Dimension == 0)
            throw Fail.Setting(CommandLine, "--range", "no range to search", "a --range for at least one species of the law, or a --temperature-range");
        return space;
    }
}
