using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>The [model] table of series.toml: which rate-law model(s) the series is tested against (keys in docs/formats.md).</summary>
public sealed record ModelSettings
{
    public const string Power = "power";
    public const string Saturation = "saturation";

    /// <summary>Species whose orders are fitted; null = every species whose starting concentration varies.</summary>
    public string[]? Species { get; init; }

    /// <summary>Rate laws to fit and compare by AICc: "power" (always fitted) and any of <see cref="SeriesLaws.Competitors"/>.</summary>
    public string[] Laws { get; init; } = SeriesLaws.Defaults;

    /// <summary>The species the saturation law saturates in; null = try every varied species and keep the best AICc.</summary>
    public string? Substrate { get; init; }

    /// <summary>Round orders to 0, ½, 1, 3/2 or 2 (when the 95 % interval holds the simple value) and refit k there.</summary>
    public bool RoundOrders { get; init; } = true;

    /// <summary>T_ref (K) of the Arrhenius fit; null = 1/mean(1/T) over the measured temperatures (inside the range).</summary>
    public double? ReferenceTemperatureK { get; init; }

    /// <summary>Temperature (K) at which ΔG‡ is given.</summary>
    public double EyringTemperatureK { get; init; } = 298.15;

    /// <summary>Also fit the power law to every run's whole concentration–time course at once (slower).</summary>
    public bool GlobalFit { get; init; }

    /// <summary>Practical margin on an order: an order is rounded only when shown equivalent to a simple value within
    /// ±this (two one-sided tests), and a curved log–log plot is flagged only when the local order changes by more.</summary>
    public double OrderMargin { get; init; } = OrderEquivalence.DefaultMargin;

    /// <summary>Keep runs whose initial rate is unresolved (estimates in conflict, wrong sign) in the series fits.</summary>
    public bool UseUnresolved { get; init; }

    public bool Fits(string law) => Laws.Contains(law, StringComparer.Ordinal);

    public static ModelSettings Default { get; } = new();

    private static double Margin(TomlSection s)
    {
        var m = s.Double("order_margin", OrderEquivalence.DefaultMargin);
        if (!(m > 0 && m <= 0.25))
            throw Fail.Setting(s.File, s.KeyName("order_margin"), m.ToString(System.Globalization.CultureInfo.InvariantCulture),
                "a margin on an order above 0 and at most 0.25 (half the step between simple orders), e.g. 0.05");
        return m;
    }

    public static ModelSettings FromToml(TomlSection s)
    {
        var laws = s.Strings("laws") ?? SeriesLaws.Defaults;
        for (var i = 0; i < laws.Length; i++)
        {
            var l = laws[i].Trim().ToLowerInvariant();
            if (!SeriesLaws.Names.Contains(l))
                throw Fail.Setting(s.File, $"{s.KeyName("laws")}[{i}]", Fail.Quote(laws[i]), string.Join(" or ", SeriesLaws.Names.Select(n => $"\"{n}\"")));
            laws[i] = l;
        }
        if (!laws.Contains(Power)) laws = [Power, .. laws];
        var tref = s.Positive("reference_temperature");
        var teyring = s.Positive("eyring_temperature");
        return new ModelSettings
        {
            Species = s.Strings("species"),
            Laws = laws.Distinct().ToArray(),
            Substrate = s.String("substrate"),
            RoundOrders = s.Bool("round_orders") ?? true,
            ReferenceTemperatureK = tref,
            EyringTemperatureK = teyring ?? 298.15,
            GlobalFit = s.Bool("global_fit") ?? false,
            UseUnresolved = s.Bool("use_unresolved") ?? false,
            OrderMargin = Margin(s),
        };
    }
}
