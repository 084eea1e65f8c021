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
        // the per-run stage ran for the rewritten plate's two runs only; the other plate's runs were kept as they were
        Assert.Equal((2, 2), watch.LastRunCounts);
        var after = Directory.GetFiles(plots, "run-*.png").ToDictionary(f => Path.GetFileName(f), File.GetLastWriteTimeUtc);
        Assert.Equal(before["run-p1a.png"], after["run-p1a.png"]);
        Assert.Equal(before["run-p1b.png"], after["run-p1b.png"]);
        Assert.NotEqual(before["run-p2a.png"], after["run-p2a.png"]);
        Assert.NotEqual(before["run-p2b.png"], after["run-p2b.png"]);
        ledger.Dispose();
        foreach (var d in new[] { inbox, outDir })
            try { Directory.Delete(d, recursive: true); } catch (IOException) { }
    }

    private static SeriesPass Settled(SeriesWatch watch, FakeClock clock)
    {
        SeriesPass? pass = null;
        for (var i = 0; i < 4 && pass?.Analysed != true; i++) { pass = watch.Pass(); clock.Advance(Settle); }
        return pass!;
    }

    [Fact]
    public void A_plate_map_edited_in_an_inbox_re_analyses_the_wells_it_changed_and_the_series()
    {
        var inbox = SeriesFixture.TempFolder("inbox");
        var outDir = SeriesFixture.TempFolder("out");
        var folder = Path.Combine(inbox, "mapped");
        Directory.CreateDirectory(folder);
        File.WriteAllText(Path.Combine(folder, "series.toml"), PlateFolder.Toml + "\n\n[plate]\nexport = \"plate.csv\"\n");
        const string map = "[S]0 (mmol/L),1,2\nA,0.4,0.6\nB,0.8,1.0\n";
        File.WriteAllText(Path.Combine(folder, "plate-map.csv"), map);
        File.WriteAllText(Path.Combine(folder, "plate.csv"), PlateFolder.Wide([("A1", 0.0004, 0.01), ("A2", 0.0006, 0.01), ("B1", 0.0008, 0.01), ("B2", 0.0010, 0.01)], seed: 4));
        Assert.True(SeriesWatch.IsSeriesFolder(folder));
        var clock = new FakeClock(DateTimeOffset.UtcNow - TimeSpan.FromHours(1));
        var status = new List<string>();
        using var ledger = Ledger.Open(outDir);
        var watch = new SeriesWatch(folder, new WatchOptions { Inbox = inbox, Out = outDir, Settle = Settle, Workers = 1, Plots = false },
            new FileStability(clock, Settle), ledger, clock, new LoggerConfiguration().CreateLogger(), status.Add);

        // the first look, before series.toml has settled, must not take the folder for a vanished series (no plan.csv)
        Assert.False(watch.Pass().Gone);
        var pass = Settled(watch, clock);
        Assert.True(pass.Analysed);
        Assert.Equal(0, pass.Rejected);
        Assert.Equal((0, 4), watch.LastRunCounts);
        Assert.Contains("mapped/plate-map.csv: taken", status);
        Assert.Contains(pass.Committed!.Inputs, i => i.File == "plate-map.csv" && i.Status == LedgerInput.Setup);
        var runs = File.ReadAllText(Path.Combine(outDir, "mapped", "runs.csv"));

        // one well's [S]0 corrected in the map: that run is analysed again, the three others are kept, the series refitted
        File.WriteAllText(Path.Combine(folder, "plate-map.csv"), map.Replace("B,0.8,1.0", "B,0.8,1.2"));
        File.SetLastWriteTimeUtc(Path.Combine(folder, "plate-map.csv"), DateTime.UtcNow.AddMinutes(1));
        pass = Settled(watch, clock);
        Assert.True(pass.Analysed);
        Assert.Equal((3, 1), watch.LastRunCounts);
        Assert.NotEqual(runs, File.ReadAllText(Path.Combine(outDir, "mapped", "runs.csv")));

        // unchanged inputs: no new analysis at all
        pass = watch.Pass();
        Assert.False(pass.Analysed);

        // a plan.csv dropped beside the [plate] table: the series is refused at the table, and waits for a fix
        File.WriteAllText(Path.Combine(folder, "plan.csv"), "run,file,channel,[S]0 (mmol/L)\nA1,plate.csv,A1,0.4\n");
        pass = Settled(watch, clock);
        Assert.True(pass.Analysed);
        Assert.Equal(LedgerRecord.SetupRejected, pass.Committed!.Setup);
        Assert.Contains(pass.Committed.Inputs, i => i.File == "series.toml" && i.Status == LedgerInput.Rejected && i.Message!.Contains("plan.csv in the series folder as well", StringComparison.Ordinal));
        ledger.Dispose();
        foreach (var d in new[] { inbox, outDir })
            try { Directory.Delete(d, recursive: true); } catch (IOException) { }
    }
}
