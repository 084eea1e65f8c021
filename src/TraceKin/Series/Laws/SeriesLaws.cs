namespace TraceKin.Series;

/// <summary>
/// The series-level rate laws, in one place: the power law (always fitted: the orders come from it) and the laws that
/// compete with it by AICc. A new competing law is one file and one line in <see cref="Competitors"/>.
/// </summary>
internal static class SeriesLaws
{
    /// <summary>The power law v0 = k·Π[X]0^n (<see cref="OrderAnalysis"/>), always fitted.</summary>
    public const string Power = ModelSettings.Power;

    /// <summary>Laws compared with the power law, in the order they are fitted (and their warnings given).</summary>
    public static IReadOnlyList<ISeriesLaw> Competitors { get; } =
    [
        new SaturationLaw(),
    ];

    /// <summary>Every name <c>[model] laws</c> accepts: the power law, then the competitors.</summary>
    public static IReadOnlyList<string> Names { get; } = [Power, .. Competitors.Select(l => l.Name)];

    /// <summary>The laws fitted when series.toml does not set <c>laws</c>.</summary>
    public static string[] Defaults => [Power, .. Competitors.Where(l => l.FittedByDefault).Select(l => l.Name)];
}
