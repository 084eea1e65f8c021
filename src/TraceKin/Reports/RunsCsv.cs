using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>
/// runs.csv: one row per analysed run, written with <see cref="CsvTable"/> (CsvHelper): comma-separated, decimal
/// point, RFC 4180 quoting, or semicolons and decimal commas in <see cref="CsvStyle.DecimalComma"/>. Text cells that
/// a spreadsheet would run as a formula are prefixed with an apostrophe; numeric cells are plain round-trip numbers.
/// </summary>
public sealed class RunsCsv(CsvStyle style = CsvStyle.Standard) : ISeriesReportWriter
{
    public const string FileName = "runs.csv";

    public IReadOnlyList<string> Files => [FileName];

    public void Write(SeriesResult result, string outDir) =>
        AtomicFile.Write(Path.Combine(outDir, FileName), s => WriteTo(result, s, style), root: outDir);

    public static string ToText(SeriesResult r, CsvStyle style = CsvStyle.Standard)
    {
        using var ms = new MemoryStream();
        WriteTo(r, ms, style);
        return new System.Text.UTF8Encoding(false).GetString(ms.ToArray());
    }

    public static void WriteTo(SeriesResult r, Stream stream, CsvStyle style = CsvStyle.Standard)
    {
        var species = r.Plan?.Species ?? [];
        var extra = r.Plan?.Rows.SelectMany(x => x.Extra.Keys).Distinct().ToList() ?? [];
        using var csv = new CsvTable(stream, style, leaveOpen: true);
        var header = new List<string> { "run", "file", "temperature (K)" };
        header.AddRange(species.Select(s => $"[{s}]0 (mol/L)"));
        header.AddRange(extra);
        header.AddRange(["initial rate (mol/(L·s))", "std error (mol/(L·s))", "dof", "method", "window start (s)", "window end (s)", "k per run", "k per run std error", "warnings"]);
        foreach (var h in header) csv.Text(h);
        csv.EndRow();
        var perRunK = r.Findings?.PerRunK.ToDictionary(k => k.RunId) ?? [];
        foreach (var run in r.Runs)
        {
            csv.Text(run.Id).Text(run.File).Number(run.Plan.TemperatureK);
            foreach (var s in species) csv.Number(run.Plan.InitialConcentrations.TryGetValue(s, out var c) ? c : null);
            foreach (var e in extra) csv.Text(run.Plan.Extra.GetValueOrDefault(e, ""));
            var h = run.Rates.Headline;
            var k = perRunK.GetValueOrDefault(run.Id);
            csv.Number(h.Value).Number(h.StdError).Integer(h.Dof).Text(h.Method).Number(h.WindowStart).Number(h.WindowEnd)
                .Number(k?.Value).Number(k?.StdError).Text(string.Join("; ", run.Warnings.Select(w => w.Message)));
            csv.EndRow();
        }
    }
}
