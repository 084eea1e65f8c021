namespace TraceKin.Reports;

// The Series stage's model results in summary.json (SeriesModelsJson maps SeriesFindings onto them); same rules as
// SummaryRecords.cs.

internal sealed record DesignRecord(
    IReadOnlyList<string> Species,
    double? ConditionNumber,
    bool Separable,
    IReadOnlyList<IReadOnlyList<string>> Confounded);

internal sealed record PowerLawRecord(
    IReadOnlyList<OrderRecord> LogLogOrders,
    IReadOnlyDictionary<string, double?>? RoundedOrders,
    IReadOnlyList<OrderVerdictRecord> OrderVerdicts,
    RateConstantRecord? RateConstantAtFittedOrders,
    IReadOnlyList<CurvatureRecord> Curvature,
    FitStatsRecord? Fit);

internal sealed record OrderVerdictRecord(
    string Species,
    double? Order,
    double? SimpleValue,
    string Verdict,
    double? Margin,
    double?[] Ci90,
    double? PLower,
    double? PUpper,
    string Text);

internal sealed record CurvatureRecord(
    string Species,
    double? Quadratic,
    double? StdError,
    int Dof,
    double? PValue,
    bool Significant,
    double? LocalOrderAtLowest,
    double? LocalOrderAtHighest,
    bool Relevant);

internal sealed record SaturationRecord(
    string Substrate,
    EstimateRecord Vmax,
    EstimateRecord Km,
    IReadOnlyList<OrderRecord> CoReactantOrders,
    double? AiccPowerLaw,
    double? AiccSaturation,
    double? EvidenceRatio,
    string? Preferred,
    DoubleReciprocalRecord? DoubleReciprocal,
    FitStatsRecord? Fit);

internal sealed record DoubleReciprocalRecord(double? Vmax, double? Km, string Note);

/// <summary>A competing series-level law without a block of its own (Series/Laws), written in "otherLaws".</summary>
internal sealed record OtherLawRecord(
    string Law,
    string Formula,
    IReadOnlyList<NamedEstimateRecord> Estimates,
    double? AiccPowerLaw,
    double? Aicc,
    double? EvidenceRatio,
    bool UsedInstead,
    FitStatsRecord? Fit);

/// <summary>An estimate with its name, e.g. a competing law's parameter.</summary>
internal sealed record NamedEstimateRecord(string Name, double? Value, double? StdError, string Unit, int Dof, double?[] Ci95, string Method);

internal sealed record TemperatureRecord(IReadOnlyList<TemperatureGroupRecord> Groups);

internal sealed record TemperatureGroupRecord(double? Temperature, IReadOnlyList<string> Runs, RateConstantRecord? RateConstant);

internal sealed record ArrheniusRecord(
    EstimateRecord ActivationEnergy,
    EstimateRecord PreExponential,
    EstimateRecord RateConstantAtReference,
    double? ReferenceTemperature,
    double? Correlation,
    double? CorrelationLnAEa,
    EstimateRecord? LinearCheck,
    FitStatsRecord? Fit);

internal sealed record EyringRecord(
    EstimateRecord EnthalpyOfActivation,
    EstimateRecord EntropyOfActivation,
    EstimateRecord GibbsEnergyOfActivation,
    double? Temperature,
    double? Correlation,
    FitStatsRecord? Fit);

internal sealed record GlobalFitRecord(
    IReadOnlyList<OrderRecord> Orders,
    IReadOnlyList<GroupRateConstantRecord> RateConstants,
    int Runs,
    FitStatsRecord? Fit);

internal sealed record GroupRateConstantRecord(string Group, RateConstantRecord? RateConstant);

/// <summary>An estimate: value, stdError, unit, dof, ci95 [low, high], method.</summary>
internal sealed record EstimateRecord(double? Value, double? StdError, string Unit, int Dof, double?[] Ci95, string Method);

/// <summary>A rate constant: an estimate and the spread that the choice of law adds.</summary>
internal sealed record RateConstantRecord(double? Value, double? StdError, string Unit, int Dof, double?[] Ci95, string Method, double? LawChoiceStdError);

/// <summary>How well a fit went.</summary>
internal sealed record FitStatsRecord(
    string Model,
    string Exit,
    bool Converged,
    int Points,
    int Dof,
    double? ChiSquare,
    double? ReducedChiSquare,
    double? Aicc);
