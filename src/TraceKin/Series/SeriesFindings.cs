using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// One run as the Series stage sees it: its initial rate and starting conditions (mol/L, K), and optionally its
/// concentration–time course (for the global progress-curve fit).
/// </summary>
public sealed record RunPoint(
    string RunId,
    double Rate,
    double RateStdError,
    IReadOnlyDictionary<string, double> InitialConcentrations,
    double? TemperatureK)
{
    public RunTrace? Trace { get; init; }
    /// <summary>The between-law part of the rate's error (absolute; 0 when one law or a local estimate gave the rate):
    /// systematic, so the series carries it separately (LawChoiceUncertainty).</summary>
    public double RateSystematicError { get; init; }
}

/// <summary>The followed species' concentration (mol/L) at times (s) after mixing, and its stoichiometric coefficient ν.</summary>
public sealed record RunTrace(string Species, double Coefficient, double[] Times, double[] Concentrations);

/// <summary>
/// The power rate law fitted to the whole concentration–time courses of all runs at once (shared orders, one k per
/// temperature group), by nonlinear least squares on the untransformed concentrations.
/// </summary>
public sealed record GlobalFitFindings(IReadOnlyList<Order> Orders, IReadOnlyList<KeyValuePair<string, RateConstant>> RateConstants, FitResult Fit, int Runs);

/// <summary>A reaction order with its standard error, dof and 95 % Student-t interval.</summary>
public sealed record Order(string Species, double Value, double StdError, int Dof, double Ci95Low, double Ci95High, string Method)
{
    /// <summary>Systematic standard uncertainty from the per-run choice of integrated law, included in the 95 % interval
    /// (<see cref="StdError"/> is the statistical part only).</summary>
    public double LawChoiceStdError { get; init; }
}

/// <summary>A rate constant in <see cref="Unit"/> with its standard error and 95 % interval (which may be asymmetric).</summary>
public sealed record RateConstant(double Value, double StdError, string Unit, int Dof, double Ci95Low, double Ci95High, string Method)
{
    /// <summary>Systematic standard uncertainty from the per-run choice of integrated law, included in the 95 % interval.</summary>
    public double LawChoiceStdError { get; init; }
}

/// <summary>k for one run at the fitted orders: rate / Π[X]0^n.</summary>
public sealed record RunRateConstant(string RunId, double Value, double StdError);

/// <summary>The order of one species from two runs that differ only in its starting concentration.</summary>
public sealed record PairRatio(string RunA, string RunB, string Species, double ConcentrationRatio, double RateRatio, double Order, double StdError);

/// <summary>
/// A named estimate with its standard error, unit, dof, 95 % interval (asymmetric where it comes from a transformed
/// parameter) and the method that produced it.
/// </summary>
public sealed record Estimate(string Name, double Value, double StdError, string Unit, int Dof, double Ci95Low, double Ci95High, string Method)
{
    /// <summary>value ± t(0.975, dof)·se.</summary>
    public static Estimate Symmetric(string name, double value, double se, string unit, int dof, string method)
    {
        var h = FitResult.StudentT95(dof) * se;
        return new Estimate(name, value, se, unit, dof, value - h, value + h, method);
    }
}

/// <summary>
/// Can the series' design tell the species' orders apart? <see cref="ConditionNumber"/> is that of the centred,
/// column-normalised ln[X]0 design (centred within temperature groups); <see cref="Confounded"/> lists groups of
/// species whose starting concentrations never vary independently of each other (no order is fitted for them).
/// </summary>
public sealed record DesignCheck(IReadOnlyList<string> Species, double ConditionNumber, bool Separable, IReadOnlyList<IReadOnlyList<string>> Confounded);

/// <summary>
/// Systematic curvature of ln v0 against ln[X]0: the coefficient c of (ln[X]0 − mean)² added to the log–log model, its
/// standard error and two-sided p-value. A significant c means the power law is the wrong shape for this species.
/// </summary>
public sealed record CurvatureCheck(string Species, double Quadratic, double StdError, int Dof, double PValue, bool Significant)
{
    /// <summary>Local order d ln v0/d ln[X]0 = n + 2c·(ln[X]0 − mean) at the lowest and the highest [X]0 measured.</summary>
    public double LocalOrderAtLowest { get; init; } = double.NaN;
    public double LocalOrderAtHighest { get; init; } = double.NaN;
    /// <summary>True when the local order changes across the measured range by more than the practical margin.</summary>
    public bool Relevant { get; init; }
}

/// <summary>
/// The double-reciprocal (1/v0 against 1/[S]0) straight line, shown only as a cross-check of the saturation fit, never
/// used as the estimate (it distorts the error structure; Cornish-Bowden, Fundamentals of Enzyme Kinetics, 4th ed. §6.2,
/// from memory).
/// </summary>
public sealed record DoubleReciprocal(double Vmax, double Km, FitResult Line);

/// <summary>
/// The saturation law v0 = Vmax·[S]0/(Km + [S]0)·Π[Y]0^m (the other varied species Y by power law; constant species are
/// folded into Vmax), fitted on untransformed rates and compared with the power law by AICc.
/// <see cref="EvidenceRatio"/> = exp(|ΔAICc|/2) in favour of <see cref="Preferred"/>.
/// </summary>
public sealed record SaturationFindings(
    string Substrate,
    Estimate Vmax,
    Estimate Km,
    IReadOnlyList<Order> CoReactantOrders,
    FitResult Fit,
    double AiccPowerLaw,
    double AiccSaturation,
    double EvidenceRatio,
    string Preferred,
    DoubleReciprocal? CrossCheck);

/// <summary>The rate constant of one temperature group (runs whose plan temperatures agree within 0.05 K).</summary>
public sealed record TemperatureGroup(double TemperatureK, IReadOnlyList<string> Runs, RateConstant RateConstant);

/// <summary>
/// Arrhenius law k = A·exp(−Ea/(R·T)), fitted on k (weighted nonlinear least squares) as k = k_ref·exp(−Ea/R·(1/T − 1/T_ref))
/// so that k_ref and Ea are nearly uncorrelated; A follows. <see cref="Correlation"/> is corr(k_ref, Ea) and
/// <see cref="CorrelationLnAEa"/> corr(ln A, Ea). <see cref="LinearCheck"/> is Ea from the ln k against 1/T line.
/// </summary>
public sealed record ArrheniusFindings(
    Estimate ActivationEnergy,
    Estimate PreExponential,
    Estimate RateConstantAtReference,
    double ReferenceTemperatureK,
    double Correlation,
    double CorrelationLnAEa,
    FitResult Fit,
    Estimate? LinearCheck);

/// <summary>
/// Eyring law k = (k_B·T/h)·exp(ΔS‡/R)·exp(−ΔH‡/(R·T)) (transmission coefficient 1; standard state 1 mol/L for k with
/// concentration units), fitted on k by weighted nonlinear least squares; ΔG‡ = ΔH‡ − T·ΔS‡ at <see cref="AtTemperatureK"/>.
/// </summary>
public sealed record EyringFindings(
    Estimate EnthalpyOfActivation,
    Estimate EntropyOfActivation,
    Estimate GibbsEnergyOfActivation,
    double AtTemperatureK,
    double Correlation,
    FitResult Fit);

/// <summary>Temperature dependence: k per temperature group, and Arrhenius/Eyring fits when there are ≥ 3 temperatures.</summary>
public sealed record TemperatureFindings(IReadOnlyList<TemperatureGroup> Groups, ArrheniusFindings? Arrhenius, EyringFindings? Eyring);

/// <summary>
/// What the Series stage found. <see cref="Orders"/> come from the weighted nonlinear fit of v0 = k·Π[X]0^n on the rates
/// (<see cref="PowerLawFit"/>) when it converged, else from the log–log line (<see cref="LogLogOrders"/>, always given as
/// a cross-check). <see cref="RateConstant"/> is the headline k of a single-temperature series: at the rounded orders
/// (<see cref="RoundedOrders"/>) when every order's interval contains its simple value, else at the fitted orders;
/// <see cref="RateConstantAtFittedOrders"/> is always the latter. A series at several temperatures has no single k: see
/// <see cref="Temperature"/>. <see cref="ChosenLaw"/> is "power" or the name of a competing law (<see cref="SeriesLaws"/>).
/// </summary>
public sealed record SeriesFindings(
    IReadOnlyList<Order> Orders,
    RateConstant? RateConstant,
    RateConstant? RateConstantAtFittedOrders,
    IReadOnlyDictionary<string, double>? RoundedOrders,
    IReadOnlyList<RunRateConstant> PerRunK,
    IReadOnlyList<PairRatio> PairRatios,
    FitResult? OrderFit,
    IReadOnlyList<string> RunsUsed,
    IReadOnlyList<Warning> Warnings)
{
    public IReadOnlyList<Order> LogLogOrders { get; init; } = [];
    public FitResult? PowerLawFit { get; init; }
    public DesignCheck? Design { get; init; }
    public IReadOnlyList<CurvatureCheck> Curvature { get; init; } = [];
    /// <summary>Each fitted order judged against the simple values within the practical margin (OrderEquivalence).</summary>
    public IReadOnlyList<OrderVerdict> OrderVerdicts { get; init; } = [];
    public SaturationFindings? Saturation { get; init; }
    public string ChosenLaw { get; init; } = "power";
    public TemperatureFindings? Temperature { get; init; }
    public GlobalFitFindings? GlobalFit { get; init; }
    /// <summary>Competing laws without a place of their own in the findings (<see cref="ISeriesLaw.Attach"/>), in registry order.</summary>
    public IReadOnlyList<CompetingLawFindings> OtherLaws { get; init; } = [];

    /// <summary>
    /// How many pairs of runs differ in one species only; <see cref="PairRatios"/> lists the first
    /// <see cref="OrderAnalysis.MaxPairRatios"/> of them in plan order. Unset: the listed pairs are all there are.
    /// </summary>
    public long PairCount { get => _pairCount ?? PairRatios.Count; init => _pairCount = value; }

    private readonly long? _pairCount;
}
