using System.Collections.Concurrent;
using System.Text.Json;
using TraceKin.Cli.Watch;

namespace TraceKin.Tests.Watch;

/// <summary>
/// The watcher as a separate process over an inbox fed with 208 invented exports (four ways of writing a file,
/// some bad, some edited after they were analysed), killed without warning at seeded random moments and restarted.
/// The ledger must show every content version analysed exactly once, and nothing in the inbox may change.
/// </summary>
public class WatcherKillTests
{
    private const int SeriesCount = 4;
    private const int RunsPerSeries = 52;
    private const int SettleMs = 300;

    private enum Mode { InPlace, Pieces, Rename, Copy }

    private sealed record Expected(string Series, string File, string Sha256, bool Good);

    [Fact]
    public void Killing_the_watcher_at_random_moments_loses_and_repeats_nothing()
    {
        var root = SeriesFixture.TempFolder("watch-kill");
        var inbox = Path.Combine(root, "inbox");
        var output = Path.Combine(root, "out");
        var staging = Path.Combine(root, "staging");
        Directory.CreateDirectory(staging);
        var rng = new Random(20260302);
        var (config, plan) = SeriesFixture.Parse(RunsPerSeries);
        var series = Enumerable.Range(1, SeriesCount).Select(i => $"line-{i}").ToArray();
        var written = new ConcurrentDictionary<string, string>(StringComparer.Ordinal); // raw path → sha256 last written
        var versions = new ConcurrentQueue<Expected>(); // in write order

        void Put(string path, string text, Mode mode)
        {
            var bytes = new System.Text.UTF8Encoding(false).GetBytes(text);
            switch (mode)
            {
                case Mode.InPlace:
                    File.WriteAllBytes(path, bytes);
                    break;
                case Mode.Pieces:
                    using (var fs = new FileStream(path, FileMode.Create, FileAccess.Write, FileShare.ReadWrite))
                    {
                        var third = bytes.Length / 3;
                        fs.Write(bytes, 0, third); fs.Flush();
                        Thread.Sleep(40);
                        fs.Write(bytes, third, third); fs.Flush();
                        Thread.Sleep(40);
                        fs.Write(bytes, 2 * third, bytes.Length - 2 * third);
                    }
                    break;
                case Mode.Rename:
                    var temp = Path.Combine(Path.GetDirectoryName(path)!, "." + Path.GetFileName(path) + ".part");
                    File.WriteAllBytes(temp, bytes);
                    File.Move(temp, path, overwrite: true);
                    break;
                case Mode.Copy:
                    var source = Path.Combine(staging, Guid.NewGuid().ToString("N"));
                    File.WriteAllBytes(source, bytes);
                    File.Copy(source, path, overwrite: true);
                    break;
            }
            written[path] = SeriesFixture.Sha256Text(text);
        }

        // Setup first; the last series starts with a bad series.toml that is fixed later.
        foreach (var s in series)
        {
            var dir = Path.Combine(inbox, s);
            Directory.CreateDirectory(dir);
            Put(Path.Combine(dir, "plan.csv"), SeriesFixture.PlanText(RunsPerSeries), Mode.InPlace);
            Put(Path.Combine(dir, "series.toml"), s == series[^1] ? SeriesFixture.BadToml : SeriesFixture.GoodToml, Mode.InPlace);
        }
        var badTomlSha = SeriesFixture.Sha256Text(SeriesFixture.BadToml);

        // Every export: which series and run, good or bad (about 1 in 12 bad), how it is written.
        var drops = series.SelectMany(s => Enumerable.Range(1, RunsPerSeries).Select(r => (Series: s, Run: r)))
            .Select(d => (d.Series, d.Run, Bad: rng.Next(12) == 0, Mode: (Mode)rng.Next(4)))
            .OrderBy(_ => rng.Next()).ToList();
        var killMoments = Enumerable.Range(0, 8).Select(_ => rng.Next(50, 1500)).ToList(); // ms after the watcher is up

        void Drop(string s, int run, string text, Mode mode, bool good)
        {
            var path = Path.Combine(inbox, s, SeriesFixture.FileOf(run));
            Put(path, text, mode);
            versions.Enqueue(new Expected(s, SeriesFixture.FileOf(run), SeriesFixture.Sha256Text(text), good));
        }

        string[] Args() => ["watch", inbox, "--out", output, "--settle-ms", $"{SettleMs}", "--rescan-ms", "1000", "--jobs", "2", "--workers", "2"];
        var watcher = WatcherProcess.Start(Args());
        var kills = 0;
        void KillAndRestart(int afterMs)
        {
            watcher.WaitUntilWatching(TimeSpan.FromSeconds(30));
            Thread.Sleep(afterMs);
            watcher.Kill();
            watcher.Dispose();
            kills++;
            watcher = WatcherProcess.Start(Args());
        }

        try
        {
            // Phase 1: feed every export while the watcher is killed and restarted.
            var feed = Background(() =>
            {
                foreach (var d in drops)
                {
                    var text = d.Bad ? SeriesFixture.BadExport.Replace("0.341", $"0.{d.Run:000}", StringComparison.Ordinal)
                        : SeriesFixture.ExportText(plan, config, d.Run, seed: d.Run);
                    Drop(d.Series, d.Run, text, d.Mode, !d.Bad);
                    Thread.Sleep(15);
                }
            });
            var k = 0;
            while (feed.IsAlive || kills < 5) KillAndRestart(killMoments[k++ % killMoments.Count]);
            feed.Join();
            Assert.Empty(WriterFailures);

            // A second watcher on the same output folder is refused while one runs.
            watcher.WaitUntilWatching(TimeSpan.FromSeconds(30));
            using (var second = WatcherProcess.Start(Args()))
            {
                Assert.Equal(1, second.WaitForExit(TimeSpan.FromSeconds(30)));
                Assert.Contains("already", second.Stderr, StringComparison.Ordinal);
            }

            WaitUntilSettled(output, Latest(versions), TimeSpan.FromSeconds(120), () => watcher.Stderr, setupRejected: series[^1]);
            var setupRejections = Ledger.ReadAll(Path.Combine(output, Ledger.FileName))
                .Where(r => r.Series == series[^1]).SelectMany(r => r.Inputs)
                .Count(i => i.File == "series.toml" && i.Sha256 == badTomlSha && i.New);
            Assert.Equal(1, setupRejections);

            // Phase 2: edit analysed exports, fix two bad ones and the bad series.toml, with two more kills.
            var edits = Background(() =>
            {
                foreach (var d in drops.Where(d => !d.Bad).Take(10))
                {
                    Drop(d.Series, d.Run, SeriesFixture.ExportText(plan, config, d.Run, seed: 1000 + d.Run), (Mode)(d.Run % 4), true);
                    Thread.Sleep(30);
                }
                foreach (var d in drops.Where(d => d.Bad).Take(2))
                    Drop(d.Series, d.Run, SeriesFixture.ExportText(plan, config, d.Run, seed: d.Run), Mode.Rename, true);
                Put(Path.Combine(inbox, series[^1], "series.toml"), SeriesFixture.GoodToml, Mode.Rename);
            });
            KillAndRestart(killMoments[k++ % killMoments.Count]);
            KillAndRestart(killMoments[k++ % killMoments.Count]);
            edits.Join();
            Assert.Empty(WriterFailures);
            WaitUntilSettled(output, Latest(versions), TimeSpan.FromSeconds(120), () => watcher.Stderr);
        }
        finally
        {
            watcher.Dispose();
        }
        Assert.True(kills >= 7);

        // A restart with nothing new does no work: --once adds no ledger record, and exits 2 (bad exports remain).
        var ledgerPath = Path.Combine(output, Ledger.FileName);
        var before = File.ReadAllLines(ledgerPath).Length;
        using (var once = WatcherProcess.Start([.. Args(), "--once"]))
            Assert.Equal(2, once.WaitForExit(TimeSpan.FromSeconds(60)));
        Assert.Equal(before, File.ReadAllLines(ledgerPath).Length);

        // Every content version was taken as new exactly once.
        var records = Ledger.ReadAll(ledgerPath);
        var marked = records.SelectMany(r => r.Inputs.Where(i => i.New).Select(i => (r.Series, i.File, i.Sha256)))
            .GroupBy(x => x).ToDictionary(g => g.Key, g => g.Count());
        Assert.All(marked, m => Assert.True(m.Value == 1, $"{m.Key} was taken as new {m.Value} times"));
        // Versions replaced while their series waited for its series.toml fix are rightly never analysed.
        var latest = Latest(versions);
        foreach (var v in versions.Where(v => v.Series != series[^1]).Concat(latest.Values))
            Assert.True(marked.ContainsKey((v.Series, v.File, v.Sha256)), $"{v.Series}/{v.File} version {v.Sha256[..8]} was never analysed");
        Assert.True(versions.Count >= 200 + 12);

        // Final outputs: parseable, complete, bad files listed once.
        foreach (var s in series)
        {
            var dir = Path.Combine(output, s);
            using var summary = JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "summary.json")));
            var runs = summary.RootElement.GetProperty("runs").EnumerateArray()
                .ToDictionary(r => r.GetProperty("file").GetString()!, r => r.GetProperty("sha256").GetString()!);
            var rejected = summary.RootElement.GetProperty("rejected").EnumerateArray().Select(r => r.GetProperty("file").GetString()!).ToList();
            foreach (var v in latest.Values.Where(v => v.Series == s))
            {
                if (v.Good) Assert.Equal(v.Sha256, runs[v.File]);
                else Assert.Single(rejected, f => f == v.File);
            }
            Assert.Equal(latest.Values.Count(v => v.Series == s && v.Good), runs.Count);
            Assert.Equal(latest.Values.Count(v => v.Series == s && !v.Good), rejected.Count);
            Assert.True(File.ReadAllLines(Path.Combine(dir, "runs.csv")).Length >= runs.Count + 1);
            var pngs = Directory.GetFiles(Path.Combine(dir, "plots"), "*.png");
            Assert.True(pngs.Length >= runs.Count);
            foreach (var png in pngs)
                Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, File.ReadAllBytes(png)[..8]); // PNG signature (ISO/IEC 15948)
            Assert.Empty(Directory.GetFiles(dir, "*.tmp", SearchOption.AllDirectories));
        }

        // The inbox is exactly as the instruments left it.
        foreach (var (path, sha) in written)
            Assert.Equal(sha, SeriesFixture.Sha256(path));
        Directory.Delete(root, recursive: true);
    }

    private static readonly ConcurrentQueue<Exception> WriterFailures = new();

    /// <summary>A writer thread; what it throws is kept and fails the test.</summary>
    private static Thread Background(Action work)
    {
        var t = new Thread(() =>
        {
            try { work(); }
            catch (Exception ex) { WriterFailures.Enqueue(ex); }
        }) { IsBackground = true };
        t.Start();
        return t;
    }

    /// <summary>The last version written of each export.</summary>
    private static Dictionary<(string, string), Expected> Latest(ConcurrentQueue<Expected> versions)
    {
        var byFile = new Dictionary<(string, string), Expected>();
        foreach (var v in versions) byFile[(v.Series, v.File)] = v;
        return byFile;
    }

    private static void WaitUntilSettled(string output, Dictionary<(string, string), Expected> latest, TimeSpan timeout, Func<string> stderr,
        string? setupRejected = null)
    {
        var until = DateTime.UtcNow + timeout;
        while (DateTime.UtcNow < until)
        {
            var all = Ledger.ReadAll(Path.Combine(output, Ledger.FileName));
            var bySeries = all.GroupBy(r => r.Series).ToDictionary(g => g.Key, g => g.Last());
            var done = latest.Values.All(v => bySeries.TryGetValue(v.Series, out var r) && (v.Series == setupRejected
                ? r.Setup == LedgerRecord.SetupRejected
                : r.Setup == LedgerRecord.SetupOk && r.Input(v.File) is { } i && i.Sha256 == v.Sha256
                    && i.Status == (v.Good ? LedgerInput.Analysed : LedgerInput.Rejected)));
            if (done) return;
            Thread.Sleep(200);
        }
        Assert.Fail($"the watcher did not catch up within {timeout.TotalSeconds} s; its stderr:\n{stderr()}");
    }
}
