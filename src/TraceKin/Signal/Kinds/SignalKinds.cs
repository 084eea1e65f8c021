using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>The registered signal kinds, in one place: a new kind is one file and one line here.</summary>
internal static class SignalKinds
{
    /// <summary>Every kind TraceKin converts, in the order errors and docs list them (and their keys are read).</summary>
    public static IReadOnlyList<ISignalKind> All { get; } =
    [
        new AbsorbanceKind(),
        new CalibratedKind(),
        new GasVolumeKind(),
        new PressureKind(),
        new ConductivityKind(),
    ];

    /// <summary>The names of <see cref="All"/>.</summary>
    public static IReadOnlyList<string> Names { get; } = All.Select(k => k.Name).ToArray();

    /// <summary>The kind of that name, or null.</summary>
    public static ISignalKind? Find(string name) => All.FirstOrDefault(k => k.Name == name);

    /// <summary>The settings' kind; an unknown one is a settings error listing the registered names.</summary>
    public static ISignalKind Of(SignalSettings s) =>
        Find(s.Kind) ?? throw Fail.Setting(s.Source, "signal.kind", Fail.Quote(s.Kind), $"one of: {string.Join(", ", Names)}");
}
