using Serilog;
using TraceKin.Cli.Watch;
using TraceKin.Tests.Plates;

namespace TraceKin.Tests.Watch;

/// <summary>Plate exports in an inbox series: every well of a plate is a run; a rewritten plate redraws only its own runs' plots. Invented data.</summary>
public class PlateWatchTests
{
    private static readonly TimeSpan Settle = TimeSpan.FromSeconds(1);

    [Fact]
    public void A_plate_dropped_into_an_inbox_gives_all_its_runs_and_a_rewritten_plate_redraws_only_its_own()
    {
        var inbox = SeriesFixture.TempFolder("inbox");
        var outDir = SeriesFixture.TempFolder("out");
        var folder = Path.Combine(inbox, "plates");
        Directory.CreateDirectory(folder);
        File.WriteAllText(Path.Combine(folder, "series.toml"), PlateFolder.Toml);
        File.WriteAllText(Path.Combine(folder, "plan.csv"), """
            run,file,channel,[S]0 (mmol/L)
            p1a,one.csv,A1,0.4
            p1b,one.csv,A2,0.6
            p2a,two.csv,A1,0.4
            p2b,two.csv,A2,0.8
            """);
        File.WriteAllText(Path.Combine(folder, "one.csv"), PlateFolder.Wide([("A1", 0.0004, 0.01), ("A2", 0.0006, 0.01)], seed: 1));
        File.WriteAllText(Path.Combine(folder, "two.csv"), PlateFolder.Wide([("A1", 0.0004, 0.01), ("A2", 0.0008, 0.01)], seed: 2));
        var clock = new FakeClock(DateTimeOffset.UtcNow - TimeSpan.FromHours(1));
        var status = new List<string>();
        using var ledger = Ledger.Open(outDir);
        var watch = new SeriesWatch(folder, new WatchOptions { Inbox = inbox, Out = outDir, Settle = Settle, Workers = 1, Plots = true },
            new FileStability(clock, Settle), ledger, clock, new LoggerConfiguration().CreateLogger(), status.Add);

        SeriesPass? pass = null;
        for (var i = 0; i < 4 && pass?.Analysed != true; i++) { pass = watch.Pass(); clock.Advance(Settle); }
        Assert.True(pass!.Analysed);
        Assert.Contains(status, s => s == "plates/one.csv: analysed, 2 runs (p1a … p1b)");
        Assert.Contains(status, s => s == "plates/two.csv: analysed, 2 runs (p2a … p2b)");
        var plots = Path.Combine(outDir, "plates", "plots");
        var before = Directory.GetFiles(plots, "run-*.png").ToDictionary(f => Path.GetFileName(f), File.GetLastWriteTimeUtc);
        Assert.Equal(4, before.Count);

        Thread.Sleep(20);   // so a rewritten picture has a later write time than the first
        File.WriteAllText(Path.Combine(folder, "two.csv"), PlateFolder.Wide([("A1", 0.0004, 0.01), ("A2", 0.0008, 0.01)], seed: 3));
        status.Clear();
        pass = null;
        for (var i = 0; i < 4 && pass?.Analysed != true; i++) { pass = watch.Pass(); clock.Advance(Settle); }
        Assert.True(pass!.Analysed);
        Assert.Equal(["plates/two.csv: analysed, 2 runs (p2a … p2b)"], status.Where(s => s.Contains(": analysed", StringComparison.Ordinal)));
        var after = Directory.GetFiles(plots, "run-*.png").ToDictionary(f => Path.GetFileName(f), File.GetLastWriteTimeUtc);
        Assert.Equal(before["run-p1a.png"], after["run-p1a.png"]);
        Assert.Equal(before["run-p1b.png"], after["run-p1b.png"]);
        Assert.NotEqual(before["run-p2a.png"], after["run-p2a.png"]);
        Assert.NotEqual(before["run-p2b.png"], after["run-p2b.png"]);
        ledger.Dispose();
        foreach (var d in new[] { inbox, outDir })
            try { Directory.Delete(d, recursive: true); } catch (IOException) { }
    }
}
