using System.Globalization;
using CsvHelper;

namespace TraceKin.Reports;

/// <summary>How TraceKin's CSV tables separate cells and write decimals.</summary>
public enum CsvStyle
{
    /// <summary>Comma between cells, decimal point (RFC 4180; what pandas, R and most programs read by default).</summary>
    Standard,
    /// <summary>Semicolon between cells, decimal comma: what spreadsheets set to a German, French, … locale open directly.</summary>
    DecimalComma,
}

/// <summary>
/// One CSV table being written with CsvHelper's writer: RFC 4180 quoting (a cell holding the delimiter, a quote or a
/// line break is quoted, quotes doubled), LF line ends, UTF-8 without a byte order mark, the same number of cells in
/// every row. Text cells that a spreadsheet would run as a formula (starting with = + - @, tab or CR) get an
/// apostrophe in front (OWASP, "CSV Injection"); numbers are written round-trip exact ("R"), never neutralised, in
/// the invariant culture — with a decimal comma instead of the point in <see cref="CsvStyle.DecimalComma"/>.
/// </summary>
internal sealed class CsvTable : IDisposable
{
    private static readonly NumberFormatInfo CommaDecimals = new() { NumberDecimalSeparator = ",", NegativeSign = "-", PositiveSign = "+" };
    private readonly CsvWriter _writer;
    private readonly NumberFormatInfo _numbers;

    public CsvTable(Stream stream, CsvStyle style = CsvStyle.Standard, bool leaveOpen = false)
    {
        _numbers = style == CsvStyle.DecimalComma ? CommaDecimals : NumberFormatInfo.InvariantInfo;
        _writer = CsvWriter.Create(stream, new CsvWriterOptions
        {
            Separator = Delimiter(style),
            NewLine = "\n",
            Quoting = CsvQuoting.WhenNeeded,
            // Neutralised here (Text), so that the cell is written exactly as before: apostrophe, quoted only when needed.
            Injection = CsvInjection.None,
            ValidateFieldCount = true,
            WriteByteOrderMark = false,
        }, leaveOpen);
    }

    public static char Delimiter(CsvStyle style) => style == CsvStyle.DecimalComma ? ';' : ',';

    /// <summary>The culture to read this style's numbers back with (tests, users' scripts).</summary>
    public static NumberFormatInfo NumberFormat(CsvStyle style) => style == CsvStyle.DecimalComma ? CommaDecimals : NumberFormatInfo.InvariantInfo;

    /// <summary>A header row: every name a text cell.</summary>
    public void Header(IEnumerable<string> names)
    {
        foreach (var n in names) Text(n);
        EndRow();
    }

    /// <summary>A text cell, neutralised against formula injection.</summary>
    public CsvTable Text(string? s)
    {
        _writer.WriteField(Neutralise(s ?? ""));
        return this;
    }

    /// <summary>A number, round-trip exact; empty when missing or not finite.</summary>
    public CsvTable Number(double? v)
    {
        _writer.WriteField(v is { } d && double.IsFinite(d) ? d.ToString("R", _numbers) : "");
        return this;
    }

    public CsvTable Integer(int v)
    {
        _writer.WriteField(v.ToString(CultureInfo.InvariantCulture));
        return this;
    }

    public CsvTable Bool(bool v)
    {
        _writer.WriteField(v ? "true" : "false");
        return this;
    }

    public void EndRow() => _writer.EndRecord();

    /// <summary>Hands what is buffered to the stream (rows written so far become visible in the temporary file).</summary>
    public void Flush() => _writer.Flush();

    public void Dispose() => _writer.Dispose();

    /// <summary>A text that a spreadsheet would run as a formula, prefixed with an apostrophe.</summary>
    public static string Neutralise(string s) =>
        s.Length > 0 && s[0] is '=' or '+' or '-' or '@' or '\t' or '\r' ? "'" + s : s;
}
