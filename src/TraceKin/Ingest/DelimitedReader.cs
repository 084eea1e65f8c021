using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// Reads a delimited text export (UTF-8 bytes) into a <see cref="RunExport"/>. Layout first (<see cref="DelimitedLayout"/>),
/// then one pass over the rows that splits each line into cell ranges and parses numbers straight from the bytes:
/// no string per cell, and the value arrays are sized once from the number of line breaks.
/// </summary>
internal static class DelimitedReader
{
    private static readonly string[] TimeZeroKeys = ["mixed at", "mixing time", "time of mixing", "t0", "t_0", "t 0", "time zero", "zero time", "start time", "started at"];

    public static RunExport Read(ReadOnlyMemory<byte> text, string file, string encoding, IngestSettings settings, bool fastRows = true)
    {
        var detected = new List<KeyValuePair<string, string>>
        {
            new("format", "delimited text"),
            new("encoding", encoding),
            new("line endings", TextLines.LineEndings(text.Span)),
        };
        var warnings = new List<Warning>();
        var metadata = new Dictionary<string, string>(StringComparer.OrdinalIgnoreCase);
        var metadataLines = new Dictionary<string, int>(StringComparer.OrdinalIgnoreCase);
        var lines = new TextLines(text, file);
        var layout = DelimitedLayout.Find(lines, file, settings, metadata, metadataLines);
        detected.Add(new("preamble", layout.PreambleLines == 0 ? "none" : $"{layout.PreambleLines} line{(layout.PreambleLines == 1 ? "" : "s")} ({metadata.Count} metadata)"));
        detected.Add(new("header", $"line {layout.HeaderLine}" + (settings.HeaderLine is null ? "" : " (set by ingest.header_line)")));
        detected.Add(new("delimiter", CellSplitter.DelimiterName(layout.Delimiter) + (settings.Delimiter is null ? "" : " (set by ingest.delimiter)")));
        var decimalAt = detected.Count;

        // Columns: the time column, then the role of every other column.
        var header = layout.Header;
        var timeIndex = TimeColumnIndex(header, layout, settings, file);
        var columns = new List<ColumnSpec>();
        for (var c = 0; c < header.Length; c++)
        {
            if (c == timeIndex) continue;
            columns.Add(ColumnHeader.Classify(c, header[c], settings, file, layout.HeaderLine, layout.HeaderColumns[c]));
        }
        var kept = columns.Where(c => c.Role != ColumnRole.Ignored).ToArray();
        // Two columns for one channel ("A1" and "A01" are one well) would make a plan's channel ambiguous.
        var names = new Dictionary<string, ColumnSpec>(StringComparer.OrdinalIgnoreCase);
        foreach (var c in kept)
        {
            if (names.TryGetValue(c.Name, out var first))
                throw Fail.At(file, layout.HeaderLine, layout.HeaderColumns[c.Index], $"{Fail.Quote(c.Header)}, the same channel as {Fail.Quote(first.Header)} (column {layout.HeaderColumns[first.Index]})",
                    "one column per channel or well", "remove or rename the repeated column");
            names[c.Name] = c;
        }
        var wells = kept.Count(c => WellName.Normalise(ColumnHeader.Split(c.Header).Name) is not null);
        if (wells > 0)
            detected.Add(new("layout", $"columns: a time column and {wells} well column{(wells == 1 ? "" : "s")} (a well without a unit is read in {settings.WellUnit}, ingest.well_unit)"));
        if (!kept.Any(c => c.Role is ColumnRole.Signal or ColumnRole.Reference))
            throw Fail.At(file, layout.HeaderLine, 1, $"no signal column among {string.Join(", ", header.Select(h => Fail.Quote(h)))}",
                "at least one absorbance, gas volume, pressure or conductivity column", "write the quantity and its unit in the header, e.g. \"A520\" or \"V (mL)\"");

        // Rows.
        var rows = new RowReader(text, file, layout, timeIndex, kept, settings, metadata, metadataLines, fastRows);
        rows.ReadAll(lines);
        var timeCells = rows.Time;

        detected.Insert(decimalAt, new("decimal separator", settings.DecimalSeparator is not null ? $"{settings.DecimalSeparator} (set by ingest.decimal)"
            : rows.DecimalLine > 0 ? (rows.Decimal == (byte)',' ? "comma" : "point") : "point (no decimal fractions seen)"));
        detected.Add(new("time column", $"{Fail.Quote(header[timeIndex])} ({timeCells.Describe()})"));
        foreach (var c in columns)
            detected.Add(new($"column {Fail.Quote(c.Header)}", c.Describe()));
        if (rows.FooterLines > 0) detected.Add(new("footer", $"{rows.FooterLines} line{(rows.FooterLines == 1 ? "" : "s")} from line {rows.FooterStart}"));

        var n = rows.Count;
        if (n < 3)
            throw Fail.At(file, rows.LastLine, 1, $"{n} data row{(n == 1 ? "" : "s")}", "at least 3 data rows for a time course", "the export may be cut off");
        warnings.AddRange(rows.Warnings);

        // Time zero: the moment of mixing from the preamble when stated, else the first sample.
        var times = rows.Times;
        var (zero, zeroText) = TimeZero(timeCells, times[0], rows.FirstLine, settings, metadata, metadataLines, file);
        detected.Add(new("time zero", zeroText));
        for (var k = 0; k < n; k++) times[k] -= zero;
        if (times[n - 1] - times[0] <= 0)
            throw Fail.At(file, rows.LastLine, layout.HeaderColumns[timeIndex], "a time span of zero", "times that advance", "is the time column the right one?");
        detected.Add(new("rows", $"{n} (lines {rows.FirstLine}–{rows.LastLine})"));

        // Values to internal units, saturation plateaus out, constant signals flagged.
        var channels = new List<Trace>();
        var auxiliary = new List<Trace>();
        var constant = new List<ColumnSpec>();
        for (var k = 0; k < kept.Length; k++)
        {
            var spec = kept[k];
            var values = rows.Values[k];
            var unit = spec.Unit!;
            if (unit.Factor != 1 || unit.Offset != 0)
                for (var r = 0; r < n; r++) values[r] = unit.ToInternal(values[r]);
            var trace = new Trace(spec.Name, spec.Quantity, InternalUnit(spec.Quantity, unit), times, values, unit.Symbol);
            if (spec.Role == ColumnRole.Auxiliary)
            {
                auxiliary.Add(trace);
                continue;
            }
            if (spec.Role == ColumnRole.Reference) detected.Add(new("reference channel", spec.Name));
            // a constant column is judged on what the instrument wrote, before saturated points are taken out
            if (spec.Role == ColumnRole.Signal && IsConstant(trace.Values)) constant.Add(spec);
            else if (spec.Quantity == Quantity.Absorbance && spec.Role == ColumnRole.Signal)
            {
                trace = SaturationCheck.Apply(trace, r => rows.RowLines[r], settings, file, warnings);
                // located here, at the channel's header, rather than as a sample count later with no line to name
                if (trace.Count < 3)
                    throw Fail.At(file, layout.HeaderLine, layout.HeaderColumns[spec.Index],
                        $"channel {Fail.Quote(spec.Header)} with {n - trace.Count} of its {n} readings stuck at the detector's ceiling, leaving {trace.Count}",
                        "at least 3 readings below saturation", "dilute the sample or use a shorter path length; ingest.saturation_absorbance sets the threshold");
            }
            channels.Add(trace);
        }
        var signals = kept.Count(c => c.Role == ColumnRole.Signal);
        if (constant.Count > 0 && constant.Count == signals)
        {
            var c = constant[0];
            var flat = channels.First(t => t.Name == c.Name);
            throw Fail.At(file, rows.FirstLine, layout.HeaderColumns[c.Index], $"a constant signal in {Fail.Quote(c.Header)} (every value {flat.Values[0].ToString("G6", CultureInfo.InvariantCulture)} {flat.Unit})",
                "a signal that changes with time", "is this the right column, and was the instrument recording?");
        }
        foreach (var c in constant)
            warnings.Add(new Warning("constant-signal", file, $"channel {Fail.Quote(c.Header)} does not change (lines {rows.FirstLine}–{rows.LastLine})") { Channel = c.Header });

        return new RunExport(file, channels, auxiliary, metadata, detected, warnings) { DataLines = (rows.FirstLine, rows.LastLine) };
    }

    private static int TimeColumnIndex(string[] header, DelimitedLayout layout, IngestSettings settings, string file)
    {
        if (settings.TimeColumn is { } named)
        {
            for (var c = 0; c < header.Length; c++)
                if (string.Equals(header[c], named.Trim(), StringComparison.OrdinalIgnoreCase) ||
                    string.Equals(ColumnHeader.Split(header[c]).Name, named.Trim(), StringComparison.OrdinalIgnoreCase))
                    return c;
            throw Fail.At(file, layout.HeaderLine, 1, $"no column named {Fail.Quote(named)} among {string.Join(", ", header.Select(h => Fail.Quote(h)))}",
                "the column ingest.time_column names", "check the spelling against the header");
        }
        for (var c = 0; c < header.Length; c++)
            if (ColumnHeader.IsTimeName(header[c])) return c;
        return 0;
    }

    private static (double Zero, string Text) TimeZero(TimeCells time, double first, int firstLine, IngestSettings settings,
        Dictionary<string, string> metadata, Dictionary<string, int> metadataLines, string file)
    {
        if (settings.TimeZero != "first-sample")
        {
            string[] keys = settings.TimeZeroKey is { } custom ? [custom] : TimeZeroKeys;
            foreach (var key in keys)
            {
                if (!metadata.TryGetValue(key, out var value)) continue;
                var line = metadataLines[key];
                var moment = time.ReadMoment(value)
                    ?? throw Fail.At(file, line, 1, $"{Fail.Quote(key)} = {Fail.Quote(value)}",
                        time.Form == TimeForm.DateTime ? "an ISO 8601 date-time such as 2026-03-01T14:05:00+01:00" : $"a time in the time column's terms (a number in {time.Unit?.Symbol ?? "its unit"}, or a clock reading)",
                        "or set ingest.time_zero = \"first-sample\"");
                return (moment, $"{Fail.Quote(key)} on line {line} ({value.Trim()})");
            }
            if (settings.TimeZero == "metadata")
                throw Fail.Setting(file, "ingest.time_zero", "no preamble line stating the moment of mixing",
                    $"one of the preamble keys {string.Join(", ", keys.Select(k => Fail.Quote(k)))}", "add the key, or set ingest.time_zero = \"first-sample\"");
        }
        return (first, $"first sample (line {firstLine})");
    }

    private static bool IsConstant(double[] values)
    {
        for (var k = 1; k < values.Length; k++)
            if (values[k] != values[0]) return false;
        return values.Length > 0;
    }

    internal static string InternalUnit(Quantity q, UnitInfo unit) => q switch
    {
        Quantity.Absorbance => Units.Absorbance,
        Quantity.GasVolume => Units.Litre,
        Quantity.Pressure => Units.Pascal,
        Quantity.Conductivity => Units.SiemensPerMetre,
        Quantity.Temperature => Units.Kelvin,
        Quantity.Concentration => Units.MolPerLitre,
        _ => unit.Symbol,
    };
}
