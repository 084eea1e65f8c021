using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>Signal (internal unit) → concentration (mol/L) for every point of a trace.</summary>
public delegate void ConcentrationsFromSignal(ReadOnlySpan<double> signal, Span<double> concentration);

/// <summary>
/// One run's conversion, both ways: signal → concentration of the followed species (for analysis) and
/// concentration → signal (for simulation), with the conversion's own uncertainty. Built from the [signal] settings,
/// the run's plan row and, when given, its export (which supplies "first sample" defaults).
/// </summary>
public sealed record SignalModel
{
    /// <summary>What the signal is: the quantity and internal unit the channel must carry.</summary>
    public required Quantity SignalQuantity { get; init; }
    public required string SignalUnit { get; init; }
    /// <summary>Signal (internal unit) and temperature (K) → concentration (mol/L).</summary>
    public required Func<double, double, double> ToConcentration { get; init; }
    /// <summary>
    /// <see cref="ToConcentration"/> for a whole trace at once, when the conversion does not depend on temperature and
    /// has a faster form than a call per point (same doubles); else null.
    /// </summary>
    public ConcentrationsFromSignal? ToConcentrations { get; init; }
    /// <summary>Concentration (mol/L) and temperature (K) → signal (internal unit).</summary>
    public required Func<double, double, double> ToSignal { get; init; }
    /// <summary>Relative standard uncertainty of the concentration scale (d c/d signal), GUM first order.</summary>
    public required double RelativeSystematicUncertainty { get; init; }
    /// <summary>Each uncertain input's relative contribution to <see cref="RelativeSystematicUncertainty"/>.</summary>
    public required IReadOnlyList<KeyValuePair<string, double>> Budget { get; init; }
    /// <summary>Constants and parameters the conversion used, as "name" → "value unit (source)".</summary>
    public required IReadOnlyList<KeyValuePair<string, string>> ConstantsUsed { get; init; }
    /// <summary>The run's temperature, K, when known (the default for points without their own reading).</summary>
    public double? Temperature { get; init; }
    /// <summary>The calibration curve read backwards, when the conversion uses one.</summary>
    public CalibrationCurve? Curve { get; init; }
    /// <summary>True when each point's own temperature matters (conductivity with temperature compensation).</summary>
    public bool UsesPointTemperature { get; init; }
    /// <summary>Signal and temperature → the value the calibration curve is read at (compensated conductivity; else the signal).</summary>
    public Func<double, double, double> CurveInput { get; init; } = (y, _) => y;

    /// <summary>
    /// The conversion for one run, built by the settings' kind (<see cref="SignalKinds"/>). <paramref name="export"/>
    /// may be null (simulation): then no default comes from its first sample.
    /// </summary>
    public static SignalModel For(SignalSettings settings, PlanRow row, RunExport? export = null)
    {
        var run = new SignalRun(settings, row, export);
        return SignalKinds.Of(run.Settings).Build(run);
    }
}
