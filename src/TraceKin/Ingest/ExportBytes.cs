using System.Buffers;
using System.Runtime.InteropServices;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// An export file's bytes in a buffer rented from <see cref="ArrayPool{T}.Shared"/>, returned on <see cref="Dispose"/>.
/// Reading a batch this way costs the copy from the operating system and little else: <see cref="File.ReadAllBytes"/>
/// allocates a new array per file, and above 85,000 bytes each one lands on the large object heap, whose collections
/// cost more than the read itself. Nothing <see cref="ExportReader"/> returns refers to the buffer, so it may be
/// returned as soon as the export has been read (and, say, hashed).
/// A file above <see cref="LargeFileBytes"/> is read into memory outside the managed heap instead, freed on
/// <see cref="Dispose"/>: the pool would keep its buffer (tens of megabytes for a long run) for the rest of the
/// process, and the garbage collector returns a freed large array to the system only later, so in both cases the
/// file's bytes would stay resident beside every later stage of the run (docs/methods.md, "Memory per run").
/// </summary>
public sealed class ExportBytes : IDisposable
{
    /// <summary>Files larger than this are not read into pooled buffers (see the class summary).</summary>
    public const int LargeFileBytes = 8 << 20;

    private byte[]? _buffer;
    private NativeBytes? _native;
    private readonly int _length;

    private ExportBytes(byte[] buffer, int length)
    {
        _buffer = buffer;
        _length = length;
    }

    private ExportBytes(NativeBytes native, int length)
    {
        _native = native;
        _length = length;
    }

    /// <summary>The file's bytes; invalid after <see cref="Dispose"/>.</summary>
    public ReadOnlyMemory<byte> Memory =>
        _buffer is { } b ? b.AsMemory(0, _length)
        : _native is { } n ? n.Memory[.._length]
        : throw new ObjectDisposedException(nameof(ExportBytes));

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
        if (length > LargeFileBytes) return ReadLarge(handle, name, (int)length);
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

    /// <summary>Reads a large file into native memory, growing it if the file grows while being read.</summary>
    private static ExportBytes ReadLarge(Microsoft.Win32.SafeHandles.SafeFileHandle handle, string name, int length)
    {
        var native = new NativeBytes(length);
        try
        {
            var total = 0;
            while (true)
            {
                if (total == native.Length)
                {
                    if (total >= ExportReader.MaxBytes)
                        throw Fail.At(name, 1, 1, $"a file of more than {ExportReader.MaxBytes:N0} bytes", $"at most {ExportReader.MaxBytes:N0} bytes", "is this a time-course export?");
                    native.Grow((int)Math.Min(2L * native.Length, ExportReader.MaxBytes));
                }
                var n = RandomAccess.Read(handle, native.Memory.Span[total..], total);
                if (n == 0) break;
                total += n;
            }
            return new ExportBytes(native, total);
        }
        catch
        {
            ((IDisposable)native).Dispose();
            throw;
        }
    }

    public void Dispose()
    {
        if (_buffer is { } b) ArrayPool<byte>.Shared.Return(b);
        _buffer = null;
        ((IDisposable?)_native)?.Dispose();
        _native = null;
    }

    /// <summary>A block of native memory seen as <see cref="Memory{T}"/>; freed (back to the system) on Dispose.</summary>
    private sealed unsafe class NativeBytes : MemoryManager<byte>
    {
        private byte* _pointer;

        public NativeBytes(int length)
        {
            Length = Math.Max(1, length);
            _pointer = (byte*)NativeMemory.Alloc((nuint)Length);
        }

        public int Length { get; private set; }

        public void Grow(int length)
        {
            _pointer = (byte*)NativeMemory.Realloc(_pointer, (nuint)length);
            Length = length;
        }

        public override Span<byte> GetSpan() =>
            _pointer is null ? throw new ObjectDisposedException(nameof(ExportBytes)) : new Span<byte>(_pointer, Length);

        public override MemoryHandle Pin(int elementIndex = 0) => new(_pointer + elementIndex);

        public override void Unpin() { }

        protected override void Dispose(bool disposing)
        {
            if (_pointer is null) return;
            NativeMemory.Free(_pointer);
            _pointer = null;
        }
    }
}
