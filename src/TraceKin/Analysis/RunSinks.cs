using TraceKin.Setup;

namespace TraceKin.Analysis;

/// <summary>Several sinks as one: each run goes to every sink, in order; a sink that throws does not keep the run
/// from the others (the first exception is thrown once all have seen it, and becomes the run's warning).</summary>
public sealed class RunSinks(params IRunSink?[] sinks) : IRunSink
{
    private readonly IRunSink[] _sinks = sinks.OfType<IRunSink>().ToArray();

    /// <summary>The one sink, several as one, or null for none.</summary>
    public static IRunSink? Combine(params IRunSink?[] sinks)
    {
        var present = sinks.OfType<IRunSink>().ToArray();
        return present.Length switch { 0 => null, 1 => present[0], _ => new RunSinks(present) };
    }

    public void Begin(Plan plan) => Each(s => s.Begin(plan));

    public void Accept(RunResult run) => Each(s => s.Accept(run));

    public void Rejected(PlanRow row) => Each(s => s.Rejected(row));

    private void Each(Action<IRunSink> call)
    {
        Exception? first = null;
        foreach (var s in _sinks)
        {
            try { call(s); }
            catch (Exception ex) when (ex is not OperationCanceledException) { first ??= ex; }
        }
        if (first is not null) System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(first);
    }
}
