using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>One run as the Series stage sees it: its initial rate and starting conditions (mol/L, K).</summary>
public sealed record RunPoint(
    string RunId,
    double Rate,
    double RateStdError,
    IReadOnlyDictionary<string, double> InitialConcentrations,
    double? TemperatureK);

/// <summary>A reaction order with its standard error, dof and 95 % Student-t interval.</summary>
public sealed record Order(string Species, double Value, double StdError, int Dof, double Ci95Low, double Ci95High, string Method);

/// <summary>A rate constant in <see cref="Unit"/> with its standard error and 95 % interval (which may be asymmetric).</summary>
public sealed record RateConstant(double Value, double StdError, string Unit, int Dof, double Ci95Low, double Ci95High, string Method);

/// <summary>k for one run at the fitted orders: rate / Π[X]0^n.</summary>
public sealed record RunRateConstant(string RunId, double Value, double StdError);

/// <summary>The order of one species from two runs that differ only in its starting concentration.</summary>
public sealed record PairRatio(string RunA, string RunB, string Species, double ConcentrationRatio, double RateRatio, double Order, double StdError);

/// <summary>
/// What the Series stage found: orders, rate constant, per-run k and pairwise ratios. <see cref="RateConstant"/> is the
/// headline k: at the rounded orders (<see cref="RoundedOrders"/>) when every order's interval contains its simple value,
/// else at the fitted orders; <see cref="RateConstantAtFittedOrders"/> is always the latter.
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
    IReadOnlyList<Warning> Warnings);
