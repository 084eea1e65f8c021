namespace TraceKin.Tests.Watch;

/// <summary>A clock that moves only when told, for the settle and debounce logic (no sleeps in tests).</summary>
public sealed class FakeClock(DateTimeOffset start) : TimeProvider
{
    private DateTimeOffset _now = start;

    public override DateTimeOffset GetUtcNow() => _now;

    public void Advance(TimeSpan by) => _now += by;
}
