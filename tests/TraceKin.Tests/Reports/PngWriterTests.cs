using SkiaSharp;
using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

/// <summary>
/// Our PNG writer against a general-purpose reference decoder (SkiaSharp's, i.e. libpng-compatible decoding): every
/// pixel must come back unchanged, and the CRC-32 must give the standard check value.
/// </summary>
public sealed class PngWriterTests
{
    [Fact]
    public void Crc32_of_the_nine_digit_check_string_is_the_standard_check_value()
    {
        // CRC-32 (reflected 0xEDB88320) of ASCII "123456789" is 0xCBF43926 (Williams 1993, "A Painless Guide to CRC
        // Error Detection Algorithms", check value; from memory). The IEND chunk's CRC is AE 42 60 82 (PNG spec, from memory).
        Assert.Equal(0xCBF43926u, PngWriter.Crc32.Update(0xFFFFFFFFu, "123456789"u8) ^ 0xFFFFFFFFu);
        Assert.Equal(0xAE426082u, PngWriter.Crc32.Update(0xFFFFFFFFu, "IEND"u8) ^ 0xFFFFFFFFu);
    }

    [Theory]
    [InlineData(1, 1)]
    [InlineData(7, 5)]
    [InlineData(900, 650)]
    public void Written_png_decodes_to_the_same_pixels(int width, int height)
    {
        var rng = new Random(width * 31 + height);
        var rgba = new byte[width * height * 4];
        for (var i = 0; i < rgba.Length; i += 4)
        {
            // Plot-like content: mostly white with runs of colour, and some noise; opaque.
            var noisy = rng.NextDouble() < 0.1;
            rgba[i] = noisy ? (byte)rng.Next(256) : (byte)255;
            rgba[i + 1] = noisy ? (byte)rng.Next(256) : (byte)255;
            rgba[i + 2] = noisy ? (byte)rng.Next(256) : (byte)(i / 4 % width < width / 2 ? 255 : 40);
            rgba[i + 3] = 255;
        }
        var writer = new PngWriter();
        var png = writer.Write(rgba, width, height);
        Assert.Equal(png, writer.Write(rgba, width, height)); // reused buffers give the same file
        using var decoded = SKBitmap.Decode(png);
        Assert.NotNull(decoded);
        Assert.Equal(width, decoded.Width);
        Assert.Equal(height, decoded.Height);
        for (var y = 0; y < height; y++)
            for (var x = 0; x < width; x++)
            {
                var c = decoded.GetPixel(x, y);
                var o = (y * width + x) * 4;
                Assert.Equal((rgba[o], rgba[o + 1], rgba[o + 2], rgba[o + 3]), (c.Red, c.Green, c.Blue, c.Alpha));
            }
    }

    [Fact]
    public void Wrong_buffer_size_is_refused()
    {
        Assert.Throws<ArgumentException>(() => PngWriter.Encode(new byte[10], 2, 2));
    }
}
