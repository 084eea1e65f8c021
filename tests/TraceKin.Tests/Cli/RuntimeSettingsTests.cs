using System.Text.Json;

namespace TraceKin.Tests.Cli;

/// <summary>
/// The garbage-collector settings the command line ships with (its runtimeconfig.json, built beside the tests): the
/// peak memory of a large batch depends on them (bench/README.md, "Memory, 2026-12-04 04:50 UTC"), so losing one in
/// a project-file edit must show here rather than only in the bench.
/// </summary>
public sealed class RuntimeSettingsTests
{
    private static JsonElement ConfigProperties()
    {
        var path = Path.Combine(AppContext.BaseDirectory, "tracekin.runtimeconfig.json");
        using var doc = JsonDocument.Parse(File.ReadAllText(path));
        return doc.RootElement.GetProperty("runtimeOptions").GetProperty("configProperties").Clone();
    }

    [Fact]
    public void Arrays_up_to_two_mebibytes_stay_off_the_large_object_heap()
    {
        // System.GC.LOHThreshold: bytes from which an object goes to the large-object heap (runtime default 85,000;
        // .NET documentation, "Runtime configuration options for garbage collection", from memory).
        var p = ConfigProperties();
        Assert.True(p.TryGetProperty("System.GC.LOHThreshold", out var v), "tracekin.runtimeconfig.json sets System.GC.LOHThreshold");
        Assert.Equal(2 * 1024 * 1024, v.GetInt64());
    }
}
