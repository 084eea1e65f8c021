using System.Buffers.Binary;
using System.IO.Compression;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace TraceKin.Reports;

/// <summary>The byte order of one 32-bit pixel in a buffer given to <see cref="PngWriter"/>.</summary>
internal enum PixelOrder
{
    /// <summary>R, G, B, A.</summary>
    Rgba,
    /// <summary>B, G, R, A: the drawing library's native order on little-endian machines, where it draws fastest.</summary>
    Bgra,
}

/// <summary>
/// Writes a 32-bit pixel buffer as a PNG (W3C Portable Network Graphics Specification, 2nd ed., 2003: signature §5.2,
/// IHDR §11.2.2, IDAT §11.2.4, IEND §11.2.5, CRC-32 of §5.5 and Annex D, filter type 2 "Up" §9.2), as truecolour with
/// alpha (colour type 6) or, for an opaque image, as truecolour (colour type 2, three bytes a pixel: a quarter less to
/// compress). Every row uses the Up filter, a byte-wise difference from the row above that vectorises and turns the
/// long vertical runs of a plot into zeros; the filtered rows are compressed by the runtime's zlib at its fastest
/// level, in one call for a plot. The image is lossless. Pixels may come in R, G,
/// B, A or in B, G, R, A order (<see cref="PixelOrder"/>); the reordering is done in the same pass as the filter.
/// </summary>
internal sealed class PngWriter
{
    private static ReadOnlySpan<byte> Signature => [0x89, (byte)'P', (byte)'N', (byte)'G', 0x0D, 0x0A, 0x1A, 0x0A];

    // Rows filtered per call to the compressor: the whole picture of a plot in one call. Each call has a cost of its own
    // in the compressor; blocks of 64 kB, meant to stay in the cache, made a run plot about 8 % slower to encode
    // (bench/README.md). Larger pictures are given in blocks of up to 16 MB, which bounds the buffer.
    private const int DefaultBlockBytes = 16 << 20;
    private readonly int _blockBytes;

    /// <param name="blockBytes">At most this many filtered bytes per call to the compressor (at least one row).</param>
    public PngWriter(int blockBytes = DefaultBlockBytes) => _blockBytes = blockBytes;

    // Reused from image to image (one writer per thread): one block of filtered rows and the compressed stream.
    private byte[] _filtered = [];
    private readonly MemoryStream _deflated = new(64 * 1024);

    /// <summary>One image, with a writer of its own.</summary>
    public static byte[] Encode(ReadOnlySpan<byte> pixels, int width, int height, PixelOrder order = PixelOrder.Rgba, bool opaque = false) =>
        new PngWriter().Write(pixels, width, height, order, opaque);

    /// <param name="pixels">Rows of width × 4 bytes in <paramref name="order"/>, top row first, no padding.</param>
    /// <param name="opaque">Write three bytes a pixel and drop the alpha byte, which the caller vouches is 255 everywhere.</param>
    public byte[] Write(ReadOnlySpan<byte> pixels, int width, int height, PixelOrder order = PixelOrder.Rgba, bool opaque = false,
        CompressionLevel level = CompressionLevel.Fastest)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(width);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(height);
        var inRow = checked(width * 4);
        if (pixels.Length != checked(inRow * height))
            throw new ArgumentException($"{width}×{height} 32-bit pixels need {inRow * height} bytes, got {pixels.Length}", nameof(pixels));
        var outRow = opaque ? checked(width * 3) : inRow;

        // Filtered scanlines: one filter-type byte, then the row minus the row above (the first row is unchanged),
        // in the output's byte order. A block holds whole rows, and 16 bytes more for the vector stores' overhang.
        var rowsPerBlock = Math.Clamp(_blockBytes / (outRow + 1), 1, height);
        var blockSize = rowsPerBlock * (outRow + 1) + 16;
        if (_filtered.Length < blockSize) _filtered = GC.AllocateUninitializedArray<byte>(blockSize);
        var filtered = _filtered;
        _deflated.SetLength(0);
        using (var zlib = new ZLibStream(_deflated, level, leaveOpen: true))
        {
            for (var y0 = 0; y0 < height; y0 += rowsPerBlock)
            {
                var rows = Math.Min(rowsPerBlock, height - y0);
                for (var r = 0; r < rows; r++)
                {
                    var y = y0 + r;
                    var o = r * (outRow + 1);
                    filtered[o] = 2;
                    var cur = pixels.Slice(y * inRow, inRow);
                    // The first row has no row above: the Up filter takes it as zeros.
                    var prev = y == 0 ? default : pixels.Slice((y - 1) * inRow, inRow);
                    FilterRow(cur, prev, filtered.AsSpan(o + 1, outRow + 16), order, opaque);
                }
                zlib.Write(filtered, 0, rows * (outRow + 1));
            }
        }
        var idat = _deflated.GetBuffer().AsSpan(0, (int)_deflated.Length);

        var png = new byte[Signature.Length + 3 * 12 + 13 + idat.Length];
        var at = 0;
        Signature.CopyTo(png); at += Signature.Length;
        Span<byte> header = stackalloc byte[13];
        BinaryPrimitives.WriteInt32BigEndian(header, width);
        BinaryPrimitives.WriteInt32BigEndian(header[4..], height);
        header[8] = 8;                   // bit depth
        header[9] = opaque ? (byte)2 : (byte)6; // colour type: truecolour, or truecolour with alpha
        header[10] = 0;                  // compression: deflate
        header[11] = 0;                  // filter method 0
        header[12] = 0;                  // no interlace
        at = Chunk(png, at, "IHDR"u8, header);
        at = Chunk(png, at, "IDAT"u8, idat);
        Chunk(png, at, "IEND"u8, []);
        return png;
    }

    // Byte shuffles for one 16-byte group (four pixels) after the subtraction: to R, G, B, A, or to R, G, B packed into
    // the first 12 bytes (the last four are overwritten by the next group or lie in the overhang).
    private static readonly Vector128<byte> BgraToRgba = Vector128.Create((byte)2, 1, 0, 3, 6, 5, 4, 7, 10, 9, 8, 11, 14, 13, 12, 15);
    private static readonly Vector128<byte> BgraToRgb = Vector128.Create((byte)2, 1, 0, 6, 5, 4, 10, 9, 8, 14, 13, 12, 0x80, 0x80, 0x80, 0x80);
    private static readonly Vector128<byte> RgbaToRgb = Vector128.Create((byte)0, 1, 2, 4, 5, 6, 8, 9, 10, 12, 13, 14, 0x80, 0x80, 0x80, 0x80);

    /// <summary>
    /// One Up-filtered row: <paramref name="cur"/> minus <paramref name="prev"/> (empty: zeros) byte by byte, reordered
    /// to the output's channels. <paramref name="dst"/> holds the output row and may be written up to 16 bytes past it.
    /// </summary>
    private static void FilterRow(ReadOnlySpan<byte> cur, ReadOnlySpan<byte> prev, Span<byte> dst, PixelOrder order, bool opaque)
    {
        var pixels = cur.Length / 4;
        var outBytes = opaque ? 3 : 4;
        var i = 0;
        var shuffle = (order, opaque) switch
        {
            (PixelOrder.Bgra, false) => BgraToRgba,
            (PixelOrder.Bgra, true) => BgraToRgb,
            (PixelOrder.Rgba, true) => RgbaToRgb,
            _ => default,
        };
        var copy = order == PixelOrder.Rgba && !opaque;
        if (Ssse3.IsSupported || copy && Vector128.IsHardwareAccelerated)
        {
            ref var c = ref MemoryMarshal.GetReference(cur);
            ref var d = ref MemoryMarshal.GetReference(dst);
            var none = prev.IsEmpty;
            ref var p = ref none ? ref c : ref MemoryMarshal.GetReference(prev);
            // Four pixels at a time; a packed output advances 12 bytes and stores 16, so stop where the store would
            // pass the 16 bytes of overhang.
            for (; i + 4 <= pixels; i += 4)
            {
                var v = Vector128.LoadUnsafe(ref c, (nuint)(4 * i));
                if (!none) v -= Vector128.LoadUnsafe(ref p, (nuint)(4 * i));
                if (!copy) v = Ssse3.Shuffle(v, shuffle);
                v.StoreUnsafe(ref d, (nuint)(outBytes * i));
            }
        }
        for (; i < pixels; i++)
        {
            int s = 4 * i, o = outBytes * i;
            byte b0 = cur[s], b1 = cur[s + 1], b2 = cur[s + 2], b3 = cur[s + 3];
            if (!prev.IsEmpty) { b0 -= prev[s]; b1 -= prev[s + 1]; b2 -= prev[s + 2]; b3 -= prev[s + 3]; }
            if (order == PixelOrder.Bgra) (b0, b2) = (b2, b0);
            dst[o] = b0; dst[o + 1] = b1; dst[o + 2] = b2;
            if (!opaque) dst[o + 3] = b3;
        }
    }

    /// <summary>Length, type, data and CRC of one chunk at <paramref name="at"/>; returns the offset after it.</summary>
    private static int Chunk(byte[] png, int at, ReadOnlySpan<byte> type, ReadOnlySpan<byte> data)
    {
        BinaryPrimitives.WriteInt32BigEndian(png.AsSpan(at), data.Length);
        type.CopyTo(png.AsSpan(at + 4));
        data.CopyTo(png.AsSpan(at + 8));
        var crc = Crc32.Update(0xFFFFFFFFu, png.AsSpan(at + 4, 4 + data.Length)) ^ 0xFFFFFFFFu;
        BinaryPrimitives.WriteUInt32BigEndian(png.AsSpan(at + 8 + data.Length), crc);
        return at + 12 + data.Length;
    }

    /// <summary>
    /// CRC-32 of the PNG specification (Annex D): reflected polynomial 0xEDB88320. Eight bytes per step from eight
    /// tables ("slicing by 8": the byte-wise table method of Annex D applied to eight bytes at once; common practice,
    /// no source), about six times faster than one byte per step on a plot's 50–100 kB.
    /// </summary>
    internal static class Crc32
    {
        private static readonly uint[] Table = Build();

        private static uint[] Build()
        {
            var t = new uint[8 * 256];
            for (uint n = 0; n < 256; n++)
            {
                var c = n;
                for (var k = 0; k < 8; k++) c = (c & 1) != 0 ? 0xEDB88320u ^ (c >> 1) : c >> 1;
                t[n] = c;
            }
            // Table k: the CRC of byte n followed by k zero bytes.
            for (var k = 1; k < 8; k++)
                for (var n = 0; n < 256; n++)
                    t[k * 256 + n] = t[(k - 1) * 256 + n] >> 8 ^ t[t[(k - 1) * 256 + n] & 0xFF];
            return t;
        }

        public static uint Update(uint crc, ReadOnlySpan<byte> data)
        {
            var t = Table.AsSpan();
            var i = 0;
            for (; i + 8 <= data.Length; i += 8)
            {
                var lo = BinaryPrimitives.ReadUInt32LittleEndian(data[i..]) ^ crc;
                var hi = BinaryPrimitives.ReadUInt32LittleEndian(data[(i + 4)..]);
                crc = t[7 * 256 + (int)(lo & 0xFF)] ^ t[6 * 256 + (int)(lo >> 8 & 0xFF)] ^ t[5 * 256 + (int)(lo >> 16 & 0xFF)] ^ t[4 * 256 + (int)(lo >> 24)]
                    ^ t[3 * 256 + (int)(hi & 0xFF)] ^ t[2 * 256 + (int)(hi >> 8 & 0xFF)] ^ t[256 + (int)(hi >> 16 & 0xFF)] ^ t[(int)(hi >> 24)];
            }
            for (; i < data.Length; i++) crc = t[(int)((crc ^ data[i]) & 0xFF)] ^ (crc >> 8);
            return crc;
        }
    }
}
