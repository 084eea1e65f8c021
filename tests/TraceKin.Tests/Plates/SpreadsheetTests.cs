using System.Globalization;
using TraceKin.Ingest;
using TraceKin.Traces;

namespace TraceKin.Tests.Plates;

/// <summary>An .xlsx export (written by hand in the test, read by ExcelDataReader) against its CSV twin. Invented numbers.</summary>
public class SpreadsheetTests
{
    private static (string Csv, List<object?[]> Rows) Twin()
    {
        var rows = new List<object?[]> { new object?[] { "time (s)", "A1", "A2", "B1" } };
        var csv = "time (s),A1,A2,B1\n";
        for (var i = 0; i < 20; i++)
        {
            var t = 1.5 * i;
            double[] v = [0.1 + 0.003 * i, 0.2 - 0.001 * i, 0.05 + 0.0071 * i];
            rows.Add([t, v[0], v[1], v[2]]);
            csv += string.Join(',', new[] { t }.Concat(v).Select(x => x.ToString("R", CultureInfo.InvariantCulture))) + "\n";
        }
        return (csv, rows);
    }

    [Fact]
    public void An_xlsx_export_reads_to_the_same_traces_as_its_csv_twin()
    {
        var (csv, rows) = Twin();
        var xlsx = MinimalXlsx.Write(("Notes", [new object?[] { "plate read by a test" }]), ("Readings", rows));

        var fromXlsx = ExportReader.FromBytes(xlsx, "plate.xlsx", IngestSettings.Default);
        var fromCsv = ExportReader.FromText(csv, "plate.csv", IngestSettings.Default);

        Assert.Equal(fromCsv.Channels.Select(c => c.Name), fromXlsx.Channels.Select(c => c.Name));
        for (var k = 0; k < fromCsv.Channels.Count; k++)
        {
            Assert.Equal(fromCsv.Channels[k].Times, fromXlsx.Channels[k].Times);
            Assert.Equal(fromCsv.Channels[k].Values, fromXlsx.Channels[k].Values);
        }
        Assert.Contains(fromXlsx.Detected, d => d.Key == "format" && d.Value.Contains("sheet \"Readings\"", StringComparison.Ordinal));
    }

    [Fact]
    public void The_sheet_is_chosen_in_ingest_and_a_workbook_without_numbers_is_located()
    {
        var (_, rows) = Twin();
        var xlsx = MinimalXlsx.Write(("First", rows), ("Second", rows.Select(r => r.Select(v => v is double d ? (object)(d * 2) : v).ToArray()).ToList()));
        var second = ExportReader.FromBytes(xlsx, "p.xlsx", IngestSettings.Default with { Sheet = "Second" });
        var byNumber = ExportReader.FromBytes(xlsx, "p.xlsx", IngestSettings.Default with { Sheet = "2" });
        Assert.Equal(0.4, second.Channels[1].Values[0], 12);
        Assert.Equal(second.Channels[1].Values, byNumber.Channels[1].Values);

        var empty = MinimalXlsx.Write(("Words", [new object?[] { "no", "numbers" }]));
        var ex = Assert.Throws<InputException>(() => ExportReader.FromBytes(empty, "w.xlsx", IngestSettings.Default));
        Assert.Equal(("w.xlsx", 1, 1), (ex.Problem.File, ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("no sheet with a number", ex.Problem.Found);
    }

    [Fact]
    public void A_bad_cell_is_located_at_its_sheet_row_and_column()
    {
        var (_, rows) = Twin();
        rows[5][2] = "n/a";   // sheet row 6, column C
        var ex = Assert.Throws<InputException>(() => ExportReader.FromBytes(MinimalXlsx.Write(("Readings", rows)), "p.xlsx", IngestSettings.Default));
        Assert.Equal((6, 3), (ex.Problem.Line, ex.Problem.Column));
        Assert.StartsWith("sheet \"Readings\", cell C6: ", ex.Problem.Found);
    }

    [Fact]
    public void A_plate_workbook_in_a_series_gives_each_well_the_rate_of_its_csv_twin()
    {
        var csv = PlateFolder.Wide([("A1", 0.0004, 0.01), ("A2", 0.0008, 0.01)]);
        var rows = csv.TrimEnd('\n').Split('\n').Select((l, i) => l.Split(',').Select(c => i == 0 ? (object?)c : double.Parse(c, CultureInfo.InvariantCulture)).ToArray()).ToList();
        const string plan = "run,file,channel,[S]0 (mmol/L)\nw1,{0},A1,0.4\nw2,{0},A2,0.8\n";
        using var a = new PlateFolder();
        a.Write("plate.csv", csv);
        a.Write("plan.csv", string.Format(CultureInfo.InvariantCulture, plan, "plate.csv"));
        using var b = new PlateFolder();
        File.WriteAllBytes(Path.Combine(b.Path, "plate.xlsx"), MinimalXlsx.Write(("Plate", rows)));
        b.Write("plan.csv", string.Format(CultureInfo.InvariantCulture, plan, "plate.xlsx"));

        var fromCsv = TraceKin.Analysis.SeriesRunner.Analyse(a.Path, new() { Workers = 1 });
        var fromXlsx = TraceKin.Analysis.SeriesRunner.Analyse(b.Path, new() { Workers = 1 });

        Assert.Empty(fromXlsx.Rejected);
        Assert.Equal(fromCsv.Runs.Select(r => r.Rates.Headline.Value), fromXlsx.Runs.Select(r => r.Rates.Headline.Value));
    }
}
