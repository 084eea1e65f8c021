using OxyPlot;
using OxyPlot.SkiaSharp;
using SkiaSharp;

namespace TraceKin.Reports;

/// <summary>
/// Draws plot models to PNG bytes, reusing one pixel buffer and one Skia render context (with its typeface, font
/// and text-shaper caches) from plot to plot: a batch pays for them once per worker, not once per run.
/// Not thread-safe; use one per thread (<see cref="RunPlot"/> keeps one per worker).
/// </summary>
public sealed class PngRenderer : IDisposable
{
    /// <summary>
    /// For the drawing library's encoder (see <see cref="OwnEncoder"/>): PNG encoding is a large part of the cost of a
    /// plot. An opaque bitmap (RGB, no alpha channel: the background is
    /// opaque white anyway), the "Up" row filter only and zlib level 1 encode in about a sixth of the time of the
    /// library default (alpha, all five filters tried per row, level 6); level 1 files are about 3 % larger than
    /// level 3 ones and cost about 0.5 ms less each. The image is lossless either way (measured with
    /// `TraceKin.Bench render`, see bench/README.md).
    /// </summary>
    public const int DefaultZlibLevel = 1;

    private readonly SKBitmap _bitmap;
    private readonly PixelOrder _order;
    private readonly PngWriter _png = new();
    private readonly SkiaRenderContext _context;

    public int Width { get; }
    public int Height { get; }
    public int ZlibLevel { get; }

    public SKPngEncoderFilterFlags Filter { get; }

    // Text is drawn without the HarfBuzz shaper: plot labels are Latin, Greek and symbols (µ, ±, ·, ‡), which need no
    // shaping, and each label is measured several times per plot (about 0.3 ms a plot; bench/README.md).

    /// <summary>True when PNGs are written by <see cref="PngWriter"/> (the default); false uses the drawing library's encoder.</summary>
    public bool OwnEncoder { get; }

    public PngRenderer(int width = PlotStyle.Width, int height = PlotStyle.Height, int zlibLevel = DefaultZlibLevel, bool textShaping = false,
        SKPngEncoderFilterFlags filter = SKPngEncoderFilterFlags.Up, bool opaque = true, bool ownEncoder = true)
    {
        Width = width;
        Height = height;
        ZlibLevel = zlibLevel;
        Filter = filter;
        OwnEncoder = ownEncoder;
        // Our encoder takes the drawing library's native pixel order (B, G, R, A on little-endian machines), in which
        // it draws about twice as fast as into R, G, B, A (bench/README.md); the writer reorders while it filters.
        _order = SKImageInfo.PlatformColorType == SKColorType.Bgra8888 ? PixelOrder.Bgra : PixelOrder.Rgba;
        _bitmap = ownEncoder ? new SKBitmap(new SKImageInfo(width, height, _order == PixelOrder.Bgra ? SKColorType.Bgra8888 : SKColorType.Rgba8888, SKAlphaType.Opaque))
            : opaque ? new SKBitmap(new SKImageInfo(width, height, SKImageInfo.PlatformColorType, SKAlphaType.Opaque)) : new SKBitmap(width, height);
        _context = new SkiaRenderContext { RenderTarget = RenderTarget.PixelGraphic, DpiScale = 1, UseTextShaping = textShaping };
    }

    public byte[] Render(PlotModel model)
    {
        using (var canvas = new SKCanvas(_bitmap))
        {
            _context.SkCanvas = canvas;
            var m = (IPlotModel)model;
            m.Update(true);
            var bg = model.Background;
            // Every pixel starts opaque, and the plot draws over it (source-over), so it stays opaque: a see-through
            // background is laid over white.
            if (bg.A == 255) canvas.Clear(new SKColor(bg.R, bg.G, bg.B));
            else
            {
                canvas.Clear(SKColors.White);
                if (bg.A > 0) canvas.DrawColor(new SKColor(bg.R, bg.G, bg.B, bg.A), SKBlendMode.SrcOver);
            }
            m.Render(_context, new OxyRect(0, 0, Width, Height));
            canvas.Flush();
            _context.SkCanvas = null;
        }
        // The bitmap is opaque (the background is cleared to an opaque colour first): three bytes a pixel suffice.
        if (OwnEncoder) return _png.Write(_bitmap.GetPixelSpan(), Width, Height, _order, opaque: true);
        using var ms = new MemoryStream(64 * 1024);
        using (var pixmap = _bitmap.PeekPixels())
            pixmap.Encode(ms, new SKPngEncoderOptions(Filter, ZlibLevel));
        return ms.ToArray();
    }

    public void Dispose()
    {
        _context.Dispose();
        _bitmap.Dispose();
    }
}
