using Serilog;
using TraceKin.Cli.Watch;

namespace TraceKin.Tests.Watch;

// One series folder driven pass by pass with a fake clock: when files are taken, that unchanged content is never
// analysed twice, and that an edited export is. Exports are invented round-trip data from SampleWriter.
public class SeriesWatchTests
{
    private static readonly TimeSpan Settle = TimeSpan.FromSeconds(1);

    private sealed class Bench : IDisposable
    {
        public string Inbox { get; } = SeriesFixture.TempFolder("inbox");
        public string Out { get; } = SeriesFixture.TempFolder("out");
        public string Folder => Path.Combine(Inbox, "alpha");
        // Behind the real time, so files written during the test never look old enough to skip the settle interval.
        public FakeClock Clock { get; } = new(DateTimeOffset.UtcNow - TimeSpan.FromHours(1));
        public List<string> Status { get; } = [];
        public Ledger Ledger { get; }
        public SeriesWatch Watch { get; }

        public Bench()
        {
            Directory.CreateDirectory(Folder);
            Ledger = Ledger.Open(Out);
            var options = new WatchOptions { Inbox = Inbox, Out = Out, Settle = Settle, Workers = 1, Plots = false };
            Watch = new SeriesWatch(Folder, options, new FileStability(Clock, Settle), Ledger, Clock, new LoggerConfiguration().CreateLogger(), Status.Add);
        }

        public void Dispose() => Ledger.Dispose();
    }

    private static void WriteSeries(string folder, int runs, int seed)
    {
        var (config, plan) = SeriesFixture.Parse(runs);
        File.WriteAllText(Path.Combine(folder, "series.toml"), SeriesFixture.GoodToml);
        File.WriteAllText(Path.Combine(folder, "plan.csv"), SeriesFixture.PlanText(runs));
        for (var i = 1; i <= runs; i++)
            File.WriteAllText(Path.Combine(folder, SeriesFixture.FileOf(i)), SeriesFixture.ExportText(plan, config, i, seed));
    }

    [Fact]
    public void A_series_is_analysed_only_after_its_files_settle_and_never_again_for_the_same_content()
    {
        using var b = new Bench();
        WriteSeries(b.Folder, 6, seed: 1);

        var first = b.Watch.Pass();
        Assert.False(first.Analysed);
        Assert.Equal(b.Clock.GetUtcNow() + Settle, first.RecheckAt);

        b.Clock.Advance(Settle - TimeSpan.FromMilliseconds(1));
        Assert.False(b.Watch.Pass().Analysed);
        b.Clock.Advance(TimeSpan.FromMilliseconds(1));
        // plan.csv and series.toml have settled; the exports were first looked at only now, and the pass waits for them.
        Assert.False(b.Watch.Pass().Analysed);
        b.Clock.Advance(Settle);
        var analysed = b.Watch.Pass();
        Assert.True(analysed.Analysed);
        Assert.Equal(8, analysed.Committed!.Inputs.Count);
        Assert.All(analysed.Committed.Inputs, i => Assert.True(i.New));
        Assert.All(analysed.Committed.Inputs.Where(i => i.File.EndsWith(".csv", StringComparison.Ordinal) && i.File != "plan.csv"),
            i => Assert.Equal(LedgerInput.Analysed, i.Status));

        b.Clock.Advance(Settle);
        Assert.False(b.Watch.Pass().Analysed);
        Assert.Single(Ledger.ReadAll(b.Ledger.Path));
        Assert.Equal(6, b.Status.Count(s => s.Contains(": analysed", StringComparison.Ordinal)));
    }

    [Fact]
    public void An_edited_export_is_analysed_again_and_only_it_counts_as_new()
    {
        using var b = new Bench();
        WriteSeries(b.Folder, 6, seed: 1);
        for (var i = 0; i < 3; i++)
        {
            b.Watch.Pass();
            b.Clock.Advance(Settle);
        }
        Assert.Single(Ledger.ReadAll(b.Ledger.Path));

        var (config, plan) = SeriesFixture.Parse(6);
        var edited = SeriesFixture.ExportText(plan, config, 4, seed: 99);
        File.WriteAllText(Path.Combine(b.Folder, SeriesFixture.FileOf(4)), edited);
        b.Clock.Advance(TimeSpan.FromMilliseconds(10));
        Assert.False(b.Watch.Pass().Analysed); // seen changing, not yet settled
        b.Clock.Advance(Settle);
        var again = b.Watch.Pass();
        Assert.True(again.Analysed);
        var fresh = again.Committed!.Inputs.Where(i => i.New).ToList();
        Assert.Equal(SeriesFixture.FileOf(4), Assert.Single(fresh).File);
        Assert.Equal(SeriesFixture.Sha256Text(edited), fresh[0].Sha256);
    }

    [Fact]
    public void A_bad_export_is_rejected_once_and_retried_when_its_content_changes()
    {
        using var b = new Bench();
        WriteSeries(b.Folder, 6, seed: 1);
        File.WriteAllText(Path.Combine(b.Folder, SeriesFixture.FileOf(2)), SeriesFixture.BadExport);
        for (var i = 0; i < 4; i++)
        {
            b.Watch.Pass();
            b.Clock.Advance(Settle);
        }
        var records = Ledger.ReadAll(b.Ledger.Path);
        var bad = Assert.Single(records).Input(SeriesFixture.FileOf(2))!;
        Assert.Equal(LedgerInput.Rejected, bad.Status);
        Assert.Contains("r002.csv:3", bad.Message, StringComparison.Ordinal); // located: file and line number
        Assert.Single(b.Status, s => s.Contains("r002.csv: rejected", StringComparison.Ordinal));

        var (config, plan) = SeriesFixture.Parse(6);
        File.WriteAllText(Path.Combine(b.Folder, SeriesFixture.FileOf(2)), SeriesFixture.ExportText(plan, config, 2, seed: 1));
        b.Clock.Advance(TimeSpan.FromMilliseconds(10));
        b.Watch.Pass();
        b.Clock.Advance(Settle);
        Assert.True(b.Watch.Pass().Analysed);
        Assert.Equal(LedgerInput.Analysed, b.Ledger.Latest("alpha")!.Input(SeriesFixture.FileOf(2))!.Status);
    }

    [Fact]
    public void A_series_with_a_bad_series_toml_is_reported_once_and_waits_for_a_fix()
    {
        using var b = new Bench();
        WriteSeries(b.Folder, 6, seed: 1);
        File.WriteAllText(Path.Combine(b.Folder, "series.toml"), SeriesFixture.BadToml);
        for (var i = 0; i < 4; i++)
        {
            b.Watch.Pass();
            b.Clock.Advance(Settle);
        }
        var rec = Assert.Single(Ledger.ReadAll(b.Ledger.Path));
        Assert.Equal(LedgerRecord.SetupRejected, rec.Setup);
        Assert.Equal(["plan.csv", "series.toml"], rec.Inputs.Select(i => i.File).Order(StringComparer.Ordinal));
        Assert.Single(b.Status, s => s.Contains("series.toml: rejected", StringComparison.Ordinal));

        // An export changing does not wake a series whose setup is bad.
        File.AppendAllText(Path.Combine(b.Folder, SeriesFixture.FileOf(1)), "\n");
        b.Clock.Advance(Settle);
        b.Watch.Pass();
        b.Clock.Advance(Settle);
        Assert.False(b.Watch.Pass().Analysed);

        File.WriteAllText(Path.Combine(b.Folder, "series.toml"), SeriesFixture.GoodToml);
        b.Clock.Advance(TimeSpan.FromMilliseconds(10));
        for (var i = 0; i < 3; i++)
        {
            b.Watch.Pass();
            b.Clock.Advance(Settle);
        }
        var fixedRecord = b.Ledger.Latest("alpha")!;
        Assert.Equal(LedgerRecord.SetupOk, fixedRecord.Setup);
        Assert.Equal(6, fixedRecord.Inputs.Count(i => i.Status == LedgerInput.Analysed));
    }

    [Fact]
    public void A_planned_export_that_has_not_arrived_is_pending_not_rejected()
    {
        using var b = new Bench();
        WriteSeries(b.Folder, 6, seed: 1);
        File.Delete(Path.Combine(b.Folder, SeriesFixture.FileOf(6)));
        for (var i = 0; i < 3; i++)
        {
            b.Watch.Pass();
            b.Clock.Advance(Settle);
        }
        var rec = b.Ledger.Latest("alpha")!;
        Assert.Equal([SeriesFixture.FileOf(6)], rec.Pending);
        Assert.DoesNotContain(rec.Inputs, i => i.Status == LedgerInput.Rejected);
        using var summary = System.Text.Json.JsonDocument.Parse(File.ReadAllText(Path.Combine(b.Out, "alpha", "summary.json")));
        Assert.Equal(0, summary.RootElement.GetProperty("rejected").GetArrayLength());
        Assert.Contains(summary.RootElement.GetProperty("warnings").EnumerateArray(), w => w.ToString().Contains("export-pending", StringComparison.Ordinal));
    }

    [Fact]
    public void An_export_cut_in_the_middle_of_a_row_is_not_taken_until_it_has_been_unchanged_for_the_longer_interval()
    {
        using var b = new Bench();
        WriteSeries(b.Folder, 2, seed: 1);
        var half = Path.Combine(b.Folder, SeriesFixture.FileOf(2));
        var text = File.ReadAllText(half).TrimEnd();
        File.WriteAllText(half, text[..^3]); // the instrument paused inside its last row: no line end yet

        b.Watch.Pass();                       // t0: plan.csv and series.toml first seen
        b.Clock.Advance(Settle);
        Assert.False(b.Watch.Pass().Analysed); // t0 + 1 settle: setup taken, exports first seen
        // From t0 + 2 settle intervals on, the whole export has settled; the cut one has been unchanged for longer than
        // the settle interval (the plain rule would take it now), but not yet for the longer one, so the series waits.
        Assert.True(FileStability.UnterminatedFactor >= 2);
        for (var k = 2; k <= FileStability.UnterminatedFactor; k++)
        {
            b.Clock.Advance(Settle);
            var waiting = b.Watch.Pass();
            Assert.False(waiting.Analysed, $"analysed at t0 + {k} settle intervals");
            Assert.True(waiting.Waiting);
        }
        b.Clock.Advance(Settle);               // unchanged for UnterminatedFactor settle intervals: taken
        var taken = b.Watch.Pass();
        Assert.True(taken.Analysed);
        Assert.Contains(taken.Committed!.Inputs, i => i.File == SeriesFixture.FileOf(2));
        Assert.Empty(taken.Committed.Pending);
    }

    [Fact]
    public void Cleaning_the_snapshot_never_deletes_through_a_link_planted_in_it()
    {
        using var b = new Bench();
        WriteSeries(b.Folder, 2, seed: 1);
        var elsewhere = SeriesFixture.TempFolder("elsewhere");
        try
        {
            File.WriteAllText(Path.Combine(elsewhere, "precious.csv"), "keep");
            Directory.CreateDirectory(Path.Combine(b.Out, SeriesWatch.WorkFolder, "alpha"));
            Directory.CreateSymbolicLink(Path.Combine(b.Out, SeriesWatch.WorkFolder, "alpha", "linked"), elsewhere);
            for (var i = 0; i < 3; i++)
            {
                b.Watch.Pass();
                b.Clock.Advance(Settle);
            }
            Assert.Equal("keep", File.ReadAllText(Path.Combine(elsewhere, "precious.csv")));
            Assert.NotNull(b.Ledger.Latest("alpha"));
        }
        finally { Directory.Delete(elsewhere, recursive: true); }
    }

    [Fact]
    public void A_snapshot_folder_that_is_a_link_fails_the_pass_and_nothing_is_written_or_deleted_through_it()
    {
        using var b = new Bench();
        WriteSeries(b.Folder, 2, seed: 1);
        var elsewhere = SeriesFixture.TempFolder("elsewhere");
        try
        {
            File.WriteAllText(Path.Combine(elsewhere, "precious.csv"), "keep");
            Directory.CreateDirectory(Path.Combine(b.Out, SeriesWatch.WorkFolder));
            Directory.CreateSymbolicLink(Path.Combine(b.Out, SeriesWatch.WorkFolder, "alpha"), elsewhere);
            Assert.Throws<TraceKin.Reports.OutputPathException>(() =>
            {
                for (var i = 0; i < 3; i++)
                {
                    b.Watch.Pass();
                    b.Clock.Advance(Settle);
                }
            });
            Assert.Equal(["precious.csv"], Directory.EnumerateFileSystemEntries(elsewhere).Select(Path.GetFileName));
            Assert.Equal("keep", File.ReadAllText(Path.Combine(elsewhere, "precious.csv")));
            Assert.Null(b.Ledger.Latest("alpha"));
        }
        finally { Directory.Delete(elsewhere, recursive: true); }
    }
}
