using System.Text;
using TraceKin.Cli.Watch;

namespace TraceKin.Tests.Watch;

// The ledger is our own journal format (docs/formats.md, "Watch ledger"); these are round-trip tests.
public class LedgerTests
{
    private static LedgerRecord Record(string series, string sha) => new()
    {
        Series = series,
        Setup = LedgerRecord.SetupOk,
        Inputs = [new LedgerInput("r001.csv", sha, LedgerInput.Analysed, true)],
        Pending = [],
        Outputs = [new LedgerOutput("summary.json", new string('0', 64))],
    };

    [Fact]
    public void Records_survive_a_reopen_and_the_sequence_goes_on_from_the_last_one()
    {
        var dir = SeriesFixture.TempFolder("ledger");
        using (var ledger = Ledger.Open(dir))
        {
            ledger.Append(Record("alpha", "aa"));
            ledger.Append(Record("beta", "bb"));
            ledger.Append(Record("alpha", "cc"));
        }
        using var again = Ledger.Open(dir);
        Assert.Equal("cc", again.Latest("alpha")!.Inputs[0].Sha256);
        Assert.Equal(3, again.Latest("alpha")!.Sequence);
        Assert.Equal(4, again.Append(Record("beta", "dd")).Sequence);
        Assert.Equal(0, again.IgnoredLines);
    }

    [Fact]
    public void A_torn_last_line_is_ignored_and_cut_off_so_the_next_record_reads_back_whole()
    {
        var dir = SeriesFixture.TempFolder("ledger");
        using (var ledger = Ledger.Open(dir)) ledger.Append(Record("alpha", "aa"));
        var path = Path.Combine(dir, Ledger.FileName);
        // A kill in the middle of an append leaves part of a line and no newline.
        File.AppendAllText(path, "{\"v\":1,\"seq\":2,\"series\":\"alpha\",\"setup\":\"o", new UTF8Encoding(false));

        using (var ledger = Ledger.Open(dir))
        {
            Assert.Equal(1, ledger.IgnoredLines);
            Assert.Equal("aa", ledger.Latest("alpha")!.Inputs[0].Sha256);
            ledger.Append(Record("alpha", "bb"));
        }
        var all = Ledger.ReadAll(path);
        Assert.Equal(["aa", "bb"], all.Select(r => r.Inputs[0].Sha256));
        Assert.Equal([1L, 2L], all.Select(r => r.Sequence));
        Assert.EndsWith("\n", File.ReadAllText(path), StringComparison.Ordinal);
    }

    [Fact]
    public void Each_record_is_one_line_of_json()
    {
        var dir = SeriesFixture.TempFolder("ledger");
        using (var ledger = Ledger.Open(dir))
        {
            ledger.Append(Record("alpha", "aa"));
            ledger.Append(Record("alpha", "bb"));
        }
        var lines = File.ReadAllLines(Path.Combine(dir, Ledger.FileName));
        Assert.Equal(2, lines.Length);
        foreach (var line in lines)
        {
            using var doc = System.Text.Json.JsonDocument.Parse(line);
            Assert.Equal("alpha", doc.RootElement.GetProperty("series").GetString());
            Assert.True(doc.RootElement.GetProperty("inputs")[0].GetProperty("new").GetBoolean());
        }
    }
}
