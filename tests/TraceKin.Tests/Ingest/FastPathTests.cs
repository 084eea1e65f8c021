using System.Globalization;
using System.Text;
using TraceKin.Ingest;
using TraceKin.Traces;

namespace TraceKin.Tests.Ingest;

// The single-pass reader for plain rows (FastRow, PlainNumber) must be invisible: the same doubles, bit for bit, as the
// general path and as the runtime's parser, and the same located errors.
public class FastPathTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    private static readonly CultureInfo DecimalComma = CultureInfo.GetCultureInfo("de-DE");
    private static readonly byte[] Replacements = "x,;.\n \"-e"u8.ToArray();
    private static readonly byte[] Insertions = ",;.\n\r-+e0"u8.ToArray();

    [Fact]
    public void Plain_number_fast_path_gives_the_bits_of_double_Parse_on_100000_random_decimals()
    {
        // IEEE 754 correct rounding; .NET double.Parse (NumberStyles.Float, invariant culture for a decimal point,
        // de-DE for a decimal comma) as the reference library. Fixed seed; edge cases first.
        string[] edges =
        [
            "0", "-0", "+0", "0.0", "-0.000", "-0e5", "0e-400", "00000.00000", ".5", "5.", "-.25", "1e22", "1e23", "9007199254740992",
            "9007199254740993", "9007199254740991.5", "123456789012345678", "1234567890123456789", "12345678901234567890", "0.1", "0.2", "0.3",
            "2.2250738585072014e-308", "4.9e-324", "1.7976931348623157e308", "1e308", "1e-22", "1e-23", "17.976931348623157", "0.10121",
            "99999999999999999999", "1.000000000000000000", "100000000000000000000", "3.0e+0", "3E-2", "7e0022", "7e00022", "12345.6789e-3",
        ];
        var rng = new Random(20261202);
        var cases = edges.Concat(Enumerable.Range(0, 100_000).Select(_ => RandomDecimal(rng))).ToList();
        var fast = 0;
        foreach (var s in cases)
        {
            foreach (var comma in new[] { false, true })
            {
                var text = comma ? s.Replace('.', ',') : s;
                var separator = comma ? (byte)',' : (byte)'.';
                var reference = double.Parse(text, NumberStyles.Float, comma ? DecimalComma : Inv);
                var expected = BitConverter.DoubleToInt64Bits(reference);
                var bytes = Encoding.ASCII.GetBytes(text);
                var i = 0;
                var taken = PlainNumber.TryRead(bytes, ref i, separator, out var v);
                if (!double.IsFinite(reference))
                {
                    // past the largest double: the runtime gives infinity, and an export cell must be refused
                    Assert.False(taken, text);
                    Assert.Equal(NumberStatus.NonFinite, NumberCell.TryParse(bytes, separator, out _));
                    continue;
                }
                if (taken)
                {
                    Assert.True(i == bytes.Length, $"{text}: stopped at byte {i} of {bytes.Length}");
                    Assert.True(expected == BitConverter.DoubleToInt64Bits(v), $"{text}: fast path {v:R}, double.Parse {BitConverter.Int64BitsToDouble(expected):R}");
                    fast++;
                }
                Assert.Equal(NumberStatus.Ok, NumberCell.TryParse(bytes, separator, out var w));
                Assert.True(expected == BitConverter.DoubleToInt64Bits(w), $"{text}: cell parser {w:R}, double.Parse {BitConverter.Int64BitsToDouble(expected):R}");
            }
        }
        // most generated numbers are short enough for the fast path, so the comparison above really exercised it
        Assert.True(fast > cases.Count, $"only {fast} of {2 * cases.Count} numbers took the fast path");
    }

    [Theory]
    [InlineData("1.2.3")]
    [InlineData("1,5")]
    [InlineData("1e")]
    [InlineData("1e+")]
    [InlineData("-")]
    [InlineData(".")]
    [InlineData("e5")]
    [InlineData("1 000")]
    [InlineData("0x10")]
    public void Plain_number_fast_path_stops_at_the_first_byte_that_is_not_a_plain_number(string cell)
    {
        // Whatever the fast path takes must be a whole number cell; the caller sends any leftover byte to the general path.
        var bytes = Encoding.ASCII.GetBytes(cell);
        var i = 0;
        var taken = PlainNumber.TryRead(bytes, ref i, (byte)'.', out _);
        Assert.True(!taken || i < bytes.Length, $"{cell}: taken whole as a number");
    }

    public static TheoryData<string, string> Exports => new()
    {
        { "comma, decimal point", "time (s),A520\n0,0.812\n1.5,0.790\n3,0.751\n4.5,0.707\n6,0.690\n" },
        { "semicolon, decimal comma, CRLF", "t (min);A520;A700\r\n0;0,812;0,010\r\n0,5;0,790;0,011\r\n1;0,751;0,012\r\n1,5;0,707;0,011\r\n" },
        { "CR line ends, no final break", "time (s),A520\r0,0.8\r1,0.7\r2,0.6\r3,0.5" },
        { "ignored column with text", "time (s),note,A520\n0,start,0.8\n1,,0.7\n2,\"a, b\",0.6\n3,x,0.5\n" },
        { "blank and comment lines among rows", "time (s),A520\n0,0.8\n\n1,0.7\n# lamp check\n2,0.6\n3,0.5\n" },
        { "blanks around cells and quotes", "time (s),A520\n0,0.8\n1, 0.7\n\"2\",0.6\n3 ,0.5\n4,0.4\n" },
        { "footer after the rows", "time (s),A520\n0,0.8\n1,0.7\n2,0.6\nEnd of data\nOperator,someone\n" },
        { "decimal comma line starting with the separator is a footer", "t (s);A520\n0;0,8\n1;0,7\n2;0,6\n,5;0,5\n" },
        { "exponents, signs, long mantissas", "time (s),A520,T (°C)\n0,8.12e-1,25\n1e0,-0.7900000000000000001,25.0\n2,+6.0E-1,2.5e1\n3,0.5,25.00000000000000000000001\n" },
        { "trailing delimiter", "time (s),A520\n0,0.8,\n1,0.7,\n2,0.6,\n" },
        { "preamble and mixing time", "instrument: bench photometer\nmixed at: -2 s\ntime (s),A520\n0,0.812\n1.5,0.790\n3,0.751\n" },
    };

    [Theory]
    [MemberData(nameof(Exports))]
    public void Fast_rows_and_the_general_path_read_the_same_bits(string name, string text)
    {
        // Round trip against our own general path (invented exports): every time, value and detection must match.
        var bytes = Encoding.UTF8.GetBytes(text);
        var settings = new IngestSettings { IgnoreColumns = ["note"] };
        var fast = ExportReader.FromBytes(bytes, "run.csv", settings, fastRows: true);
        var slow = ExportReader.FromBytes(bytes, "run.csv", settings, fastRows: false);
        AssertSame(name, fast, slow);
    }

    [Fact]
    public void Fast_rows_and_the_general_path_agree_on_random_exports_and_on_every_error()
    {
        // Invented random exports (fixed seed) in several layouts, half of them damaged by one edit: both paths must
        // read the same bits or fail with the same problem (file, line, column, what was found and expected).
        var rng = new Random(7031);
        var errors = 0;
        for (var variant = 0; variant < 3_000; variant++)
        {
            var (text, settings) = RandomExport(rng);
            var bytes = Encoding.UTF8.GetBytes(text).ToList();
            if (variant % 2 == 1 && bytes.Count > 0)
            {
                var at = rng.Next(bytes.Count);
                switch (rng.Next(4))
                {
                    case 0: bytes[at] = Replacements[rng.Next(Replacements.Length)]; break;
                    case 1: bytes.RemoveAt(at); break;
                    case 2: bytes.Insert(at, Insertions[rng.Next(Insertions.Length)]); break;
                    default: bytes.RemoveRange(at, bytes.Count - at); break;
                }
            }
            var input = bytes.ToArray();
            RunExport? fast = null, slow = null;
            Problem? fastError = null, slowError = null;
            try { fast = ExportReader.FromBytes(input, "run.csv", settings, fastRows: true); }
            catch (InputException ex) { fastError = ex.Problem; }
            try { slow = ExportReader.FromBytes(input, "run.csv", settings, fastRows: false); }
            catch (InputException ex) { slowError = ex.Problem; }
            Assert.True((fast is null) == (slow is null), $"variant {variant}: fast {(fastError?.Message ?? "read")}, general {(slowError?.Message ?? "read")}");
            if (fast is null)
            {
                Assert.Equal(slowError, fastError);
                errors++;
            }
            else AssertSame($"variant {variant}", fast, slow!);
        }
        Assert.True(errors is > 300 and < 2_700, $"{errors} of 3000 variants failed"); // both reads and errors were compared
    }

    [Fact]
    public void A_bad_cell_deep_in_a_long_file_is_located_exactly()
    {
        // 5,000 plain rows read by the fast path, then one damaged cell: the error names its line and column as before.
        var sb = new StringBuilder("time (s),A520\n");
        for (var k = 0; k < 5_000; k++) sb.Append(k == 4_000 ? string.Create(Inv, $"{k * 0.25:0.00},0.5OOOO\n") : string.Create(Inv, $"{k * 0.25:0.00},{0.9 - k * 1e-4:0.00000}\n"));
        var problem = IngestAssert.Rejects(sb.ToString());
        Assert.Equal(4_002, problem.Line); // header on line 1, row k = 4000 on line 4002
        Assert.Equal(9, problem.Column);
        Assert.Contains("\"0.5OOOO\"", problem.Message);
    }

    [Fact]
    public void Line_numbers_in_warnings_and_errors_count_the_blank_and_comment_lines_between_rows()
    {
        // Invented exports, lines counted by hand: rows are on lines 2, 4, 6, 7, 9, 10, 11, 12.
        var run = IngestAssert.Read("time (s),A520\n0,1.2\n\n1,2.1\n# note\n2,3.2\n3,3.2\n\n4,3.2\n5,3.2\n6,2.9\n7,2.5\n");
        var w = Assert.Single(run.Warnings);
        Assert.Contains("lines 6–10", w.Message);
        Assert.Equal("run.csv:6", w.Where);
        Assert.Contains("(lines 2–12)", IngestAssert.Detected(run, "rows"));

        var problem = IngestAssert.Rejects("time (s),A520\n0,1\n\n1,2\n# c\n2,3\n2.5,4\n1.5,5\n");
        Assert.Equal(8, problem.Line);
        Assert.Contains("earlier than line 7", problem.Message);
    }

    private static void AssertSame(string name, RunExport fast, RunExport slow)
    {
        Assert.Equal(slow.Detected, fast.Detected);
        Assert.Equal(slow.Warnings, fast.Warnings);
        Assert.Equal(slow.Metadata.OrderBy(m => m.Key), fast.Metadata.OrderBy(m => m.Key));
        var a = fast.Channels.Concat(fast.Auxiliary).ToList();
        var b = slow.Channels.Concat(slow.Auxiliary).ToList();
        Assert.Equal(b.Count, a.Count);
        for (var c = 0; c < a.Count; c++)
        {
            Assert.Equal(b[c].Name, a[c].Name);
            Assert.True(Bits(b[c].Times).SequenceEqual(Bits(a[c].Times)), $"{name}: times of {a[c].Name} differ");
            Assert.True(Bits(b[c].Values).SequenceEqual(Bits(a[c].Values)), $"{name}: values of {a[c].Name} differ");
        }
    }

    private static IEnumerable<long> Bits(double[] values) => values.Select(BitConverter.DoubleToInt64Bits);

    /// <summary>A decimal string: sign, 1–20 digits split at a random point, leading or trailing zeros, maybe an exponent.</summary>
    private static string RandomDecimal(Random rng)
    {
        var sb = new StringBuilder();
        switch (rng.Next(4))
        {
            case 0: sb.Append('-'); break;
            case 1 when rng.Next(4) == 0: sb.Append('+'); break;
        }
        var n = rng.Next(1, 21);
        var digits = new char[n];
        for (var k = 0; k < n; k++) digits[k] = (char)('0' + rng.Next(10));
        if (rng.Next(5) == 0) for (var k = 0; k < rng.Next(1, n + 1); k++) digits[k] = '0';     // leading zeros
        if (rng.Next(5) == 0) for (var k = n - rng.Next(1, n + 1); k < n; k++) digits[k] = '0'; // trailing zeros
        var point = rng.Next(n + 2); // n + 1: no point at all
        var body = new string(digits);
        if (point <= n) body = body[..point] + "." + body[point..];
        if (body == ".") body = "0.";
        sb.Append(body);
        if (rng.Next(3) == 0)
        {
            sb.Append(rng.Next(2) == 0 ? 'e' : 'E');
            var e = rng.Next(8) == 0 ? rng.Next(-340, 320) : rng.Next(-30, 31);
            sb.Append(e < 0 ? "-" : rng.Next(3) == 0 ? "+" : "");
            sb.Append(Math.Abs(e).ToString(Inv));
        }
        return sb.ToString();
    }

    private static (string Text, IngestSettings Settings) RandomExport(Random rng)
    {
        var comma = rng.Next(3) == 0;
        var delimiter = comma ? ";" : rng.Next(2) == 0 ? "," : "\t";
        var newline = new[] { "\n", "\r\n", "\r" }[rng.Next(3)];
        var withNote = rng.Next(3) == 0;
        var withTemperature = rng.Next(2) == 0; // without it and the note: time and one value, the fast path's commonest layout
        var unit = new[] { "s", "min", "ms" }[rng.Next(3)];
        var sb = new StringBuilder();
        if (rng.Next(3) == 0) sb.Append("instrument: invented photometer").Append(newline);
        sb.Append($"time ({unit}){delimiter}A520{(withNote ? $"{delimiter}note" : "")}{(withTemperature ? $"{delimiter}T (°C)" : "")}").Append(newline);
        var rows = rng.Next(3, 60);
        var t = rng.NextDouble();
        for (var k = 0; k < rows; k++)
        {
            t += rng.Next(40) == 0 ? 0 : 0.01 + rng.NextDouble() * 2; // now and then a repeated time
            string Num(double v) => rng.Next(4) switch
            {
                0 => v.ToString("E3", Inv),
                1 => v.ToString("R", Inv),
                _ => v.ToString("F" + rng.Next(0, 7), Inv),
            };
            var time = rng.Next(3) switch { 0 => t.ToString("R", Inv), 1 => t.ToString("F4", Inv), _ => t.ToString("E6", Inv) };
            var cells = new List<string> { time, Num(rng.NextDouble() * 2 - 0.1) };
            if (withNote) cells.Add(rng.Next(4) == 0 ? "\"a" + delimiter + "b\"" : "n" + k);
            if (withTemperature) cells.Add(Num(20 + 10 * rng.NextDouble()));
            var line = string.Join(delimiter, comma ? cells.Select(c => c.Replace('.', ',')) : cells);
            if (rng.Next(20) == 0) line = " " + line;
            sb.Append(line).Append(newline);
            if (rng.Next(25) == 0) sb.Append(rng.Next(2) == 0 ? "" : "# pause").Append(newline);
        }
        if (rng.Next(4) == 0) sb.Append("End of data").Append(newline);
        var settings = new IngestSettings { DuplicateTimes = new[] { "error", "average", "first" }[rng.Next(3)], IgnoreColumns = ["note"] };
        return (sb.ToString(), settings);
    }
}
