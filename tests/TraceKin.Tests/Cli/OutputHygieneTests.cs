using TraceKin.Cli;
using TraceKin.Cli.Commands;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Cli;

// Re-using an output folder: what a second analysis leaves there is exactly what it would have left in an empty folder
// (robustness, no source needed). Series A is the temperature demo (it has Arrhenius and Eyring plots), series B the
// acid demo (it has none), both bundled invented samples.
public sealed class OutputHygieneTests : IDisposable
{
    private static readonly string SeriesA = RepoPaths.Sample("amber-ester-warmth");
    private static readonly string SeriesB = RepoPaths.Sample("violet-complex-acid");
    private readonly RepoPaths.TempDir _dir = new();

    public void Dispose() => _dir.Dispose();

    private static int Analyse(string series, string outDir, bool plots = true) =>
        AnalyseCommand.Run(new DirectoryInfo(series), new DirectoryInfo(outDir), plots, workers: 2, error: new StringWriter());

    /// <summary>Every file below the folder (relative path → bytes), leaving out the lock files, which are not results.</summary>
    private static Dictionary<string, byte[]> Files(string dir) =>
        Directory.EnumerateFiles(dir, "*", SearchOption.AllDirectories)
            .Select(f => Path.GetRelativePath(dir, f))
            .Where(f => f is not (OutputLock.FileName or OutputLock.OwnerFileName))
            .ToDictionary(f => f, f => File.ReadAllBytes(Path.Combine(dir, f)), StringComparer.Ordinal);

    [Fact]
    public void Analysing_series_B_into_the_out_of_series_A_leaves_no_byte_of_A()
    {
        var shared = Path.Combine(_dir.Path, "shared");
        var fresh = Path.Combine(_dir.Path, "fresh");
        Assert.Equal(ExitCodes.Ok, Analyse(SeriesA, shared));
        var a = Files(shared);
        Assert.Contains(a.Keys, f => f.StartsWith("plots" + Path.DirectorySeparatorChar + "arrhenius", StringComparison.Ordinal)); // A has plots B lacks
        Assert.Equal(ExitCodes.Ok, Analyse(SeriesB, shared));
        Assert.Equal(ExitCodes.Ok, Analyse(SeriesB, fresh));
        var afterB = Files(shared);
        var onlyB = Files(fresh);

        // The same files as B alone gives, with the same bytes (the log differs only in its time stamps).
        Assert.Equal(onlyB.Keys.Order(StringComparer.Ordinal), afterB.Keys.Order(StringComparer.Ordinal));
        foreach (var (name, bytes) in onlyB.Where(kv => kv.Key != AnalyseCommand.LogFile))
            Assert.True(bytes.AsSpan().SequenceEqual(afterB[name]), $"{name} differs from a fresh analysis of B");

        // No file of A is left as it was (unless B alone writes the very same bytes, as a table with its header only),
        // and the report embeds none of A's pictures.
        foreach (var (name, bytes) in a)
            Assert.False(afterB.TryGetValue(name, out var now) && now.AsSpan().SequenceEqual(bytes)
                && !(onlyB.TryGetValue(name, out var fromB) && fromB.AsSpan().SequenceEqual(bytes)), $"{name} of series A is still there");
        var report = File.ReadAllText(Path.Combine(shared, "report.html"));
        foreach (var (name, bytes) in a.Where(kv => kv.Key.EndsWith(".png", StringComparison.Ordinal)))
            Assert.DoesNotContain(Convert.ToBase64String(bytes)[..200], report, StringComparison.Ordinal);

        // One log per analysis: B's log does not continue A's.
        var log = File.ReadAllText(Path.Combine(shared, AnalyseCommand.LogFile));
        Assert.DoesNotContain(SeriesA, log, StringComparison.Ordinal);
        Assert.Single(log.Split('\n'), l => l.Contains(": analysing ", StringComparison.Ordinal));
        Assert.Contains("removed ", log, StringComparison.Ordinal);
    }

    [Fact]
    public void An_analysis_without_plots_removes_the_plots_of_an_earlier_one_but_nothing_that_is_not_ours()
    {
        var outDir = Path.Combine(_dir.Path, "out");
        Assert.Equal(ExitCodes.Ok, Analyse(SeriesB, outDir));
        File.WriteAllText(Path.Combine(outDir, "notes.txt"), "mine");
        File.WriteAllText(Path.Combine(outDir, "plots", "sketch.svg"), "mine too");
        Directory.CreateDirectory(Path.Combine(outDir, "plots", "old"));
        Assert.Equal(ExitCodes.Ok, Analyse(SeriesB, outDir, plots: false));
        Assert.Empty(Directory.EnumerateFiles(Path.Combine(outDir, "plots"), "*.png"));
        Assert.Equal("mine", File.ReadAllText(Path.Combine(outDir, "notes.txt")));
        Assert.Equal("mine too", File.ReadAllText(Path.Combine(outDir, "plots", "sketch.svg")));
        Assert.True(Directory.Exists(Path.Combine(outDir, "plots", "old")));
        Assert.True(File.Exists(Path.Combine(outDir, "summary.json")));
    }
}
