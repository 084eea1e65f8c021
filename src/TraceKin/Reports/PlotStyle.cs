using OxyPlot;

namespace TraceKin.Reports;

/// <summary>TraceKin's own plot look: one font, a small palette, PNG export at a fixed size.</summary>
public static class PlotStyle
{
    /// <summary>Bundled with Debian's fonts-dejavu-core; without an installed font the Skia build drops all text silently.</summary>
    public const string Font = "DejaVu Sans";
    public static readonly OxyColor Data = OxyColor.FromRgb(0x4C, 0x6A, 0x92);
    public static readonly OxyColor Fit = OxyColor.FromRgb(0xD1, 0x49, 0x5B);
    public static readonly OxyColor Tangent = OxyColor.FromRgb(0x2E, 0x2E, 0x2E);
    public static readonly OxyColor Window = OxyColor.FromAColor(50, OxyColor.FromRgb(0xED, 0xAE, 0x49));
    public static readonly OxyColor Band = OxyColor.FromAColor(45, OxyColor.FromRgb(0x4C, 0x6A, 0x92));
    public static readonly OxyColor Grid = OxyColor.FromRgb(0xE6, 0xE6, 0xE6);
    public static readonly OxyColor[] Laws =
    [
        OxyColor.FromRgb(0xD1, 0x49, 0x5B), OxyColor.FromRgb(0x00, 0x79, 0x8C), OxyColor.FromRgb(0x66, 0xA1, 0x82),
        OxyColor.FromRgb(0x8D, 0x6A, 0x9F), OxyColor.FromRgb(0xC9, 0x8B, 0x2B), OxyColor.FromRgb(0x5E, 0x5E, 0x5E),
    ];

    public static PlotModel NewModel(string title) => new()
    {
        Title = title,
        DefaultFont = Font,
        DefaultFontSize = 12,
        TitleFontSize = 14,
        TitleFontWeight = OxyPlot.FontWeights.Normal,
        PlotAreaBorderColor = OxyColor.FromRgb(0x99, 0x99, 0x99),
        Background = OxyColors.White,
        // Axis numbers with a decimal point whatever the machine's culture (OxyPlot otherwise uses the current one).
        Culture = System.Globalization.CultureInfo.InvariantCulture,
    };

    public const int Width = 900;
    public const int Height = 650;

    /// <summary>One plot to PNG. For many plots keep a <see cref="PngRenderer"/> per thread instead (RunPlot does).</summary>
    public static byte[] ToPng(PlotModel model, int width = Width, int height = Height)
    {
        using var renderer = new PngRenderer(width, height);
        return renderer.Render(model);
    }
}
