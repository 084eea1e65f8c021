using System.Buffers;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// An export file's bytes in a buffer rented from <see cref="ArrayPool{T}.Shared"/>, returned on <see cref="Dispose"/>.
/// Reading a batch this way costs the copy from the operating system and little else: <see cref="File.ReadAllBytes"/>
/// allocates a new array per file, and above 85,000 bytes each one lands on the large object heap, whose collections
/// cost more than the read itself. Nothing <see cref="ExportReader"/> returns refers to the buffer, so it may be
/// returned as soon as the export has been read (and, say, hashed).
/// </summary>
public sealed class ExportBytes : IDisposable
{
    private byte[]? _buffer;
    private readonly int _length;

    private ExportBytes(byte[] buffer, int length)
    {
        _buffer = buffer;
        _length = length;
    }

    /// <summary>The file's bytes; invalid after <see cref="Dispose"/>.</summary>
    public ReadOnlyMemory<byte> Memory => (_buffer ?? throw new ObjectDisposedException(nameof(ExportBytes))).AsMemory(0, _length);

    /// <summary>
    /// Reads a whole export. A missing file, anything but a regular file (a pipe or device, refused before it is opened,
    /// since opening or reading it could block or never end) or a file whose metadata gives more than
    /// <see cref="ExportReader.MaxBytes"/> is an <see cref="InputException"/> naming <paramref name="path"/>'s file name
    /// (at line 1, column 1: the file as a whole); other IO failures throw as <see cref="File.ReadAllBytes"/> would.
    /// </summary>
    public static ExportBytes Read(string path)
    {
        var name = Path.GetFileName(path);
        switch (Setup.SeriesInputs.KindOf(path, out var size))
        {
            case Setup.SeriesInputs.FileKind.Missing:
                throw Fail.At(name, 1, 1, "no such file", "an export file", $"looked for {path}");
            case Setup.SeriesInputs.FileKind.Regular:
                break;
            default:
                throw Fail.At(name, 1, 1, "not a regular file (a folder, pipe, device or socket)", "an export file", "a pipe or device is never opened");
        }
        if (size > ExportReader.MaxBytes)
            throw Fail.At(name, 1, 1, $"a file of {size:N0} bytes", $"at most {ExportReader.MaxBytes:N0} bytes", "is this a time-course export?");
        using var handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read, FileOptions.SequentialScan);
        var length = RandomAccess.GetLength(handle);
        if (length > ExportReader.MaxBytes)
            throw Fail.At(name, 1, 1, $"a file of {length:N0} bytes", $"at most {ExportReader.MaxBytes:N0} bytes", "is this a time-course export?");
        var buffer = ArrayPool<byte>.Shared.Rent(Math.Max(1, (int)length));
        try
        {
            // the file may still be growing or shrinking: read to its end, growing the buffer when needed
            var total = 0;
            while (true)
            {
                if (total == buffer.Length)
                {
                    if (total >= ExportReader.MaxBytes)
                        throw Fail.At(name, 1, 1, $"a file of more than {ExportReader.MaxBytes:N0} bytes", $"at most {ExportReader.MaxBytes:N0} bytes", "is this a time-course export?");
                    var larger = ArrayPool<byte>.Shared.Rent((int)Math.Min(2L * buffer.Length, ExportReader.MaxBytes));
                    buffer.AsSpan(0, total).CopyTo(larger);
                    ArrayPool<byte>.Shared.Return(buffer);
                    buffer = larger;
                }
                var n = RandomAccess.Read(handle, buffer.AsSpan(total), total);
                if (n == 0) break;
                total += n;
            }
            return new ExportBytes(buffer, total);
        }
        catch
        {
            ArrayPool<byte>.Shared.Return(buffer);
            throw;
        }
    }

    public void Dispose()
    {
        if (_buffer is { } b) ArrayPool<byte>.Shared.Return(b);
        _buffer = null;
    }
}
