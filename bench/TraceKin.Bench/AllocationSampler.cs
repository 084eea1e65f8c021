using System.Collections.Concurrent;
using System.Diagnostics.Tracing;

/// <summary>
/// Where a stretch of code allocates, from the runtime's allocation sampling (one GCAllocationTick event about every
/// 100 kB allocated, naming the type of the object that crossed the mark and whether it went to the large-object
/// heap): bytes by type, small and large apart. A sample, not a count: types that allocate little are missed.
/// Benchmark-only.
/// </summary>
internal sealed class AllocationSampler : EventListener
{
    private const EventKeywords GcKeyword = (EventKeywords)0x1;
    private volatile bool _on;
    public ConcurrentDictionary<string, long> Small { get; } = new(StringComparer.Ordinal);
    public ConcurrentDictionary<string, long> Large { get; } = new(StringComparer.Ordinal);

    public void Start() => _on = true;
    public void Stop() => _on = false;

    /// <summary>`PREFIX_large TYPE: MB` and `PREFIX_small TYPE: MB` lines, the 15 largest of each.</summary>
    public void Print(string prefix, IFormatProvider ci)
    {
        foreach (var (type, bytes) in Large.OrderByDescending(kv => kv.Value).Take(15))
            Console.WriteLine(string.Create(ci, $"{prefix}_large {type}: {bytes / 1e6:F1} MB (sampled)"));
        foreach (var (type, bytes) in Small.OrderByDescending(kv => kv.Value).Take(15))
            Console.WriteLine(string.Create(ci, $"{prefix}_small {type}: {bytes / 1e6:F1} MB (sampled)"));
    }

    protected override void OnEventSourceCreated(EventSource source)
    {
        if (source.Name == "Microsoft-Windows-DotNETRuntime") EnableEvents(source, EventLevel.Verbose, GcKeyword);
    }

    protected override void OnEventWritten(EventWrittenEventArgs e)
    {
        if (!_on || e.EventName is null || !e.EventName.StartsWith("GCAllocationTick", StringComparison.Ordinal) || e.PayloadNames is null) return;
        var names = e.PayloadNames;
        object? Get(string n) { var i = names.IndexOf(n); return i < 0 ? null : e.Payload![i]; }
        var amount = Convert.ToInt64(Get("AllocationAmount64") ?? Get("AllocationAmount") ?? 0L, System.Globalization.CultureInfo.InvariantCulture);
        var kind = Convert.ToInt32(Get("AllocationKind") ?? 0, System.Globalization.CultureInfo.InvariantCulture);
        var type = Get("TypeName") as string ?? "?";
        (kind == 1 ? Large : Small).AddOrUpdate(type, amount, (_, v) => v + amount);
    }
}
