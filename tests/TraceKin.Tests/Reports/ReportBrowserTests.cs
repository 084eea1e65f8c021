using TraceKin.Tests.Support;
using System.Diagnostics;
using System.Text.RegularExpressions;
using SkiaSharp;
using TraceKin.Reports;
using Xunit.Abstractions;

namespace TraceKin.Tests.Reports;

/// <summary>
/// Opens report.html in a real browser (Debian's headless chromium) with name resolution switched off, prints it to
/// PDF and takes a screenshot. When chromium is missing the test fails if CI is set, and otherwise ends early with a note.
/// </summary>
public sealed class ReportBrowserTests(AnalysedSample sample, ITestOutputHelper output) : IClassFixture<AnalysedSample>
{
    private static readonly string[] Flags =
    [
        "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
        "--disable-component-update", "--disable-sync", "--disable-extensions",
        // Every host name resolves to "not found", so a report that tried to fetch anything could not get it.
        "--host-resolver-rules=MAP * ~NOTFOUND",
    ];

    public static string? FindChromium()
    {
        var named = Environment.GetEnvironmentVariable("TRACEKIN_CHROMIUM");
        if (!string.IsNullOrEmpty(named)) return File.Exists(named) ? named : null;
        foreach (var dir in (Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries))
            foreach (var name in new[] { "chromium", "chromium-browser" })
            {
                var p = Path.Combine(dir, name);
                if (File.Exists(p)) return p;
            }
        return null;
    }

    [Fact]
    public void Chromium_prints_the_report_with_its_plots_and_without_network()
    {
        var chromium = FindChromium();
        if (chromium is null)
        {
            Assert.True(Environment.GetEnvironmentVariable("CI") is null,
                "chromium is not installed (apt-get install -y chromium), so report.html could not be checked in a browser; CI requires this check");
            output.WriteLine("chromium not found; browser check not run (set CI to make this a failure)");
            return;
        }
        var work = RepoPaths.NewTempDir("tracekin-browser");
        try
        {
            var url = new Uri(sample.ReportPath).AbsoluteUri;
            var pdf = Path.Combine(work, "report.pdf");
            var png = Path.Combine(work, "report.png");
            // The page is about 12000 CSS px tall at this width (order verdicts and notes above the plots), so one tall
            // screenshot of 16000 px holds every plot.
            var printing = Start(chromium, work, "pdf", ["--no-pdf-header-footer", $"--print-to-pdf={pdf}", url]);
            var shooting = Start(chromium, work, "png", ["--hide-scrollbars", "--window-size=1000,16000", $"--screenshot={png}", url]);
            Finish(printing);
            Finish(shooting);

            Assert.True(File.Exists(pdf), "chromium wrote no PDF");
            var bytes = File.ReadAllBytes(pdf);
            var pages = Regex.Matches(System.Text.Encoding.Latin1.GetString(bytes), @"/Type\s*/Page[^s]").Count;
            output.WriteLine($"PDF: {bytes.Length} bytes, {pages} pages");
            // 9 plots at up to half a page each plus the tables: measured 13 A4/Letter pages; allow layout drift.
            Assert.InRange(pages, 6, 30);
            // The nine embedded PNGs alone are several hundred kB; a PDF without them is a few tens of kB.
            var pngBytes = Directory.GetFiles(Path.Combine(sample.OutDir, "plots"), "*.png").Sum(f => new FileInfo(f).Length);
            Assert.True(bytes.Length > pngBytes / 2, $"PDF has {bytes.Length} bytes, less than half the {pngBytes} bytes of plots it should hold");

            using var shot = SKBitmap.Decode(png);
            Assert.NotNull(shot);
            long nonWhite = 0, fitRed = 0, dataBlue = 0;
            for (var y = 0; y < shot.Height; y++)
                for (var x = 0; x < shot.Width; x++)
                {
                    var c = shot.GetPixel(x, y);
                    if (c.Red < 245 || c.Green < 245 || c.Blue < 245) nonWhite++;
                    // Colours used only inside the plots (PlotStyle.Fit and PlotStyle.Data), never by the stylesheet.
                    if (Near(c, PlotStyle.Fit.R, PlotStyle.Fit.G, PlotStyle.Fit.B)) fitRed++;
                    if (Near(c, PlotStyle.Data.R, PlotStyle.Data.G, PlotStyle.Data.B)) dataBlue++;
                }
            output.WriteLine($"screenshot {shot.Width}×{shot.Height}: {nonWhite} non-white, {fitRed} fit-red, {dataBlue} data-blue pixels");
            Assert.True(nonWhite > shot.Width * (long)shot.Height / 50, "the screenshot is (nearly) blank");
            Assert.True(fitRed > 500, $"only {fitRed} pixels in the fit colour: the plots did not render");
            Assert.True(dataBlue > 2000, $"only {dataBlue} pixels in the data colour: the plots did not render");
        }
        finally { Directory.Delete(work, recursive: true); }
    }

    private static bool Near(SKColor c, byte r, byte g, byte b) =>
        Math.Abs(c.Red - r) <= 6 && Math.Abs(c.Green - g) <= 6 && Math.Abs(c.Blue - b) <= 6;

    /// <summary>Runs headless Chromium to the end with the test flags (no network) and returns what it printed.</summary>
    internal static string Run(string chromium, string work, string tag, string[] args)
    {
        var run = Start(chromium, work, tag, args);
        Finish(run);
        return run.Out.Result;
    }

    private static (Process P, Task<string> Out, Task<string> Err) Start(string chromium, string work, string tag, string[] args)
    {
        var psi = new ProcessStartInfo(chromium) { RedirectStandardError = true, RedirectStandardOutput = true, UseShellExecute = false };
        foreach (var f in Flags) psi.ArgumentList.Add(f);
        psi.ArgumentList.Add($"--user-data-dir={Path.Combine(work, "profile-" + tag)}");
        foreach (var a in args) psi.ArgumentList.Add(a);
        psi.Environment["DBUS_SESSION_BUS_ADDRESS"] = "disabled:";
        var p = Process.Start(psi)!;
        return (p, p.StandardOutput.ReadToEndAsync(), p.StandardError.ReadToEndAsync());
    }

    private static void Finish((Process P, Task<string> Out, Task<string> Err) run)
    {
        using var p = run.P;
        if (!p.WaitForExit(TimeSpan.FromSeconds(120)))
        {
            p.Kill(entireProcessTree: true);
            Assert.Fail("chromium did not finish within 120 s");
        }
        Assert.True(p.ExitCode == 0, $"chromium exited {p.ExitCode}: {run.Err.Result}");
        // What it printed is read to the end before the process is released.
        Assert.True(run.Out.Wait(TimeSpan.FromSeconds(30)), "chromium's output did not close");
    }
}
