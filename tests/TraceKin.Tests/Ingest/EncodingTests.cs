using System.Text;
using static TraceKin.Tests.Ingest.IngestAssert;

namespace TraceKin.Tests.Ingest;

// Byte-order marks and encodings: The Unicode Standard 15.0, §2.5 and §3.10 (BOM byte sequences EF BB BF, FF FE, FE FF);
// Windows-1252 byte 0xB0 is '°' and 0x80 is '€' (Unicode Consortium, CP1252.TXT, from memory).
public class EncodingTests
{
    private const string Text = "sample: Küvette 2\ntime (s);T (°C);A520\n0;25,0;0,5\n1;25,0;0,4\n2;25,1;0,3\n";

    [Fact]
    public void Utf8_without_bom_is_detected()
    {
        var run = ReadBytes(Encoding.UTF8.GetBytes(Text));
        Assert.Equal("UTF-8", Detected(run, "encoding"));
        Assert.Equal("Küvette 2", run.Metadata["sample"]);
        Assert.Equal(298.15, run.Auxiliary[0].Values[0], 12);
    }

    [Fact]
    public void Utf8_with_bom_is_detected_and_the_bom_is_not_part_of_the_first_key()
    {
        var run = ReadBytes([0xEF, 0xBB, 0xBF, .. Encoding.UTF8.GetBytes(Text)]);
        Assert.Equal("UTF-8 (BOM)", Detected(run, "encoding"));
        Assert.True(run.Metadata.ContainsKey("sample"));
    }

    [Fact]
    public void Utf16_little_endian_with_bom_is_detected()
    {
        var run = ReadBytes([0xFF, 0xFE, .. Encoding.Unicode.GetBytes(Text)]);
        Assert.Equal("UTF-16 LE (BOM)", Detected(run, "encoding"));
        Assert.Equal([0.5, 0.4, 0.3], run.Channel("A520").Values);
    }

    [Fact]
    public void Utf16_big_endian_with_bom_is_detected()
    {
        var run = ReadBytes([0xFE, 0xFF, .. Encoding.BigEndianUnicode.GetBytes(Text)]);
        Assert.Equal("UTF-16 BE (BOM)", Detected(run, "encoding"));
        Assert.Equal("Küvette 2", run.Metadata["sample"]);
    }

    [Fact]
    public void Windows1252_bytes_that_are_not_utf8_fall_back_and_read_the_degree_sign()
    {
        var bytes = Encoding.Latin1.GetBytes(Text);
        var run = ReadBytes(bytes);
        Assert.Equal("Windows-1252 (not valid UTF-8)", Detected(run, "encoding"));
        Assert.Equal("°C", run.Auxiliary[0].SourceUnit);
        Assert.Equal("Küvette 2", run.Metadata["sample"]);
    }

    [Fact]
    public void Windows1252_euro_byte_0x80_decodes_to_the_euro_sign()
    {
        var bytes = Encoding.Latin1.GetBytes("cost: X\ntime (s),A520\n0,1\n1,2\n2,3\n");
        bytes[6] = 0x80;
        var run = ReadBytes(bytes);
        Assert.Equal("\u20AC", run.Metadata["cost"]);
    }

    [Fact]
    public void Forced_latin1_reads_0x80_as_the_c1_control_not_the_euro()
    {
        var bytes = Encoding.Latin1.GetBytes("cost: X\ntime (s),A520\n0,1\n1,2\n2,3\n");
        bytes[6] = 0x80;
        var run = ReadBytes(bytes, new TraceKin.Ingest.IngestSettings { Encoding = "latin-1" });
        Assert.Equal("\u0080", run.Metadata["cost"]);
        Assert.Equal("Latin-1 (set by ingest.encoding)", Detected(run, "encoding"));
    }

    [Fact]
    public void Invalid_utf8_after_a_utf8_bom_is_a_located_error()
    {
        var bytes = new List<byte> { 0xEF, 0xBB, 0xBF };
        bytes.AddRange(Encoding.UTF8.GetBytes("time (s),A520\n0,1\n1,"));
        bytes.Add(0xFF);
        bytes.AddRange(Encoding.UTF8.GetBytes("\n2,3\n"));
        var p = RejectsBytes(bytes.ToArray());
        Assert.Equal(3, p.Line);
        Assert.Equal(3, p.Column);
        Assert.Contains("0xFF", p.Found);
    }

    [Fact]
    public void Utf16_without_a_bom_is_rejected_as_binary_with_a_hint()
    {
        var p = RejectsBytes(Encoding.Unicode.GetBytes("time (s),A520\n0,1\n1,2\n2,3\n"));
        Assert.Equal(1, p.Line);
        Assert.Equal(2, p.Column);
        Assert.Contains("NUL", p.Found);
        Assert.Contains("ingest.encoding", p.Hint);
    }

    [Fact]
    public void Forced_utf16le_reads_a_file_without_bom()
    {
        var run = ReadBytes(Encoding.Unicode.GetBytes("time (s),A520\n0,1\n1,2\n2,3\n"), new TraceKin.Ingest.IngestSettings { Encoding = "utf-16le" });
        Assert.Equal([1.0, 2, 3], run.Channels[0].Values);
    }
}
