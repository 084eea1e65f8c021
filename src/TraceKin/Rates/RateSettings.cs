using TraceKin.Setup;

namespace TraceKin.Rates;

/// <summary>The [rates] table of series.toml: how each run's initial rate is extracted.</summary>
public sealed record RateSettings
{
    /// <summary>"auto" (see docs/methods.md), "line" (straight line over an early window), "polynomial" (degree 2–3 at t0)
    /// or "law" (derivative at t0 of the integrated law chosen by AICc).</summary>
    public string Method { get; init; } = "auto";
    /// <summary>The early window ends when this fraction of the tracked species has reacted.</summary>
    public double WindowConversion { get; init; } = 0.2;
    /// <summary>Alternatively, a fixed window end in seconds (overrides the conversion rule when set).</summary>
    public double? WindowEnd { get; init; }

    /// <summary>Exclude spikes found by the Hampel identifier (true by default).</summary>
    public bool Spikes { get; init; } = true;
    /// <summary>Linear baseline-drift term in the integrated-law fits: "auto" (by AICc evidence), "off" or "on".</summary>
    public string Drift { get; init; } = "auto";

    /// <summary>For a product curve: the reactant whose plan [X]0 fixes how far the product rises at complete reaction,
    /// [P]∞ − [P]0 = ν_P·[X]0/|ν_X| (null: the end level is fitted).</summary>
    public string? LimitingReactant { get; init; }
    /// <summary>ν of <see cref="LimitingReactant"/> (negative).</summary>
    public double LimitingCoefficient { get; init; } = -1;

    /// <summary>The integrated laws fitted and compared per run, by their names in law-fits.csv (see <see cref="LawNames"/>);
    /// null (the default) fits every candidate law. When set, the AICc choice and the Akaike-weighted average run over
    /// these laws only: the law is imposed, not chosen among all (docs/methods.md, "Imposed laws").</summary>
    [ShownOnlyWhenSet]
    public IReadOnlyList<string>? Laws { get; init; }

    /// <summary>The names <see cref="Laws"/> accepts, in the order the laws are fitted.</summary>
    public static IReadOnlyList<string> LawNames { get; } =
        ["zero order", "first order", "second order", "mixed second order", "pseudo-first order", "order n"];

    public static RateSettings Default { get; } = new();

    public static RateSettings FromToml(TomlSection s)
    {
        var d = Default;
        var conv = s.Double("window_conversion", d.WindowConversion);
        if (!(conv > 0 && conv <= 1))
            throw Traces.Fail.Setting(s.File, s.KeyName("window_conversion"), conv.ToString(System.Globalization.CultureInfo.InvariantCulture), "a fraction between 0 and 1, e.g. 0.2");
        return d with
        {
            Method = s.Choice("method", d.Method, "auto", "line", "polynomial", "law"),
            Spikes = s.Bool("spikes") ?? d.Spikes,
            Drift = s.Choice("drift", d.Drift, "auto", "off", "on"),
            WindowConversion = conv,
            WindowEnd = s.Positive("window_end"),
            LimitingReactant = s.String("limiting_reactant"),
            LimitingCoefficient = LimitingNu(s, d.LimitingCoefficient),
            Laws = LawList(s),
        };
    }

    /// <summary>
    /// rates.laws: a non-empty array of distinct law names from <see cref="LawNames"/> (spelt as in law-fits.csv; case
    /// and surrounding blanks are forgiven), returned in their canonical spelling and in the order given. Every error is
    /// raised at the key itself (the element's position is in the message), so it is located at the key's line and column.
    /// </summary>
    private static IReadOnlyList<string>? LawList(TomlSection s)
    {
        var key = s.KeyName("laws");
        var allowed = string.Join(", ", LawNames.Select(n => $"\"{n}\""));
        var items = s.StringArray("laws", $"an array of quoted law names, from: {allowed}");
        if (items is null) return null;
        if (items.Length == 0)
            throw Traces.Fail.Setting(s.File, key, "an empty array", $"at least one integrated law, from: {allowed}",
                "leave rates.laws out to fit and compare every law");
        var laws = new List<string>(items.Length);
        for (var i = 0; i < items.Length; i++)
        {
            var text = items[i];
            var name = LawNames.FirstOrDefault(n => string.Equals(n, text.Trim(), StringComparison.OrdinalIgnoreCase));
            if (name is null)
                throw Traces.Fail.Setting(s.File, key, $"{Traces.Fail.Quote(text)} as element {i + 1}", $"law names as in law-fits.csv, from: {allowed}");
            if (laws.Contains(name))
                throw Traces.Fail.Setting(s.File, key, $"{Traces.Fail.Quote(name)} twice (elements {laws.IndexOf(name) + 1} and {i + 1})",
                    "each law at most once");
            laws.Add(name);
        }
        return laws;
    }

    private static double LimitingNu(TomlSection s, double fallback)
    {
        var nu = s.Double("limiting_coefficient", fallback);
        if (!(nu < 0) || !double.IsFinite(nu))
            throw Traces.Fail.Setting(s.File, s.KeyName("limiting_coefficient"), nu.ToString(System.Globalization.CultureInfo.InvariantCulture),
                "the limiting reactant's stoichiometric coefficient, negative (e.g. -1)");
        return nu;
    }
}
