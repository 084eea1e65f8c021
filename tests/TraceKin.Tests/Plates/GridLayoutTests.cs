using System.Globalization;
using System.Text;
using TraceKin.Ingest;
using TraceKin.Traces;

namespace TraceKin.Tests.Plates;

/// <summary>
/// The grid layout (one grid of wells per reading, its time above it) against its wide twin (a time column, one
/// column per well): the same numbers written both ways must read to the same traces. Invented round-trip data.
/// </summary>
public class GridLayoutTests
{
    private static double Value(int row, int col, int reading) => Math.Round(0.1 + 0.01 * row + 0.001 * col + 0.002 * reading * (col + 1), 5);

    /// <summary>A plate of <paramref name="rows"/> × <paramref name="cols"/> wells, one grid per reading every 15 s.</summary>
    internal static string Grid(int rows, int cols, int readings, char d = ',', bool comma = false, Func<int, int, int, string?>? cell = null)
    {
        var ci = comma ? CultureInfo.GetCultureInfo("de-DE") : CultureInfo.InvariantCulture;
        var sb = new StringBuilder("# plate export written by a test\nplate: P1\n\n");
        for (var s = 0; s < readings; s++)
        {
            sb.Append("time (s)").Append(d).Append((15.0 * s + 5).ToString(ci)).Append('\n');
            sb.Append(string.Concat(Enumerable.Range(1, cols).Select(c => $"{d}{c}"))).Append('\n');
            for (var r = 0; r < rows; r++)
            {
                sb.Append(WellName.RowLetters(r));
                for (var c = 0; c < cols; c++)
                {
                    var text = cell?.Invoke(s, r, c) ?? Value(r, c, s).ToString(ci);
                    if (text.Length > 0 || cell is null) sb.Append(d).Append(text);
                }
                sb.Append('\n');
            }
            sb.Append('\n');
        }
        return sb.ToString();
    }

    private static string WideTwin(int rows, int cols, int readings)
    {
        var sb = new StringBuilder("time (s)");
        for (var r = 0; r < rows; r++)
            for (var c = 0; c < cols; c++) sb.Append(',').Append(WellName.RowLetters(r)).Append((c + 1).ToString("00", CultureInfo.InvariantCulture));
        sb.Append('\n');
        for (var s = 0; s < readings; s++)
        {
            sb.Append((15.0 * s + 5).ToString(CultureInfo.InvariantCulture));
            for (var r = 0; r < rows; r++)
                for (var c = 0; c < cols; c++) sb.Append(',').Append(Value(r, c, s).ToString(CultureInfo.InvariantCulture));
            sb.Append('\n');
        }
        return sb.ToString();
    }

    [Fact]
    public void A_grid_export_is_sniffed_and_reads_to_the_same_traces_as_its_wide_twin()
    {
        var grid = ExportReader.FromText(Grid(3, 4, 6), "grid.csv", IngestSettings.Default);
        var wide = ExportReader.FromText(WideTwin(3, 4, 6), "wide.csv", IngestSettings.Default);

        Assert.Equal(12, grid.Channels.Count);
        Assert.Equal(wide.Channels.Select(c => c.Name), grid.Channels.Select(c => c.Name));
        for (var k = 0; k < 12; k++)
        {
            Assert.Equal(wide.Channels[k].Times, grid.Channels[k].Times);
            Assert.Equal(wide.Channels[k].Values, grid.Channels[k].Values);
            Assert.Equal(Quantity.Absorbance, grid.Channels[k].Quantity);
        }
        Assert.Contains(grid.Detected, d => d.Key == "layout" && d.Value.StartsWith("grid", StringComparison.Ordinal));
        Assert.Contains(grid.Detected, d => d.Key == "readings" && d.Value.StartsWith("6 grids of 3 × 4 wells", StringComparison.Ordinal));
        Assert.Equal("P1", grid.Metadata["plate"]);
        Assert.Contains(wide.Detected, d => d.Key == "layout" && d.Value.Contains("12 well columns", StringComparison.Ordinal));
    }

    [Fact]
    public void Semicolons_and_decimal_commas_read_the_same_numbers_under_de_DE_and_fr_FR()
    {
        foreach (var culture in new[] { "de-DE", "fr-FR" })
        {
            var before = CultureInfo.CurrentCulture;
            CultureInfo.CurrentCulture = CultureInfo.GetCultureInfo(culture);
            try
            {
                var a = ExportReader.FromText(Grid(2, 3, 4, ';', comma: true), "grid.csv", IngestSettings.Default);
                var b = ExportReader.FromText(Grid(2, 3, 4), "grid.csv", IngestSettings.Default);
                Assert.Equal(b.Channels.SelectMany(c => c.Values), a.Channels.SelectMany(c => c.Values));
                Assert.Contains(a.Detected, d => d.Key == "decimal separator" && d.Value == "comma");
            }
            finally { CultureInfo.CurrentCulture = before; }
        }
    }

    [Fact]
    public void A_missing_well_is_located_at_the_end_of_its_row()
    {
        // reading 3 (index 2), row B lacks its last well
        var text = Grid(2, 3, 4, cell: (s, r, c) => s == 2 && r == 1 && c == 2 ? "" : null);
        var ex = Assert.Throws<InputException>(() => ExportReader.FromText(text, "grid.csv", IngestSettings.Default));
        // lines: 3 preamble, then 5 lines per reading (time, header, A, B, blank): reading 3's row B is line 3 + 10 + 4
        Assert.Equal(17, ex.Problem.Line);
        Assert.Contains("2 wells in row B", ex.Problem.Found);
        Assert.Contains("well B3 is missing", ex.Problem.Hint);
    }

    [Fact]
    public void An_extra_well_and_an_extra_row_are_located()
    {
        var extra = Grid(2, 3, 4, cell: (s, r, c) => s == 1 && r == 0 && c == 2 ? "0.5,0.6" : null);
        var ex = Assert.Throws<InputException>(() => ExportReader.FromText(extra, "grid.csv", IngestSettings.Default));
        Assert.Equal((11, 19), (ex.Problem.Line, ex.Problem.Column));
        Assert.Contains("well A4 is extra", ex.Problem.Hint);   // "A,0.102,0.105,0.5,0.6": the fourth value starts at column 19

        var text = Grid(2, 3, 4);
        var lines = text.Split('\n').ToList();
        lines.Insert(17, "C,1,2,3");   // after reading 3's row B
        ex = Assert.Throws<InputException>(() => ExportReader.FromText(string.Join('\n', lines), "grid.csv", IngestSettings.Default));
        Assert.Equal(18, ex.Problem.Line);
        Assert.True(ex.Problem.Hint.Contains("an extra row", StringComparison.Ordinal), ex.Problem.Message);
    }

    [Fact]
    public void A_grid_without_its_time_line_is_located_and_the_layout_can_be_forced()
    {
        var text = Grid(2, 3, 4).Replace("time (s),20\n", "");
        var ex = Assert.Throws<InputException>(() => ExportReader.FromText(text, "grid.csv", IngestSettings.Default));
        Assert.Equal(9, ex.Problem.Line);
        Assert.Contains("a time line", ex.Problem.Expected);

        var forced = Assert.Throws<InputException>(() => ExportReader.FromText(WideTwin(2, 2, 4), "wide.csv", IngestSettings.Default with { Layout = "grid" }));
        Assert.Contains("no grid of wells", forced.Problem.Found);
    }
}
