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
    [InlineData(ExportBytes.LargeFileBytes + 1)] // read into native memory, not a pooled buffer
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

    [Fact]
    public async Task A_pipe_given_as_an_export_is_refused_before_it_is_opened()
    {
        var path = Path.Combine(Path.GetTempPath(), $"tracekin-fifo-{Guid.NewGuid():N}.csv");
        if (TraceKin.Tests.Analysis.ProbeSeries.MakeFifo(path, out var reason) is null)
        {
            Assert.True(Environment.GetEnvironmentVariable("CI") is null, $"cannot make a FIFO: {reason}; CI requires this check");
            return; // nothing to check without a pipe (the reason is in the assertion above when CI is set)
        }
        try
        {
            // ExportBytes.Read would block in open(2) if it opened the pipe; it refuses it from its metadata instead.
            // The minute is a guard against that hang, not a speed check.
            var read = Task.Run(() => Assert.Throws<InputException>(() => ExportReader.FromFile(path, IngestSettings.Default)).Problem);
            if (await Task.WhenAny(read, Task.Delay(TimeSpan.FromMinutes(1))) != read)
            {
                using (new FileStream(path, FileMode.Open, FileAccess.Write)) { }
                Assert.Fail("reading the pipe blocked: it was opened");
            }
            var problem = await read;
            Assert.Equal((Path.GetFileName(path), 1, 1), (problem.File, problem.Line, problem.Column));
            Assert.StartsWith("not a regular file", problem.Found);
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void An_export_whose_metadata_exceeds_the_limit_is_refused_before_reading()
    {
        var path = Path.Combine(Path.GetTempPath(), $"tracekin-sparse-{Guid.NewGuid():N}.csv");
        try
        {
            using (var fs = File.Create(path)) fs.SetLength(ExportReader.MaxBytes + 1); // sparse: no data written
            var problem = Assert.Throws<InputException>(() => ExportBytes.Read(path)).Problem;
            Assert.Equal("a file of 1,073,741,825 bytes", problem.Found);
            Assert.Equal((1, 1), (problem.Line, problem.Column));
        }
        finally
        {
            File.Delete(path);
        }
    }
}
