using System.Globalization;
using System.Text;
using System.Text.Json;
using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

/// <summary>
/// How summary.json writes text and numbers. What JSON requires is from RFC 8259 (§7: the quotation mark, the reverse
/// solidus and U+0000–U+001F must be escaped, anything else may be written as itself; §6: no NaN or infinity); which
/// characters are format characters is the Unicode Character Database's General_Category Cf.
/// </summary>
public sealed class SummaryJsonTextTests(AnalysedSample sample) : IClassFixture<AnalysedSample>
{
    private static string Written(string text)
    {
        using var ms = new MemoryStream();
        using (var w = new Utf8JsonWriter(ms, new JsonWriterOptions { Encoder = SummaryTextEncoder.Instance }))
        {
            w.WriteStartObject();
            w.WriteString(text, text);
            w.WriteEndObject();
        }
        var json = Encoding.UTF8.GetString(ms.ToArray());
        // The name is escaped exactly as the value: {"x":"x"}.
        var value = json[(json.IndexOf(':') + 1)..^1];
        Assert.Equal("{" + value + ":" + value + "}", json);
        return value;
    }

    [Theory]
    [InlineData("H+", "\"H+\"")]
    [InlineData("mol/(L·s) ± ν, ΔH‡, −d[X]/dt, °C, é", "\"mol/(L·s) ± ν, ΔH‡, −d[X]/dt, °C, é\"")]
    [InlineData("<b>&'`", "\"<b>&'`\"")]
    public void Text_that_JSON_does_not_require_escaping_is_written_as_itself(string text, string expected)
    {
        Assert.Equal(expected, Written(text));
    }

    [Theory]
    [InlineData("say \"hi\"", "\"say \\\"hi\\\"\"")]
    [InlineData("a\\b", "\"a\\\\b\"")]
    [InlineData("line\nbreak", "\"line\\nbreak\"")]
    [InlineData("esc\u001B[2J", "\"esc\\u001B[2J\"")]
    [InlineData("del\u007F c1\u009B", "\"del\\u007F c1\\u009B\"")]
    public void Quotation_mark_backslash_and_control_characters_are_escaped(string text, string expected)
    {
        Assert.Equal(expected, Written(text));
    }

    [Theory]
    [InlineData("R\u202E1.csv", "\"R\\u202E1.csv\"")]   // RIGHT-TO-LEFT OVERRIDE (Cf)
    [InlineData("a\u2066b\u2069", "\"a\\u2066b\\u2069\"")] // LEFT-TO-RIGHT ISOLATE, POP DIRECTIONAL ISOLATE (Cf)
    [InlineData("soft\u00ADhyphen", "\"soft\\u00ADhyphen\"")]
    [InlineData("zero\u200Bwidth", "\"zero\\u200Bwidth\"")]
    [InlineData("\uFEFFbom", "\"\\uFEFFbom\"")]
    [InlineData("para\u2029sep", "\"para\\u2029sep\"")]     // PARAGRAPH SEPARATOR (Zp)
    [InlineData("smile \U0001F600", "\"smile \\uD83D\\uDE00\"")]
    public void Characters_a_reader_would_not_see_are_escaped(string text, string expected)
    {
        Assert.Equal(expected, Written(text));
    }

    [Fact]
    public void Every_format_character_of_the_basic_plane_is_escaped_and_every_visible_letter_is_not()
    {
        for (var c = 0x80; c <= 0xFFFF; c++)
        {
            if (c is >= 0xD800 and <= 0xDFFF) continue;
            var cat = CharUnicodeInfo.GetUnicodeCategory(c);
            if (cat == UnicodeCategory.Format) Assert.True(SummaryTextEncoder.Instance.WillEncode(c), $"U+{c:X4} is a format character");
            if (cat is UnicodeCategory.LowercaseLetter or UnicodeCategory.UppercaseLetter or UnicodeCategory.MathSymbol && c < 0x3000)
                Assert.False(SummaryTextEncoder.Instance.WillEncode(c), $"U+{c:X4} ({cat}) is visible");
        }
    }

    private sealed record Numbers(double A, double? B, double?[] C);

    private static string Serialised(double a, double? b, params double?[] c) =>
        JsonSerializer.Serialize(new Numbers(a, b, c), new JsonSerializerOptions { Converters = { new FiniteNumberConverter() } });

    [Fact]
    public void Numbers_that_are_not_finite_are_written_as_null()
    {
        Assert.Equal("{\"A\":null,\"B\":null,\"C\":[null,null,null]}", Serialised(double.NaN, double.PositiveInfinity, double.NegativeInfinity, null, double.NaN));
    }

    [Theory]
    [InlineData(0.1)]
    [InlineData(1.0 / 3)]
    [InlineData(4.9406564584124654E-324)]   // the smallest subnormal double (IEEE 754 binary64)
    [InlineData(1.7976931348623157E+308)]   // the largest finite double
    [InlineData(0.35030853253440125)]
    [InlineData(-2)]
    public void Finite_numbers_read_back_as_the_same_double(double v)
    {
        var json = Serialised(v, v, v);
        using var doc = JsonDocument.Parse(json);
        Assert.Equal(BitConverter.DoubleToInt64Bits(v), BitConverter.DoubleToInt64Bits(doc.RootElement.GetProperty("A").GetDouble()));
        Assert.Equal(BitConverter.DoubleToInt64Bits(v), BitConverter.DoubleToInt64Bits(doc.RootElement.GetProperty("B").GetDouble()));
        Assert.Equal(BitConverter.DoubleToInt64Bits(v), BitConverter.DoubleToInt64Bits(doc.RootElement.GetProperty("C")[0].GetDouble()));
    }

    [Fact]
    public void Summary_of_the_sample_names_H_plus_as_itself_in_UTF_8_without_a_byte_order_mark()
    {
        var bytes = File.ReadAllBytes(sample.SummaryPath);
        Assert.Equal((byte)'{', bytes[0]);
        var text = new UTF8Encoding(false, throwOnInvalidBytes: true).GetString(bytes);
        Assert.Contains("\"H+\": 0.1,", text, StringComparison.Ordinal);
        Assert.Contains("\"unit\": \"mol/(L·s)\"", text, StringComparison.Ordinal);
        Assert.DoesNotContain("\\u", text, StringComparison.Ordinal);
    }
}

/// <summary>A big series reaches the file in pieces while its runs are still being mapped (common practice, no source: stream, do not buffer).</summary>
public sealed class SummaryJsonStreamingTests
{
    private sealed class CountingStream(Func<int> mapped) : Stream
    {
        private readonly MemoryStream _bytes = new();
        public int FirstWriteAtRun { get; private set; } = -1;
        public int Writes { get; private set; }
        public byte[] ToArray() => _bytes.ToArray();

        public override void Write(ReadOnlySpan<byte> buffer)
        {
            if (Writes++ == 0) FirstWriteAtRun = mapped();
            _bytes.Write(buffer);
        }

        public override void Write(byte[] buffer, int offset, int count) => Write(buffer.AsSpan(offset, count));
        public override void Flush() { }
        public override bool CanRead => false;
        public override bool CanSeek => false;
        public override bool CanWrite => true;
        public override long Length => _bytes.Length;
        public override long Position { get => _bytes.Position; set => throw new NotSupportedException(); }
        public override int Read(byte[] buffer, int offset, int count) => throw new NotSupportedException();
        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
        public override void SetLength(long value) => throw new NotSupportedException();
    }

    [Fact]
    public void Runs_are_written_as_they_are_mapped_not_after_the_last()
    {
        const int runs = 20_000;
        var mapped = 0;
        var stream = new CountingStream(() => mapped);
        var records = Enumerable.Range(0, runs).Select(i =>
        {
            mapped++;
            return new RunRecord($"R{i}", $"r{i}.csv", null, null, 298.15, new SortedDictionary<string, double?>(StringComparer.Ordinal) { ["A"] = 0.001 },
                new InitialRateRecord(1e-6, 1e-8, 10, "mol/(L·s)", "line", 0, 30, 12, 0, 0), null, "single", true, null, 0, false, 0, 0, []);
        });
        var summary = new SummaryRecord("TraceKin", "0", "big", null, records, [], null, [], null, 0, PairRatiosCsv.FileName, [], null, null, null, null, null, null, null, null, null, null, [], []);
        JsonSerializer.Serialize(stream, summary, SummaryJsonContext.Writer.SummaryRecord);
        Assert.InRange(stream.FirstWriteAtRun, 1, runs / 2);
        Assert.True(stream.Writes > 10, $"{stream.Writes} writes");
        using var doc = JsonDocument.Parse(stream.ToArray());
        Assert.Equal(runs, doc.RootElement.GetProperty("runs").GetArrayLength());
    }
}
