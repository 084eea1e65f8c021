using OxyPlot;
using OxyPlot.Axes;
using OxyPlot.Series;
using SkiaSharp;
using TraceKin.Reports;

namespace TraceKin.Tests.Reports;

/// <summary>
/// Our PNG writer against a general-purpose reference decoder (SkiaSharp's, i.e. libpng-compatible decoding): every
/// pixel must come back unchanged, in either input byte order and either output colour type, and the CRC-32 must give
/// the standard check value.
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

    [Fact]
    public void Crc32_eight_bytes_at_a_time_matches_the_bit_by_bit_definition()
    {
        // The CRC as the PNG specification defines it (§5.5: x^32 + x^26 + ... + 1, reflected, one bit at a time), against
        // the table-driven eight-bytes-a-step version, on every length from 0 to 70 (all tails) and on a split update.
        var rng = new Random(5);
        var data = new byte[70];
        rng.NextBytes(data);
        for (var n = 0; n <= data.Length; n++)
        {
            var span = data.AsSpan(0, n);
            Assert.Equal(BitwiseCrc(span), PngWriter.Crc32.Update(0xFFFFFFFFu, span) ^ 0xFFFFFFFFu);
        }
        var split = PngWriter.Crc32.Update(PngWriter.Crc32.Update(0xFFFFFFFFu, data.AsSpan(0, 13)), data.AsSpan(13)) ^ 0xFFFFFFFFu;
        Assert.Equal(BitwiseCrc(data), split);
    }

    private static uint BitwiseCrc(ReadOnlySpan<byte> data)
    {
        var c = 0xFFFFFFFFu;
        foreach (var b in data)
        {
            c ^= b;
            for (var k = 0; k < 8; k++) c = (c & 1) != 0 ? 0xEDB88320u ^ (c >> 1) : c >> 1;
        }
        return c ^ 0xFFFFFFFFu;
    }

    [Theory]
    [InlineData(1, 1, false, false)]
    [InlineData(7, 5, false, false)]
    [InlineData(900, 650, false, false)]
    [InlineData(1, 1, true, true)]
    [InlineData(3, 2, true, true)]
    [InlineData(7, 5, true, true)]
    [InlineData(7, 5, true, false)]
    [InlineData(7, 5, false, true)]
    [InlineData(900, 650, true, true)]
    [InlineData(901, 31, false, true)]
    [InlineData(20_000, 3, true, true)]
    [InlineData(900, 650, true, true, 100_000)] // the rows given to the compressor in blocks
    [InlineData(300, 7, false, false, 1_000)]  // a row longer than one block
    public void Written_png_decodes_to_the_same_pixels(int width, int height, bool bgra, bool opaque, int blockBytes = 16 << 20)
    {
        var order = bgra ? PixelOrder.Bgra : PixelOrder.Rgba;
        var rng = new Random(width * 31 + height);
        var pixels = new byte[width * height * 4];
        for (var i = 0; i < pixels.Length; i += 4)
        {
            // Plot-like content: mostly white with runs of colour, and some noise; opaque unless the alpha is kept.
            var noisy = rng.NextDouble() < 0.1;
            pixels[i] = noisy ? (byte)rng.Next(256) : (byte)255;
            pixels[i + 1] = noisy ? (byte)rng.Next(256) : (byte)255;
            pixels[i + 2] = noisy ? (byte)rng.Next(256) : (byte)(i / 4 % width < width / 2 ? 255 : 40);
            pixels[i + 3] = opaque || !noisy ? (byte)255 : (byte)rng.Next(256);
        }
        var writer = new PngWriter(blockBytes);
        var png = writer.Write(pixels, width, height, order, opaque);
        Assert.Equal(png, writer.Write(pixels, width, height, order, opaque)); // reused buffers give the same file
        Assert.Equal(opaque ? 2 : 6, png[8 + 8 + 9]); // IHDR colour type: truecolour, or truecolour with alpha
        // Decoded without premultiplying, so that a see-through pixel keeps its colour and can be compared exactly.
        using var codec = SKCodec.Create(new MemoryStream(png));
        Assert.NotNull(codec);
        Assert.Equal((width, height), (codec.Info.Width, codec.Info.Height));
        using var decoded = new SKBitmap(new SKImageInfo(width, height, SKColorType.Rgba8888, SKAlphaType.Unpremul));
        Assert.Equal(SKCodecResult.Success, codec.GetPixels(decoded.Info, decoded.GetPixels()));
        var got = decoded.GetPixelSpan();
        var (r, b) = order == PixelOrder.Rgba ? (0, 2) : (2, 0);
        for (var o = 0; o < pixels.Length; o += 4)
            Assert.Equal((pixels[o + r], pixels[o + 1], pixels[o + b], pixels[o + 3]), (got[o], got[o + 1], got[o + 2], got[o + 3]));
    }

    [Fact]
    public void Rendered_plot_decodes_to_the_pixels_the_drawing_librarys_own_encoder_writes()
    {
        // The same model through our writer and through SkiaSharp's PNG encoder (libpng's format, a reference outside
        // this project): decoded, the two images must agree pixel for pixel.
        var model = PlotStyle.NewModel("round trip — µmol/L ± 0.1");
        model.Axes.Add(new LinearAxis { Position = AxisPosition.Bottom, Title = "time (s)" });
        model.Axes.Add(new LinearAxis { Position = AxisPosition.Left, Title = "[A] (mmol/L)" });
        var line = new LineSeries { Title = "curve", Color = PlotStyle.Fit, StrokeThickness = 2 };
        for (var i = 0; i < 200; i++) line.Points.Add(new DataPoint(i, Math.Exp(-i / 60.0)));
        model.Series.Add(line);
        using var ours = new PngRenderer();
        using var library = new PngRenderer(ownEncoder: false);
        using var a = SKBitmap.Decode(ours.Render(model));
        using var b = SKBitmap.Decode(library.Render(model));
        Assert.Equal((PlotStyle.Width, PlotStyle.Height), (a.Width, a.Height));
        Assert.Equal((b.Width, b.Height), (a.Width, a.Height));
        var pa = a.Pixels;
        var pb = b.Pixels;
        Assert.Contains(pa, c => c != SKColors.White); // something was drawn
        for (var i = 0; i < pa.Length; i++) Assert.Equal(pb[i], pa[i]);
    }

    [Fact]
    public void Wrong_buffer_size_is_refused()
    {
        Assert.Throws<ArgumentException>(() => PngWriter.Encode(new byte[10], 2, 2));
    }
}
