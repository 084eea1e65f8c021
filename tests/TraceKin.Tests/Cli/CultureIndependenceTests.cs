using System.Globalization;
using System.Text.RegularExpressions;
using TraceKin.Cli;
using TraceKin.Cli.Commands;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Cli;

// The machine's culture must not change a byte of what an analysis writes: summary, tables, report, plots and the log
// lines (robustness, no source needed). The series is the bundled invented temperature demo, which has every kind of
// plot and the most numbers in text.
public sealed class CultureIndependenceTests : IDisposable
{
    private readonly RepoPaths.TempDir _dir = new();

    public void Dispose() => _dir.Dispose();

    private Dictionary<string, byte[]> AnalyseUnder(string culture)
    {
        var outDir = Path.Combine(_dir.Path, "out");
        if (Directory.Exists(outDir)) Directory.Delete(outDir, recursive: true);
        var (saved, savedUi) = (CultureInfo.CurrentCulture, CultureInfo.CurrentUICulture);
        try
        {
            CultureInfo.CurrentCulture = CultureInfo.CurrentUICulture = CultureInfo.GetCultureInfo(culture);
            Assert.Equal(ExitCodes.Ok, AnalyseCommand.Run(new DirectoryInfo(RepoPaths.Sample("amber-ester-warmth")), new DirectoryInfo(outDir), plots: true, workers: 2, error: new StringWriter()));
        }
        finally
        {
            CultureInfo.CurrentCulture = saved;
            CultureInfo.CurrentUICulture = savedUi;
        }
        var files = Directory.EnumerateFiles(outDir, "*", SearchOption.AllDirectories)
            .Select(f => Path.GetRelativePath(outDir, f))
            .Where(f => f is not (OutputLock.FileName or OutputLock.OwnerFileName))
            .ToDictionary(f => f, f => File.ReadAllBytes(Path.Combine(outDir, f)), StringComparer.Ordinal);
        // The log's lines start with the time they were written, and the per-run lines come in the order the workers
        // finish; the rest of each line must match. Progress lines ("3 of 8 run(s) done, …") appear only when a batch
        // takes longer than their interval, as on a loaded machine, and the timing line holds wall times: left out.
        var log = File.ReadAllLines(Path.Combine(outDir, AnalyseCommand.LogFile)).Select(l => Regex.Replace(l, @"^\S+ \S+ \S+ ", ""))
            .Where(l => !l.Contains(" run(s) done", StringComparison.Ordinal) && !l.Contains("timing: ", StringComparison.Ordinal)).Order(StringComparer.Ordinal);
        files[AnalyseCommand.LogFile] = System.Text.Encoding.UTF8.GetBytes(string.Join("\n", log));
        return files;
    }

    [Fact]
    public void The_same_series_under_invariant_German_and_French_cultures_gives_the_same_bytes()
    {
        var invariant = AnalyseUnder("");
        Assert.Contains(invariant.Keys, f => f.EndsWith(".png", StringComparison.Ordinal));
        foreach (var culture in new[] { "de-DE", "fr-FR" })
        {
            var other = AnalyseUnder(culture);
            Assert.Equal(invariant.Keys.Order(StringComparer.Ordinal), other.Keys.Order(StringComparer.Ordinal));
            foreach (var (name, bytes) in invariant)
                Assert.True(bytes.AsSpan().SequenceEqual(other[name]), $"{name} differs under {culture}" +
                    (name.EndsWith(".png", StringComparison.Ordinal) ? "" : FirstDifference(bytes, other[name])));
        }
    }

    private static string FirstDifference(byte[] a, byte[] b)
    {
        var i = 0;
        while (i < a.Length && i < b.Length && a[i] == b[i]) i++;
        string At(byte[] x) => System.Text.Encoding.UTF8.GetString(x, Math.Max(0, i - 60), Math.Min(x.Length, i + 60) - Math.Max(0, i - 60));
        return $": invariant «{At(a)}» against «{At(b)}»";
    }
}
