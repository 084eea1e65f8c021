using System.Text.Json;
using System.Text.RegularExpressions;
using SkiaSharp;
using TraceKin.Tests.Support;
using Xunit.Abstractions;

namespace TraceKin.Tests.Reports;

/// <summary>
/// The first screen of each demo report, as headless Chromium lays it out at 1000 × 900 CSS px: the rate-law line,
/// the orders table and, for the temperature demo, the line with Ea, ΔH‡ and ΔS‡ must end above the fold, and no
/// "needs attention" section may appear on a clean demo. A copy of the report gets a script that writes the layout
/// boxes of those elements into the page, which Chromium prints with --dump-dom; a screenshot of the same screen must
/// not be blank. (Robustness of the presentation; no source needed.)
/// </summary>
public sealed class FirstScreenTests(ITestOutputHelper output)
{
    private const int Width = 1000, Height = 900;

    [Theory]
    [InlineData("violet-complex-acid", false)]
    [InlineData("amber-ester-warmth", true)]
    public void The_first_screen_holds_the_rate_law_the_orders_and_the_temperature_dependence(string sample, bool temperatures)
    {
        var chromium = ReportBrowserTests.FindChromium();
        if (chromium is null)
        {
            Assert.True(Environment.GetEnvironmentVariable("CI") is null, "chromium is not installed; CI requires this check");
            output.WriteLine("chromium not found; first-screen check not run");
            return;
        }
        var outDir = RepoPaths.NewTempDir("tracekin-first-screen");
        try
        {
            AnalysedSample.Analyse(RepoPaths.Sample(sample), outDir, plots: true);
            var html = File.ReadAllText(Path.Combine(outDir, "report.html"));
            // A clean demo: the checks section is the all-clear one, with no problems listed.
            Assert.Contains("<section id=\"attention\" class=\"all-clear\">", html, StringComparison.Ordinal);
            Assert.DoesNotContain("Problems (", html, StringComparison.Ordinal);
            const string probe = """
                <script>
                window.addEventListener('load', () => {
                  const boxes = {};
                  for (const [name, sel] of [['law', '#rate-law'], ['orders', 'table.orders'], ['temperature', '#temperature-dependence']]) {
                    const e = document.querySelector(sel);
                    boxes[name] = e ? Math.round(e.getBoundingClientRect().bottom) : -1;
                  }
                  document.body.setAttribute('data-first-screen', JSON.stringify(boxes));
                });
                </script>
                """;
            var probed = Path.Combine(outDir, "probed.html");
            File.WriteAllText(probed, html.Replace("</body>", probe + "</body>", StringComparison.Ordinal));
            var dom = ReportBrowserTests.Run(chromium, outDir, "dom", [$"--window-size={Width},{Height}", "--virtual-time-budget=10000", "--dump-dom", new Uri(probed).AbsoluteUri]);
            var m = Regex.Match(dom, "data-first-screen=\"([^\"]*)\"");
            Assert.True(m.Success, "the layout probe did not run");
            var boxes = JsonSerializer.Deserialize<Dictionary<string, int>>(System.Net.WebUtility.HtmlDecode(m.Groups[1].Value))!;
            output.WriteLine($"{sample}: bottoms {string.Join(", ", boxes.Select(b => $"{b.Key} {b.Value}"))} (fold at {Height})");
            Assert.InRange(boxes["law"], 1, Height);
            Assert.InRange(boxes["orders"], 1, Height);
            if (temperatures) Assert.InRange(boxes["temperature"], 1, Height);

            var png = Path.Combine(outDir, "first-screen.png");
            ReportBrowserTests.Run(chromium, outDir, "png", ["--hide-scrollbars", $"--window-size={Width},{Height}", $"--screenshot={png}", new Uri(Path.Combine(outDir, "report.html")).AbsoluteUri]);
            using var shot = SKBitmap.Decode(png);
            long dark = 0;
            for (var y = 0; y < shot.Height; y++)
                for (var x = 0; x < shot.Width; x++)
                    if (shot.GetPixel(x, y).Red < 128) dark++;
            Assert.True(dark > 2000, $"the first screen is nearly blank ({dark} dark pixels)");
        }
        finally { Directory.Delete(outDir, recursive: true); }
    }
}
