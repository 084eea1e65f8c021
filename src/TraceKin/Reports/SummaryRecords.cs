namespace TraceKin.Reports;

// The shape of summary.json, one immutable record per JSON object, properties in the order they are written
// (System.Text.Json writes a positional record's properties in parameter order; names are camelCase:
// SummaryJsonContext). Every number is double? or int: a double that is null or not finite is written as null
// (FiniteNumberConverter). A property marked WhenWritingNull is left out when null; every other null is written.
// docs/summary.schema.json documents these fields; Reports/SummarySchemaTests checks the files against it.

/// <summary>The whole of summary.json.</summary>
internal sealed record SummaryRecord(
    string Tool,
    string ToolVersion,
    string Series,
    [property: System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    IReadOnlyList<string>? ImposedLaws,
    IEnumerable<RunRecord> Runs,
    IReadOnlyList<OrderRecord> Orders,
    HeadlineRateConstantRecord? RateConstant,
    IReadOnlyList<PerRunRateConstantRecord> RateConstantPerRun,
    RateConventionRecord? RateConvention,
    long PairRatioCount,
    string PairRatioTable,
    IReadOnlyList<PairRatioRecord> PairRatiosFirst,
    string? ChosenLaw,
    DesignRecord? Design,
    PowerLawRecord? PowerLaw,
    SaturationRecord? Saturation,
    [property: System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    IReadOnlyList<OtherLawRecord>? OtherLaws,
    TemperatureRecord? Temperature,
    ArrheniusRecord? Arrhenius,
    EyringRecord? Eyring,
    GlobalFitRecord? GlobalFit,
    [property: System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    IReadOnlyList<ReplicateGroupRecord>? Replicates,
    IReadOnlyList<RejectedRecord> Rejected,
    IReadOnlyList<WarningRecord> Warnings);

/// <summary>One analysed run's headline.</summary>
internal sealed record RunRecord(
    string Id,
    string File,
    string? Sha256,
    string? PlotFile,
    double? Temperature,
    IReadOnlyDictionary<string, double?> InitialConcentrations,
    InitialRateRecord InitialRate,
    RunLawRecord? ChosenLaw,
    string? HeadlineRule,
    bool RateResolved,
    string? UnresolvedBecause,
    double? DeadTime,
    bool NoIntegerLawFits,
    int SpikeCount,
    double? SystematicRelativeUncertainty,
    IReadOnlyList<WarningRecord> Warnings);

/// <summary>A run's headline initial rate, its statistical, systematic and model standard errors listed apart.</summary>
internal sealed record InitialRateRecord(
    double? Value,
    double? StdError,
    int Dof,
    string Unit,
    string Method,
    double? WindowStart,
    double? WindowEnd,
    int Points,
    double? SystematicStdError,
    double? ModelStdError);

/// <summary>The integrated law chosen for a run.</summary>
internal sealed record RunLawRecord(
    string Model,
    bool Drift,
    bool Converged,
    double? AkaikeWeight,
    RunRateConstantRecord RateConstant,
    double? HalfLife,
    double? HalfLifeStdError,
    bool LackOfFit);

internal sealed record RunRateConstantRecord(double? Value, double? StdError, string Unit, double?[] Ci95);

/// <summary>A reaction order (headline, log–log, co-reactant or global fit).</summary>
internal sealed record OrderRecord(
    string Species,
    double? Value,
    double? StdError,
    int Dof,
    double?[] Ci95,
    double? LawChoiceStdError,
    string Method);

/// <summary>The series' headline k, with the concentration scale's relative systematic uncertainty.</summary>
internal sealed record HeadlineRateConstantRecord(
    double? Value,
    double? StdError,
    string Unit,
    int Dof,
    double?[] Ci95,
    string Method,
    double? LawChoiceStdError,
    double? SystematicRelativeUncertainty);

internal sealed record PerRunRateConstantRecord(string Run, double? Value, double? StdError);

internal sealed record RateConventionRecord(
    string Species,
    double? Coefficient,
    string Rate,
    SpeciesRateConstantRecord? RateConstantForSpeciesRate);

/// <summary>The headline k in the convention that uses the followed species' own rate of change.</summary>
internal sealed record SpeciesRateConstantRecord(
    string Convention,
    double? Factor,
    double? Value,
    double? StdError,
    string Unit,
    double?[] Ci95);

internal sealed record PairRatioRecord(
    string RunA,
    string RunB,
    string Species,
    double? ConcentrationRatio,
    double? RateRatio,
    double? Order,
    double? StdError);

internal sealed record ReplicateGroupRecord(
    IReadOnlyList<string> Runs,
    string Conditions,
    double? MeanRate,
    double? StdDev,
    double? MeanStdError,
    string Unit,
    IReadOnlyList<ReplicateOutlierRecord> Outliers);

internal sealed record ReplicateOutlierRecord(string Run, double? Score);

/// <summary>A rejected input, located; key and input are left out when they do not apply.</summary>
internal sealed record RejectedRecord(
    string File,
    int Line,
    int Column,
    [property: System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    string? Key,
    [property: System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    string? Input,
    string Found,
    string Expected,
    string Hint,
    string Message);

internal sealed record WarningRecord(string Code, string Where, string Message);
