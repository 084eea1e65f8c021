using System.Globalization;
using System.Text;
using ExcelDataReader;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// An .xlsx workbook (Office Open XML, ECMA-376), read with ExcelDataReader: the chosen sheet (ingest.sheet, a name or
/// a 1-based number; default the first sheet holding a number) is laid out as tab-delimited text, one line per sheet
/// row, and read by the same layouts as a text export (columns or grid). Numbers are written exactly ("R"), dates as
/// ISO 8601 date-times, text as written. A problem is located at the sheet's row and column number (the column letter
/// in the message), with the sheet named.
/// </summary>
internal static class SpreadsheetReader
{
    // ExcelDataReader asks for code page 1252 when it starts, even for .xlsx (UTF-8 XML); .NET has it only through the
    // code-pages provider. Registering it is process-wide but only adds encodings (nothing else changes), once.
    static SpreadsheetReader() => Encoding.RegisterProvider(CodePagesEncodingProvider.Instance);

    /// <summary>
    /// A ZIP container ("PK\x03\x04", the ECMA-376 package) holding a workbook part (xl/workbook.xml). Any other
    /// file, a damaged or foreign ZIP included, goes on to the text readers (which reject a binary file at its first NUL).
    /// </summary>
    public static bool Looks(ReadOnlyMemory<byte> bytes)
    {
        var b = bytes.Span;
        if (b.Length < 4 || b[0] != 0x50 || b[1] != 0x4B || b[2] != 3 || b[3] != 4) return false;
        try
        {
            using var zip = new System.IO.Compression.ZipArchive(new MemoryStream(bytes.ToArray(), writable: false), System.IO.Compression.ZipArchiveMode.Read);
            return zip.GetEntry("xl/workbook.xml") is not null;
        }
        catch (Exception ex) when (ex is InvalidDataException or IOException or NotSupportedException or ArgumentException) { return false; }
    }

    public static RunExport Read(ReadOnlyMemory<byte> bytes, string file, IngestSettings settings, bool fastRows)
    {
        List<(string Name, List<object?[]> Rows)> sheets;
        try { sheets = Sheets(bytes); }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            throw Fail.At(file, 1, 1, $"a workbook that cannot be read ({ex.GetType().Name}: {ex.Message})", "an .xlsx workbook", "was it saved completely, and is it .xlsx (not .xls or a password-protected file)?");
        }
        var chosen = Choose(sheets, settings.Sheet, file);
        var (name, rows) = sheets[chosen];
        // one text line per sheet row; each cell's start offset kept to map a column position back to a cell
        var text = new StringBuilder();
        var starts = new List<int[]>();
        foreach (var row in rows)
        {
            var last = row.Length - 1;
            while (last >= 0 && row[last] is null or "") last--;
            var offsets = new int[last + 1];
            var lineStart = text.Length;
            for (var c = 0; c <= last; c++)
            {
                if (c > 0) text.Append('\t');
                offsets[c] = text.Length - lineStart;
                text.Append(Cell(row[c]));
            }
            text.Append('\n');
            starts.Add(offsets);
        }
        var asText = settings with { Delimiter = "tab", DecimalSeparator = "point", Encoding = null };
        try
        {
            var run = ExportReader.ReadText(Encoding.UTF8.GetBytes(text.ToString()), "xlsx (ECMA-376 workbook, read by ExcelDataReader)", file, asText, fastRows);
            var detected = run.Detected.Where(d => d.Key is not ("delimiter" or "decimal separator" or "line endings" or "encoding")).ToList();
            detected.Insert(0, new("format", $"spreadsheet (.xlsx), sheet {Fail.Quote(name)}" + (settings.Sheet is null ? $" (the first of {sheets.Count} with a number)" : " (set by ingest.sheet)")));
            return run with { Detected = detected };
        }
        catch (InputException ex) when (ex.Problem.File == file)
        {
            var p = ex.Problem;
            var cell = p.Line >= 1 && p.Line <= starts.Count ? CellAt(starts[p.Line - 1], p.Column - 1) : 0;
            throw new InputException(p with { Column = cell + 1, Found = $"sheet {Fail.Quote(name)}, cell {ColumnLetters(cell)}{p.Line}: {p.Found}" });
        }
    }

    private static List<(string, List<object?[]>)> Sheets(ReadOnlyMemory<byte> bytes)
    {
        using var stream = new MemoryStream(bytes.ToArray(), writable: false);
        using var reader = ExcelReaderFactory.CreateOpenXmlReader(stream);
        var sheets = new List<(string, List<object?[]>)>();
        do
        {
            var rows = new List<object?[]>();
            while (reader.Read())
            {
                var values = new object?[reader.FieldCount];
                for (var c = 0; c < values.Length; c++) values[c] = reader.GetValue(c);
                rows.Add(values);
            }
            sheets.Add((reader.Name, rows));
        } while (reader.NextResult());
        return sheets;
    }

    private static int Choose(List<(string Name, List<object?[]> Rows)> sheets, string? wanted, string file)
    {
        var names = string.Join(", ", sheets.Select(s => Fail.Quote(s.Name)));
        if (wanted is not null)
        {
            for (var i = 0; i < sheets.Count; i++)
                if (string.Equals(sheets[i].Name, wanted, StringComparison.OrdinalIgnoreCase)) return i;
            if (int.TryParse(wanted, NumberStyles.None, CultureInfo.InvariantCulture, out var n) && n >= 1 && n <= sheets.Count) return n - 1;
            throw Fail.Setting(file, "ingest.sheet", Fail.Quote(wanted), $"a sheet of this workbook by name or number: {names}");
        }
        for (var i = 0; i < sheets.Count; i++)
            if (sheets[i].Rows.Any(r => r.Any(v => v is double or int or long or decimal))) return i;
        throw Fail.At(file, 1, 1, $"no sheet with a number (sheets: {names})", "a sheet holding the export's readings", "ingest.sheet names the sheet to read");
    }

    private static string Cell(object? v) => v switch
    {
        null => "",
        double d => d.ToString("R", CultureInfo.InvariantCulture),
        IFormattable f when v is int or long or decimal or float => f.ToString(null, CultureInfo.InvariantCulture),
        DateTime t => t.ToString("yyyy-MM-dd'T'HH:mm:ss.FFFFFFF", CultureInfo.InvariantCulture),
        TimeSpan s => s.ToString("c", CultureInfo.InvariantCulture),
        bool b => b ? "TRUE" : "FALSE",
        _ => (v.ToString() ?? "").Replace('\t', ' ').Replace('\n', ' ').Replace('\r', ' '),
    };

    /// <summary>0-based cell index of a 0-based character position in a line.</summary>
    private static int CellAt(int[] offsets, int position)
    {
        var cell = 0;
        for (var c = 0; c < offsets.Length; c++)
            if (offsets[c] <= position) cell = c;
        return cell;
    }

    /// <summary>Spreadsheet column letters of a 0-based column index: 0 → A, 25 → Z, 26 → AA.</summary>
    internal static string ColumnLetters(int index)
    {
        var s = "";
        for (var n = index + 1; n > 0; n = (n - 1) / 26) s = (char)('A' + (n - 1) % 26) + s;
        return s;
    }
}
