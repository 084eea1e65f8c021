using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Rates;

/// <summary>An integrated rate law fitted to a run's time course; <see cref="Fitted"/> holds the model at every trace
/// time for the chosen law (empty for the others).</summary>
public sealed record LawFit(string Law, FitResult Fit, bool Chosen)
{
    private ModelCurve _fitted = ModelCurve.Empty;

    /// <summary>The model at every trace time, evaluated when first asked for (a plot, the spike check): a batch
    /// without plots never pays for it.</summary>
    public double[] Fitted { get => _fitted.Values; init => _fitted = ModelCurve.Of(value); }

    /// <summary>Sets <see cref="Fitted"/> to be computed on first use.</summary>
    internal Func<double[]> FittedBy { init => _fitted = new ModelCurve(value); }

    /// <summary>True when the model carries a linear baseline-drift term.</summary>
    public bool Drift { get; init; }
    /// <summary>AICc − lowest AICc among all converged fits; NaN if not converged.</summary>
    public double DeltaAicc { get; init; } = double.NaN;
    /// <summary>Akaike weight exp(−Δ/2)/Σexp(−Δ/2) over all converged fits (Burnham &amp; Anderson 2002, eq. 2.14).</summary>
    public double AkaikeWeight { get; init; } = double.NaN;
    /// <summary>Rate constant k of v = k·Π[X]^n (same as the fit's "k" parameter), its unit and 95 % interval.</summary>
    public double RateConstant { get; init; } = double.NaN;
    public double RateConstantStdError { get; init; } = double.NaN;
    public string RateConstantUnit { get; init; } = "";
    public double Ci95Low { get; init; } = double.NaN;
    public double Ci95High { get; init; } = double.NaN;
    /// <summary>Half-life of the species that runs out (s) and its standard error (relative error of k).</summary>
    public double HalfLife { get; init; } = double.NaN;
    public double HalfLifeStdError { get; init; } = double.NaN;
    /// <summary>Wald–Wolfowitz runs test on the residual signs.</summary>
    public RunsTest? Runs { get; init; }
    /// <summary>Why this converged fit took no part in the law choice (e.g. a drift term entangled with k), or null.</summary>
    public string? ExcludedBecause { get; init; }
    /// <summary>True when the residuals show a pattern (runs test P &lt; 0.001) or scatter far above the trace's own noise.</summary>
    public bool LackOfFit { get; init; }
}

/// <summary>A model's values at every trace time, given or computed once on first use (thread-safe).</summary>
internal sealed class ModelCurve
{
    public static readonly ModelCurve Empty = new(Array.Empty<double>());
    private readonly Lazy<double[]> _values;
    public ModelCurve(double[] values) => _values = new Lazy<double[]>(values);
    public ModelCurve(Func<double[]> compute) => _values = new Lazy<double[]>(compute, LazyThreadSafetyMode.ExecutionAndPublication);
    /// <summary>Given values; no points is the one shared empty curve (a run kept without its points holds no copy).</summary>
    public static ModelCurve Of(double[] values) => values.Length == 0 ? Empty : new ModelCurve(values);
    public double[] Values => _values.Value;
}

/// <summary>Everything the Rates stage found for one run: the headline initial rate, the alternatives, law fits, warnings.</summary>
public sealed record RunRates(
    InitialRate Headline,
    IReadOnlyList<InitialRate> Estimates,
    IReadOnlyList<LawFit> Fits,
    IReadOnlyList<Warning> Warnings)
{
    /// <summary>Time (s) from mixing (t0 = 0) to the first sample.</summary>
    public double DeadTime { get; init; }
    /// <summary>Samples excluded as spikes (Hampel identifier), with their times.</summary>
    public IReadOnlyList<Spike> Spikes { get; init; } = [];
    /// <summary>How the headline estimate was picked, in one sentence.</summary>
    public string HeadlineRule { get; init; } = "";
    /// <summary>The law fit chosen by AICc, if any converged.</summary>
    public LawFit? ChosenLaw => Fits.FirstOrDefault(f => f.Chosen);
    /// <summary>Why the initial rate is not resolved (its estimates disagree, or it has the wrong sign), or null. An
    /// unresolved run is left out of the series fits unless the user keeps it (model.use_unresolved).</summary>
    public string? Unresolved { get; init; }
    public bool IsResolved => Unresolved is null;
    /// <summary>True when no integer-order law describes the trace (see <see cref="LawFit.LackOfFit"/>).</summary>
    public bool NoIntegerLawFits { get; init; }
}
