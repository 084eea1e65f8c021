using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Rates;

/// <summary>An integrated rate law fitted to a run's time course; <see cref="Fitted"/> holds the model at every trace time.</summary>
public sealed record LawFit(string Law, FitResult Fit, double[] Fitted, bool Chosen);

/// <summary>Everything the Rates stage found for one run: the headline initial rate, the alternatives, law fits, warnings.</summary>
public sealed record RunRates(
    InitialRate Headline,
    IReadOnlyList<InitialRate> Estimates,
    IReadOnlyList<LawFit> Fits,
    IReadOnlyList<Warning> Warnings);
