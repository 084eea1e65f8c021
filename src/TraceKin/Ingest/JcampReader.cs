using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// Reads a JCAMP-DX time course (one block): labelled data records "##LABEL=value" (McDonald &amp; Wilks 1988,
/// Appl. Spectrosc. 42, 151), with the data in ##XYDATA=(X++(Y..Y)) — AFFN or compressed ASDF — or ##XYPOINTS=(XY..XY).
/// X is time (##XUNITS), Y is the signal (##YUNITS); both are scaled by ##XFACTOR/##YFACTOR, and ##FIRSTX, ##LASTX,
/// ##NPOINTS and ##FIRSTY are checked against the data.
/// </summary>
internal static class JcampReader
{
    /// <summary>True when the first non-blank text is a labelled data record ("##TITLE=…").</summary>
    public static bool Looks(ReadOnlySpan<byte> text)
    {
        var i = 0;
        while (i < text.Length && text[i] is (byte)' ' or (byte)'\t' or (byte)'\r' or (byte)'\n') i++;
        return i + 1 < text.Length && text[i] == (byte)'#' && text[i + 1] == (byte)'#';
    }

    /// <summary>
    /// Label normalisation of the specification: upper case, with blanks, dashes, slashes and underscores removed,
    /// so "##Data Type=" and "##DATATYPE=" name the same record.
    /// </summary>
    public static string Normalise(string label)
    {
        var sb = new System.Text.StringBuilder(label.Length);
        foreach (var c in label)
            if (c is not (' ' or '-' or '/' or '_' or '\t')) sb.Append(char.ToUpperInvariant(c));
        return sb.ToString();
    }

    private sealed record Record(string Label, string Key, string Value, int Line);

    public static RunExport Read(ReadOnlyMemory<byte> utf8, string file, string encoding, IngestSettings settings)
    {
        var lines = new TextLines(utf8, file);
        var span = utf8.Span;
        var records = new List<Record>();
        var dataLines = new List<(int Line, string Text)>();
        string? dataKind = null;
        var tableKind = "";
        var dataLine = 0;
        var ended = false;
        var first = true;
        while (lines.Next(out var start, out var length))
        {
            var text = System.Text.Encoding.UTF8.GetString(span.Slice(start, length));
            var comment = text.IndexOf("$$", StringComparison.Ordinal);
            var body = (comment >= 0 ? text[..comment] : text).TrimEnd();
            if (body.TrimStart().StartsWith("##", StringComparison.Ordinal))
            {
                var trimmed = body.TrimStart();
                var eq = trimmed.IndexOf('=');
                if (eq < 0)
                    throw Fail.At(file, lines.LineNumber, 1, Fail.Quote(trimmed), "a labelled data record \"##LABEL=value\"", "McDonald & Wilks (1988), labelled data records");
                var label = trimmed[2..eq].Trim();
                var key = Normalise(label);
                var value = trimmed[(eq + 1)..].Trim();
                if (first && key != "TITLE")
                    throw Fail.At(file, lines.LineNumber, 1, $"##{label}= as the first record", "##TITLE= first (McDonald & Wilks 1988: TITLE begins every block)");
                first = false;
                if (ended)
                    throw Fail.At(file, lines.LineNumber, 1, $"##{label}= after ##END=", "one block per file", "split linked or multi-block files into one file per run");
                if (key == "END")
                {
                    ended = true;
                    dataKind = null;
                    continue;
                }
                if (key is "BLOCKS" or "NTUPLES")
                    throw Fail.At(file, lines.LineNumber, 1, $"##{label}=", "a single-block ##XYDATA or ##XYPOINTS time course", "export each run as its own simple JCAMP-DX file");
                if (key is "XYDATA" or "XYPOINTS" or "PEAKTABLE")
                {
                    if (key == "PEAKTABLE")
                        throw Fail.At(file, lines.LineNumber, 1, "##PEAK TABLE=", "##XYDATA or ##XYPOINTS (a time course, not a peak list)");
                    if (dataKind is not null || dataLine > 0)
                        throw Fail.At(file, lines.LineNumber, 1, $"a second data table ##{label}=", "one data table per block");
                    var form = Normalise(value);
                    if (key == "XYDATA" && form != "(X++(Y..Y))")
                        throw Fail.At(file, lines.LineNumber, eq + 4, Fail.Quote(value), "(X++(Y..Y)) (McDonald & Wilks 1988, ##XYDATA table forms)");
                    if (key == "XYPOINTS" && form != "(XY..XY)")
                        throw Fail.At(file, lines.LineNumber, eq + 4, Fail.Quote(value), "(XY..XY) (McDonald & Wilks 1988, ##XYPOINTS)");
                    dataKind = tableKind = key;
                    dataLine = lines.LineNumber;
                    continue;
                }
                dataKind = null;
                records.Add(new Record(label, key, value, lines.LineNumber));
                continue;
            }
            if (body.Trim().Length == 0) continue;
            if (dataKind is not null)
            {
                dataLines.Add((lines.LineNumber, body));
                continue;
            }
            if (ended)
                throw Fail.At(file, lines.LineNumber, 1, Fail.Quote(body.Trim()), "nothing after ##END=", "one block per file");
            if (first)
                throw Fail.At(file, lines.LineNumber, 1, Fail.Quote(body.Trim()), "##TITLE= first");
            // a record's value continues on the next line
            if (records.Count > 0)
                records[^1] = records[^1] with { Value = (records[^1].Value + "\n" + body.Trim()).Trim() };
        }

        var byKey = new Dictionary<string, Record>();
        foreach (var r in records) byKey[r.Key] = r;
        var lastLine = lines.LineNumber;
        if (dataLine == 0)
            throw Fail.At(file, lastLine, 1, "no ##XYDATA= or ##XYPOINTS= table", "a data table (McDonald & Wilks 1988: required records)", "is this a JCAMP-DX time course?");
        if (!ended)
            throw Fail.At(file, lastLine, 1, "the end of the file without ##END=", "##END= closing the block (McDonald & Wilks 1988)", "the file may be truncated");
        foreach (var required in new[] { "JCAMPDX", "XUNITS", "YUNITS" })
            if (!byKey.ContainsKey(required))
                throw Fail.At(file, dataLine, 1, $"no ##{required switch { "JCAMPDX" => "JCAMP-DX", _ => required }}= record", "it before the data table (McDonald & Wilks 1988: required records)");

        var xUnit = TimeUnit(byKey["XUNITS"], file);
        var (yQuantity, yUnit) = SignalUnit(byKey["YUNITS"], file);
        var xFactor = Number(byKey, "XFACTOR", file) ?? 1;
        var yFactor = Number(byKey, "YFACTOR", file) ?? 1;
        var firstX = Number(byKey, "FIRSTX", file);
        var lastX = Number(byKey, "LASTX", file);
        var nPoints = Number(byKey, "NPOINTS", file);
        var firstY = Number(byKey, "FIRSTY", file);

        var xs = new List<double>();
        var ys = new List<double>();
        var pointLines = new List<int>();
        AsdfForms forms;
        if (tableKind == "XYDATA")
            forms = ReadXyData(dataLines, file, dataLine, xFactor, yFactor, firstX, lastX, nPoints, byKey, xs, ys, pointLines);
        else
            forms = ReadXyPoints(dataLines, file, dataLine, xFactor, yFactor, xs, ys, pointLines);

        var n = ys.Count;
        if (nPoints is { } np && np != n)
            throw Fail.At(file, byKey["NPOINTS"].Line, 1, $"##NPOINTS={np} but {n} points in the table", "the declared number of points (McDonald & Wilks 1988, NPOINTS check)",
                "the file may be truncated or edited");
        if (n < 3)
            throw Fail.At(file, dataLine, 1, $"{n} point{(n == 1 ? "" : "s")}", "at least 3 points for a time course");
        // abscissas are written in units of XFACTOR, so half of XFACTOR is the rounding allowed
        var xTolerance = 0.5 * Math.Abs(xFactor) + 1e-6 * Math.Abs(xs[^1] - xs[0]);
        if (firstX is { } fx && !Close(xs[0], fx, xTolerance))
            throw Fail.At(file, byKey["FIRSTX"].Line, 1, $"##FIRSTX={Fmt(fx)} but the first X is {Fmt(xs[0])}", "FIRSTX equal to the first abscissa (McDonald & Wilks 1988, FIRSTX check)");
        if (lastX is { } lx && !Close(xs[^1], lx, xTolerance))
            throw Fail.At(file, byKey["LASTX"].Line, 1, $"##LASTX={Fmt(lx)} but the last X is {Fmt(xs[^1])}", "LASTX equal to the last abscissa (McDonald & Wilks 1988, LASTX check)");
        if (firstY is { } fy && !Close(ys[0], fy, Math.Abs(yFactor)))
            throw Fail.At(file, byKey["FIRSTY"].Line, 1, $"##FIRSTY={Fmt(fy)} but the first Y is {Fmt(ys[0])}", "FIRSTY equal to the first ordinate × YFACTOR (McDonald & Wilks 1988, FIRSTY check)");

        var times = new double[n];
        var values = new double[n];
        for (var k = 0; k < n; k++)
        {
            times[k] = xUnit.ToInternal(xs[k]);
            values[k] = yUnit.ToInternal(ys[k]);
            if (k > 0 && !(times[k] > times[k - 1]))
                throw Fail.At(file, pointLines[k], 1, $"time {Fmt(xs[k])} after {Fmt(xs[k - 1])}", "times that increase", "a JCAMP-DX time course must run forwards in X");
        }
        var zero = times[0];
        for (var k = 0; k < n; k++) times[k] -= zero;

        var metadata = new Dictionary<string, string>(StringComparer.OrdinalIgnoreCase);
        foreach (var r in records) metadata[r.Label] = r.Value;
        var detected = new List<KeyValuePair<string, string>>
        {
            new("format", $"JCAMP-DX {(byKey.TryGetValue("JCAMPDX", out var version) ? version.Value : "")}".Trim()),
            new("encoding", encoding),
            new("line endings", TextLines.LineEndings(span)),
            new("data table", tableKind == "XYPOINTS" ? "##XYPOINTS=(XY..XY)" : "##XYDATA=(X++(Y..Y))"),
            new("number forms", JcampAsdf.Describe(forms)),
            new("x", $"time in {xUnit.Symbol} (##XUNITS={byKey["XUNITS"].Value}), XFACTOR {Fmt(xFactor)}"),
            new("y", $"{Units.Describe(yQuantity)} in {(yUnit.Symbol.Length == 0 ? "AU" : yUnit.Symbol)} (##YUNITS={byKey["YUNITS"].Value}), YFACTOR {Fmt(yFactor)}"),
            new("time zero", $"first sample (X = {Fmt(xs[0])})"),
            new("rows", $"{n} points (lines {pointLines[0]}–{pointLines[^1]})"),
        };
        var name = byKey.TryGetValue("TITLE", out var title) && title.Value.Length > 0 ? title.Value : "Y";
        var trace = new Trace(name, yQuantity, InternalUnit(yQuantity), times, values, yUnit.Symbol);
        var warnings = new List<Warning>();
        if (yQuantity == Quantity.Absorbance) trace = SaturationCheck.Apply(trace, k => pointLines[k], settings, file, warnings);
        if (values.All(v => v == values[0]))
            throw Fail.At(file, dataLine + 1, 1, $"a constant signal (every value {Fmt(ys[0])})", "a signal that changes with time", "was the instrument recording?");
        return new RunExport(file, [trace], [], metadata, detected, warnings) { DataLines = (pointLines[0], pointLines[^1]) };
    }

    private static AsdfForms ReadXyData(List<(int Line, string Text)> dataLines, string file, int dataLine, double xFactor, double yFactor,
        double? firstX, double? lastX, double? nPoints, Dictionary<string, Record> byKey, List<double> xs, List<double> ys, List<int> pointLines)
    {
        if (firstX is null || lastX is null || nPoints is null)
            throw Fail.At(file, dataLine, 1, "##XYDATA= without ##FIRSTX, ##LASTX and ##NPOINTS", "all three before the table (McDonald & Wilks 1988: X++(Y..Y) needs them to place each ordinate)");
        if (nPoints < 2 || nPoints > 50_000_000 || nPoints != Math.Floor(nPoints.Value))
            throw Fail.At(file, byKey["NPOINTS"].Line, 1, $"##NPOINTS={Fmt(nPoints.Value)}", "a whole number of points from 2 to 50,000,000");
        var delta = (lastX.Value - firstX.Value) / (nPoints.Value - 1);
        var forms = AsdfForms.None;
        var numbers = new List<double>();
        var previousEndedInDif = false;
        foreach (var (line, text) in dataLines)
        {
            numbers.Clear();
            var (f, endsInDif) = JcampAsdf.Decode(text, numbers, file, line, 0);
            forms |= f;
            if (numbers.Count == 0) continue;
            if (numbers.Count == 1)
                throw Fail.At(file, line, 1, $"only an abscissa ({Fmt(numbers[0])})", "X followed by its ordinates (X++(Y..Y))");
            var x = numbers[0] * xFactor;
            var firstY = 1;
            if (previousEndedInDif && ys.Count > 0)
            {
                // Y check: after a line that ended in DIF form, the next line repeats the last ordinate (McDonald & Wilks 1988, DIF Y check).
                var check = numbers[1] * yFactor;
                if (!Close(check, ys[^1], Math.Abs(yFactor) * 1e-6))
                    throw Fail.At(file, line, 1, $"a Y check value of {Fmt(check)} after {Fmt(ys[^1])} on line {pointLines[^1]}",
                        "the last ordinate of the previous line repeated (McDonald & Wilks 1988, DIF Y check)", "the file is corrupt or was edited by hand");
                firstY = 2;
                // the check point's abscissa is the previous point's, so this line's X names the point before its first new ordinate
                x += delta;
            }
            var expected = firstX.Value + ys.Count * delta;
            if (!Close(x, expected, 0.5 * Math.Abs(xFactor) + 1e-3 * Math.Abs(delta)))
                throw Fail.At(file, line, 1, $"an abscissa of {Fmt(x)}", $"{Fmt(expected)}, from FIRSTX + {ys.Count}·(LASTX − FIRSTX)/(NPOINTS − 1) (McDonald & Wilks 1988, X check)",
                    "points may be missing or the header edited");
            for (var k = firstY; k < numbers.Count; k++)
            {
                if (ys.Count >= nPoints)
                    throw Fail.At(file, line, 1, $"more than ##NPOINTS={Fmt(nPoints.Value)} ordinates", "the declared number of points (McDonald & Wilks 1988, NPOINTS check)");
                xs.Add(firstX.Value + ys.Count * delta);
                ys.Add(numbers[k] * yFactor);
                pointLines.Add(line);
            }
            previousEndedInDif = endsInDif;
        }
        return forms;
    }

    private static AsdfForms ReadXyPoints(List<(int Line, string Text)> dataLines, string file, int dataLine, double xFactor, double yFactor,
        List<double> xs, List<double> ys, List<int> pointLines)
    {
        var numbers = new List<double>();
        var forms = AsdfForms.None;
        double? pendingX = null;
        var pendingLine = 0;
        foreach (var (line, text) in dataLines)
        {
            numbers.Clear();
            var (f, _) = JcampAsdf.Decode(text, numbers, file, line, 0);
            if ((f & (AsdfForms.Dif | AsdfForms.Dup)) != 0)
                throw Fail.At(file, line, 1, "DIF or DUP compression in ##XYPOINTS", "(XY..XY) pairs in AFFN (McDonald & Wilks 1988)");
            forms |= f;
            foreach (var v in numbers)
            {
                if (pendingX is null)
                {
                    pendingX = v;
                    pendingLine = line;
                    continue;
                }
                xs.Add(pendingX.Value * xFactor);
                ys.Add(v * yFactor);
                pointLines.Add(pendingLine);
                pendingX = null;
            }
        }
        if (pendingX is not null)
            throw Fail.At(file, pendingLine, 1, $"an X value ({Fmt(pendingX.Value)}) without its Y", "X,Y pairs", "the table may be truncated");
        return forms;
    }

    private static UnitInfo TimeUnit(Record r, string file)
    {
        var u = Normalise(r.Value) switch
        {
            "SECONDS" or "SECOND" or "SEC" or "S" or "TIME(S)" or "TIME(SECONDS)" => Units.Find("s"),
            "MILLISECONDS" or "MSEC" or "MS" => Units.Find("ms"),
            "MINUTES" or "MINUTE" or "MIN" or "TIME(MIN)" => Units.Find("min"),
            "HOURS" or "HOUR" or "H" or "HR" => Units.Find("h"),
            _ => Units.FindIgnoringCase(r.Value),
        };
        if (u is null || u.Quantity != Quantity.Time)
            throw Fail.At(file, r.Line, 1, $"##{r.Label}={r.Value}", "a time unit for X: SECONDS, MINUTES, HOURS, MILLISECONDS (a time course)",
                u is null ? $"TraceKin does not know the unit {Fail.Quote(r.Value)}" : "this file is not a time course");
        return u;
    }

    private static (Quantity, UnitInfo) SignalUnit(Record r, string file)
    {
        var n = Normalise(r.Value);
        if (n is "ABSORBANCE" or "ABS" or "AU" or "A" or "OPTICALDENSITY" or "OD")
            return (Quantity.Absorbance, Units.Find("AU")!);
        var u = Units.FindIgnoringCase(r.Value);
        if (u is { Quantity: Quantity.Absorbance or Quantity.GasVolume or Quantity.Pressure or Quantity.Conductivity or Quantity.Concentration })
            return (u.Quantity, u);
        throw Fail.At(file, r.Line, 1, $"##{r.Label}={r.Value}", "a signal unit for Y: ABSORBANCE, a volume (mL), a pressure (kPa) or a conductivity (mS/cm)",
            n == "TRANSMITTANCE" ? "convert transmittance to absorbance before import" : u is null ? $"TraceKin does not know the unit {Fail.Quote(r.Value)}" : "this is not a signal TraceKin converts");
    }

    private static double? Number(Dictionary<string, Record> byKey, string key, string file)
    {
        if (!byKey.TryGetValue(key, out var r)) return null;
        if (double.TryParse(r.Value, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) && double.IsFinite(v)) return v;
        throw Fail.At(file, r.Line, 1, $"##{r.Label}={Fail.Quote(r.Value)}", "a number with a decimal point (AFFN, McDonald & Wilks 1988)");
    }

    private static bool Close(double a, double b, double tolerance) => Math.Abs(a - b) <= tolerance + 1e-9 * Math.Max(Math.Abs(a), Math.Abs(b));

    private static string Fmt(double v) => v.ToString("G10", CultureInfo.InvariantCulture);

    private static string InternalUnit(Quantity q) => q switch
    {
        Quantity.Absorbance => Units.Absorbance,
        Quantity.GasVolume => Units.Litre,
        Quantity.Pressure => Units.Pascal,
        Quantity.Conductivity => Units.SiemensPerMetre,
        _ => Units.MolPerLitre,
    };
}
