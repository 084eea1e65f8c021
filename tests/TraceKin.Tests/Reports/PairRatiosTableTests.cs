using System.Globalization;
using System.Text.Json;
using CsvHelper;
using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

/// <summary>
/// The orders from pairs of runs go to pair-ratios.csv, every listed pair; summary.json and report.html keep the total,
/// the table's name and the first 20 (invented demo series teal-lactonase-plate: 32 runs, 252 pairs). The table is read
/// back with CsvHelper's reader and compared with the analysis bit for bit.
/// </summary>
public sealed class PairRatiosTableTests : IDisposable
{
    private readonly RepoPaths.TempDir _out = new();
    private readonly TraceKin.Analysis.SeriesResult _result;

    public PairRatiosTableTests() => _result = AnalysedSample.Analyse(RepoPaths.Sample("teal-lactonase-plate"), _out.Path, plots: false);

    public void Dispose() => _out.Dispose();

    private List<string[]> Rows()
    {
        using var reader = CsvReader.FromFile(Path.Combine(_out.Path, PairRatiosCsv.FileName), new CsvReaderOptions { HasHeader = false });
        var rows = new List<string[]>();
        while (reader.Read()) rows.Add(Enumerable.Range(0, reader.FieldCount).Select(reader.GetString).ToArray());
        return rows;
    }

    private static double Number(string cell) => double.Parse(cell, NumberStyles.Float, CultureInfo.InvariantCulture);

    [Fact]
    public void Every_listed_pair_is_a_row_of_the_table_with_its_numbers_bit_for_bit()
    {
        var pairs = _result.Findings!.PairRatios;
        Assert.True(pairs.Count > SummaryJson.ListedPairRatios, $"{pairs.Count} pairs: the demo must list more than are shown");
        var rows = Rows();
        Assert.Equal(PairRatiosCsv.Header, rows[0]);
        Assert.Equal(pairs.Count, rows.Count - 1);
        for (var i = 0; i < pairs.Count; i++)
        {
            var (p, row) = (pairs[i], rows[i + 1]);
            Assert.Equal([p.RunA, p.RunB, p.Species], row[..3]);
            Assert.Equal([p.ConcentrationRatio, p.RateRatio, p.Order, p.StdError], row[3..].Select(Number).ToArray());
        }
    }

    [Fact]
    public void Summary_gives_the_count_the_table_and_the_first_twenty_pairs()
    {
        using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(_out.Path, SummaryJson.FileName)));
        var root = doc.RootElement;
        Assert.False(root.TryGetProperty("pairRatios", out _));
        Assert.Equal(_result.Findings!.PairCount, root.GetProperty("pairRatioCount").GetInt64());
        Assert.Equal(PairRatiosCsv.FileName, root.GetProperty("pairRatioTable").GetString());
        var first = root.GetProperty("pairRatiosFirst").EnumerateArray().ToList();
        Assert.Equal(SummaryJson.ListedPairRatios, first.Count);
        var rows = Rows();
        for (var i = 0; i < first.Count; i++)
        {
            Assert.Equal(rows[i + 1][0], first[i].GetProperty("runA").GetString());
            Assert.Equal(rows[i + 1][1], first[i].GetProperty("runB").GetString());
            Assert.Equal(Number(rows[i + 1][5]), first[i].GetProperty("order").GetDouble());
            Assert.Equal(Number(rows[i + 1][6]), first[i].GetProperty("stdError").GetDouble());
        }
        Assert.Empty(SchemaCheck.Check(root));
    }

    [Fact]
    public void Report_shows_the_first_twenty_pairs_and_links_the_table()
    {
        var html = File.ReadAllText(Path.Combine(_out.Path, ReportHtml.FileName));
        var start = html.IndexOf("<table class=\"results pairs\">", StringComparison.Ordinal);
        Assert.True(start >= 0);
        var table = html[start..html.IndexOf("</table>", start, StringComparison.Ordinal)];
        Assert.Equal(SummaryJson.ListedPairRatios, table.Split("<tr>").Length - 2); // the header row and the 20 pairs
        Assert.Contains($"<a href=\"{PairRatiosCsv.FileName}\">{PairRatiosCsv.FileName}</a>", html);
    }
}
