using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// Reads one instrument export (delimited text) into a <see cref="RunExport"/>: optional `key: value` preamble,
/// a header row with units, then numeric rows. Comma, semicolon or tab delimited; decimal point or decimal comma,
/// detected and never guessed silently. Bad content throws <see cref="InputException"/> with file, line and column.
/// </summary>
public static partial class ExportReader
{
    [GeneratedRegex(@"^(?<name>.*?)\s*(?:\((?<unit>[^\)]*)\)|\[(?<unit>[^\]]*)\])\s*$")]
    private static partial Regex HeaderWithUnit();

    [GeneratedRegex(@"^(?:A|Abs|absorbance)\s*@?\s*(?<wl>\d+(?:\.\d+)?)\s*(?:nm)?$", RegexOptions.IgnoreCase)]
    private static partial Regex AbsorbanceAtWavelength();

    public static RunExport FromFile(string path, IngestSettings settings)
    {
        var bytes = File.ReadAllBytes(path);
        return FromBytes(bytes, Path.GetFileName(path), settings);
    }

    public static RunExport FromBytes(byte[] bytes, string file, IngestSettings settings)
    {
        if (bytes.Length == 0) throw Fail.At(file, 1, 1, "an empty file", "a header line and data rows", "was the export saved completely?");
        string text;
        try
        {
            text = new UTF8Encoding(false, true).GetString(bytes);
        }
        catch (DecoderFallbackException)
        {
            text = Encoding.Latin1.GetString(bytes);
        }
        return FromText(text, file, settings);
    }

    public static RunExport FromText(string text, string file, IngestSettings settings)
    {
        text = text.TrimStart('\uFEFF');
        var nul = text.IndexOf('\0');
        if (nul >= 0)
        {
            var (l, c) = LineCol(text, nul);
            throw Fail.At(file, l, c, "a NUL byte", "text", "this looks like a binary file, not a text export");
        }
        var lines = text.Replace("\r\n", "\n").Replace('\r', '\n').Split('\n');
        var metadata = new Dictionary<string, string>(StringComparer.OrdinalIgnoreCase);
        var detected = new List<KeyValuePair<string, string>>();
        var i = 0;
        for (; i < lines.Length; i++)
        {
            var line = lines[i].Trim();
            if (line.Length == 0 || line.StartsWith('#')) continue;
            var colon = line.IndexOf(':');
            if (colon > 0 && !line.Contains(',') && !line.Contains(';') && !line.Contains('\t'))
            {
                metadata[line[..colon].Trim()] = line[(colon + 1)..].Trim();
                continue;
            }
            break;
        }
        if (i >= lines.Length) throw Fail.At(file, lines.Length, 1, "no header line", "a header such as \"time (s),A520\"");
        var headerLineNo = i + 1;
        var headerLine = lines[i];
        var delimiter = settings.Delimiter switch
        {
            "comma" => ',',
            "semicolon" => ';',
            "tab" => '\t',
            _ => headerLine.Contains('\t') ? '\t' : headerLine.Contains(';') ? ';' : ',',
        };
        detected.Add(new("delimiter", delimiter switch { '\t' => "tab", ';' => "semicolon", _ => "comma" }));
        var header = headerLine.Split(delimiter).Select(h => h.Trim()).ToArray();
        if (header.Length < 2) throw Fail.At(file, headerLineNo, 1, Fail.Quote(headerLine), "a time column and at least one signal column");

        var timeCol = 0;
        if (settings.TimeColumn is { } tc)
        {
            timeCol = Array.FindIndex(header, h => string.Equals(NameOf(h).Name, tc, StringComparison.OrdinalIgnoreCase) || string.Equals(h, tc, StringComparison.OrdinalIgnoreCase));
            if (timeCol < 0) throw Fail.At(file, headerLineNo, 1, Fail.Quote(headerLine), $"a column named {Fail.Quote(tc)} (ingest.time_column)");
        }
        var (timeName, timeUnitText) = NameOf(header[timeCol]);
        if (timeUnitText is null)
            throw Fail.At(file, headerLineNo, ColumnOf(headerLine, delimiter, timeCol), Fail.Quote(header[timeCol]), "a time column with its unit, e.g. \"time (s)\" or \"t [min]\"");
        var timeUnit = Units.Require(timeUnitText, Quantity.Time, file, headerLineNo, ColumnOf(headerLine, delimiter, timeCol));

        var columns = new List<(int Col, string Name, Quantity Q, UnitInfo Unit)>();
        for (var c = 0; c < header.Length; c++)
        {
            if (c == timeCol) continue;
            var (name, unitText) = NameOf(header[c]);
            var col = ColumnOf(headerLine, delimiter, c);
            if (header[c].Length == 0) throw Fail.At(file, headerLineNo, col, "an empty column header", "a column name such as \"A520\"");
            UnitInfo unit;
            if (AbsorbanceAtWavelength().IsMatch(name) || name.Equals("absorbance", StringComparison.OrdinalIgnoreCase) || name.Equals("A", StringComparison.Ordinal))
                unit = Units.Require(unitText ?? "AU", Quantity.Absorbance, file, headerLineNo, col);
            else if (unitText is not null && Units.Find(unitText) is { } u)
                unit = u;
            else
                throw Fail.At(file, headerLineNo, col, Fail.Quote(header[c]), "an absorbance column (\"A520\", \"absorbance\") or a column with a known unit");
            columns.Add((c, header[c], unit.Quantity, unit));
        }

        var decimalComma = settings.DecimalSeparator switch
        {
            "comma" => true,
            "point" => false,
            _ => delimiter != ',' && DetectDecimalComma(lines, i + 1, delimiter),
        };
        if (decimalComma && delimiter == ',')
            throw Fail.At(file, headerLineNo, 1, "decimal comma with a comma delimiter", "a semicolon or tab delimiter when numbers use decimal commas");
        detected.Add(new("decimal separator", decimalComma ? "comma" : "point"));
        var culture = decimalComma ? CultureInfo.GetCultureInfo("de-DE").NumberFormat : CultureInfo.InvariantCulture.NumberFormat;

        var times = new List<double>();
        var values = columns.Select(_ => new List<double>()).ToArray();
        for (var r = i + 1; r < lines.Length; r++)
        {
            var line = lines[r];
            if (line.Trim().Length == 0 || line.TrimStart().StartsWith('#')) continue;
            var cells = line.Split(delimiter);
            if (cells.Length != header.Length)
                throw Fail.At(file, r + 1, Math.Min(cells.Length, header.Length), $"{cells.Length} cells", $"{header.Length} cells, as in the header on line {headerLineNo}", "a row may be truncated");
            var t = Parse(cells, timeCol, culture, decimalComma, file, r + 1, line, delimiter);
            times.Add(timeUnit.ToInternal(t));
            for (var k = 0; k < columns.Count; k++)
                values[k].Add(columns[k].Unit.ToInternal(Parse(cells, columns[k].Col, culture, decimalComma, file, r + 1, line, delimiter)));
        }
        if (times.Count < 3) throw Fail.At(file, Math.Max(lines.Length, 1), 1, $"{times.Count} data rows", "at least 3 data rows");
        for (var k = 1; k < times.Count; k++)
            if (!(times[k] > times[k - 1]))
                throw Fail.At(file, 0, 1, $"time {times[k]} s not after {times[k - 1]} s (data row {k + 1})", "strictly increasing times");
        var t0 = times[0];
        var timeArr = times.Select(t => t - t0).ToArray();
        var channels = columns.Select((c, k) => new Trace(c.Name, c.Q, InternalUnit(c.Q), timeArr, values[k].ToArray(), c.Unit.Symbol)).ToArray();
        return new RunExport(file, channels, [], metadata, detected, []);
    }

    private static string InternalUnit(Quantity q) => q switch
    {
        Quantity.Absorbance => Units.Absorbance,
        Quantity.GasVolume => Units.Litre,
        Quantity.Pressure => Units.Pascal,
        Quantity.Conductivity => Units.SiemensPerMetre,
        Quantity.Temperature => Units.Kelvin,
        Quantity.Concentration => Units.MolPerLitre,
        _ => "",
    };

    private static double Parse(string[] cells, int c, NumberFormatInfo nf, bool decimalComma, string file, int line, string text, char delimiter)
    {
        var s = cells[c].AsSpan().Trim();
        // NumberStyles.Float has no AllowThousands: "0,02" under a point culture is rejected, not read as 2.
        if (double.TryParse(s, NumberStyles.Float, nf, out var v) && double.IsFinite(v)) return v;
        throw Fail.At(file, line, ColumnOf(text, delimiter, c), Fail.Quote(s), decimalComma ? "a number with a decimal comma" : "a number with a decimal point");
    }

    private static bool DetectDecimalComma(string[] lines, int from, char delimiter)
    {
        for (var r = from; r < lines.Length && r < from + 200; r++)
            foreach (var cell in lines[r].Split(delimiter))
            {
                var t = cell.Trim();
                if (t.Contains(',')) return true;
                if (t.Contains('.')) return false;
            }
        return false;
    }

    private static (string Name, string? Unit) NameOf(string header)
    {
        var m = HeaderWithUnit().Match(header.Trim());
        return m.Success ? (m.Groups["name"].Value.Trim(), m.Groups["unit"].Value.Trim()) : (header.Trim(), null);
    }

    /// <summary>1-based column number (character position) where cell <paramref name="index"/> starts.</summary>
    private static int ColumnOf(string line, char delimiter, int index)
    {
        var pos = 0;
        for (var k = 0; k < index; k++)
        {
            var next = line.IndexOf(delimiter, pos);
            if (next < 0) return line.Length + 1;
            pos = next + 1;
        }
        return pos + 1;
    }

    private static (int Line, int Col) LineCol(string text, int index)
    {
        int line = 1, col = 1;
        for (var k = 0; k < index; k++)
        {
            if (text[k] == '\n') { line++; col = 1; }
            else col++;
        }
        return (line, col);
    }
}
