using TraceKin.Setup;

namespace TraceKin.Signal;

/// <summary>
/// One kind of signal (series.toml <c>signal.kind</c>): the keys it reads, the checks they need together, the plan.csv
/// parameter columns it takes, and the conversion it builds for one run. Registered in <see cref="SignalKinds.All"/>.
/// </summary>
public interface ISignalKind
{
    /// <summary>The value of <c>signal.kind</c> that selects this kind.</summary>
    string Name { get; }

    /// <summary>
    /// Reads the keys this kind introduces into <paramref name="settings"/>. Every registered kind reads its keys
    /// whatever the chosen kind (as one table they were always all read), in registry order.
    /// </summary>
    SignalSettings Read(SignalTable table, SignalSettings settings) => settings;

    /// <summary>Checks that need several keys at once, when this kind is the chosen one.</summary>
    void Validate(SignalSettings settings, TomlSection table) { }

    /// <summary>The plan.csv parameter columns (<see cref="Setup.Plan.ConditionNames"/>) this kind reads; any other is refused.</summary>
    IReadOnlyList<string> PlanConditions(SignalSettings settings) => [];

    /// <summary>The signal column header `tracekin simulate` writes when signal.channel is not set, and the unit used when that header names none.</summary>
    (string Header, string Unit) SampleColumn { get; }

    /// <summary>The conversion for one run.</summary>
    SignalModel Build(SignalRun run);
}
