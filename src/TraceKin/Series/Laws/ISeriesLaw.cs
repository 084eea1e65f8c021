using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// A series-level rate law that competes with the power law v0 = k·Π[X]0^n: fitted to the same untransformed initial
/// rates with the same weights (<see cref="OrderAnalysis.RateWeights"/>), so the two AICc values compare. Registered in
/// <see cref="SeriesLaws.Competitors"/>; chosen in series.toml by its <see cref="Name"/> in <c>[model] laws</c>.
/// </summary>
public interface ISeriesLaw
{
    /// <summary>The name in <c>[model] laws</c>, in <see cref="SeriesFindings.ChosenLaw"/> and in summary.json.</summary>
    string Name { get; }

    /// <summary>Fitted when series.toml does not set <c>laws</c>.</summary>
    bool FittedByDefault { get; }

    /// <summary>
    /// The law fitted and compared with the power law, or null when it is not fitted here (say why in
    /// <paramref name="warnings"/> when the user would expect it). Called whether or not the power-law fit converged
    /// (<see cref="SeriesLawInput.Power"/>): a law compared by AICc needs the converged fit.
    /// </summary>
    CompetingLawFindings? Fit(SeriesLawInput input, List<Warning> warnings);

    /// <summary>The findings with this law's result in place: by default appended to <see cref="SeriesFindings.OtherLaws"/>.</summary>
    SeriesFindings Attach(SeriesFindings findings, CompetingLawFindings result) => findings with { OtherLaws = [.. findings.OtherLaws, result] };
}

/// <summary>What a competing law is fitted from: the usable runs, the species whose [X]0 vary, and the power law's fit.</summary>
/// <param name="Runs">Runs with a positive rate, in plan order.</param>
/// <param name="Varied">Species whose starting concentration varies independently (they have orders).</param>
/// <param name="PowerOrders">The power law's fitted orders by species.</param>
/// <param name="Power">The weighted power-law fit (its AICc is the one to beat).</param>
/// <param name="Weights">The weights of that fit, 1/se(v0)², or null (equal weights).</param>
/// <param name="Settings">The [model] settings.</param>
/// <param name="TemperatureGroups">How many temperature groups the runs fall in (one k each in the power law).</param>
public sealed record SeriesLawInput(
    IReadOnlyList<RunPoint> Runs,
    IReadOnlyList<string> Varied,
    IReadOnlyDictionary<string, double> PowerOrders,
    FitResult Power,
    double[]? Weights,
    ModelSettings Settings,
    int TemperatureGroups);

/// <summary>
/// A competing law's result, in the form every law shares: its formula, its estimates, its fit and the AICc
/// comparison with the power law. <see cref="UsedInstead"/> is true when the law is to be used instead of the power law
/// (lower AICc and whatever other rule the law states); of several such laws the lowest AICc is chosen.
/// </summary>
public sealed record CompetingLawFindings(
    string Law,
    string Formula,
    IReadOnlyList<Estimate> Estimates,
    FitResult Fit,
    double AiccPowerLaw,
    double Aicc,
    double EvidenceRatio,
    bool UsedInstead)
{
    /// <summary>The law's own result record (e.g. <see cref="SaturationFindings"/>), for <see cref="ISeriesLaw.Attach"/>.</summary>
    public object? Details { get; init; }
}
