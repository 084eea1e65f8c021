using System.Text;
using TraceKin.Ingest;
using TraceKin.Traces;

namespace TraceKin.Tests.Ingest;

// Pooled reads must hand over exactly the file's bytes, and an export read from them must not depend on the buffer.
public class ExportBytesTests
{
    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    [InlineData(85_000)]
    [InlineData(300_001)]
    public void A_pooled_read_gives_the_same_bytes_as_ReadAllBytes(int size)
    {
        // File.ReadAllBytes (.NET runtime) is the reference; invented random content, fixed seed.
        var path = Path.Combine(Path.GetTempPath(), $"tracekin-exportbytes-{Guid.NewGuid():N}.bin");
        var content = new byte[size];
        new Random(size).NextBytes(content);
        File.WriteAllBytes(path, content);
        try
        {
            using var bytes = ExportBytes.Read(path);
            Assert.True(File.ReadAllBytes(path).AsSpan().SequenceEqual(bytes.Memory.Span));
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void An_export_read_from_a_pooled_buffer_survives_the_buffer_being_reused()
    {
        // Round trip on an invented export: the values must be copies, not views of the rented buffer.
        var path = Path.Combine(Path.GetTempPath(), $"tracekin-exportbytes-{Guid.NewGuid():N}.csv");
        File.WriteAllText(path, "time (s),A520\n0,0.812\n1.5,0.790\n3,0.751\n4.5,0.707\n", Encoding.UTF8);
        try
        {
            var run = ExportReader.FromFile(path, IngestSettings.Default);
            for (var k = 0; k < 8; k++)
            {
                using var reuse = ExportBytes.Read(path);
                System.Runtime.InteropServices.MemoryMarshal.AsMemory(reuse.Memory).Span.Fill((byte)'9');
            }
            Assert.Equal([0.812, 0.790, 0.751, 0.707], run.Channels[0].Values);
            Assert.Equal([0, 1.5, 3, 4.5], run.Channels[0].Times);
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void A_missing_export_is_a_located_error_naming_the_file()
    {
        // common practice, no source: an input error names the file the user gave
        var path = Path.Combine(Path.GetTempPath(), $"tracekin-missing-{Guid.NewGuid():N}.csv");
        var problem = Assert.Throws<InputException>(() => ExportReader.FromFile(path, IngestSettings.Default)).Problem;
        Assert.Equal(Path.GetFileName(path), problem.File);
        Assert.Contains("no such file", problem.Message);
    }
}
