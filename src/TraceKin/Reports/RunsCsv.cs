using System.Globalization;
using System.Text;
using TraceKin.Analysis;

namespace TraceKin.Reports;

/// <summary>
/// runs.csv: one row per analysed run, comma-separated, decimal point, RFC 4180 quoting. Text cells that a spreadsheet
/// would run as a formula (starting with = + - @, tab or CR) are prefixed with an apostrophe (OWASP, "CSV Injection");
/// numeric cells are plain numbers written by TraceKin itself.
/// </summary>
public sealed class RunsCsv : ISeriesReportWriter
{
    public const string FileName = "runs.csv";

    public void Write(SeriesResult result, string outDir) =>
        AtomicFile.WriteAllText(Path.Combine(outDir, FileName), ToText(result), root: outDir);

    public static string ToText(SeriesResult r)
    {
        var ci = CultureInfo.InvariantCulture;
        var species = r.Plan?.Species ?? [];
        var extra = r.Plan?.Rows.SelectMany(x => x.Extra.Keys).Distinct().ToList() ?? [];
        var sb = new StringBuilder();
        var header = new List<string> { "run", "file", "temperature (K)" };
        header.AddRange(species.Select(s => $"[{s}]0 (mol/L)"));
        header.AddRange(extra);
        header.AddRange(["initial rate (mol/(L·s))", "std error (mol/(L·s))", "dof", "method", "window start (s)", "window end (s)", "k per run", "k per run std error", "warnings"]);
        sb.AppendLine(string.Join(",", header.Select(Text)));
        var perRunK = r.Findings?.PerRunK.ToDictionary(k => k.RunId) ?? [];
        foreach (var run in r.Runs)
        {
            var cells = new List<string> { Text(run.Id), Text(run.File), Num(run.Plan.TemperatureK) };
            cells.AddRange(species.Select(s => Num(run.Plan.InitialConcentrations.TryGetValue(s, out var c) ? c : null)));
            cells.AddRange(extra.Select(e => Text(run.Plan.Extra.GetValueOrDefault(e, ""))));
            var h = run.Rates.Headline;
            var k = perRunK.GetValueOrDefault(run.Id);
            cells.AddRange([Num(h.Value), Num(h.StdError), h.Dof.ToString(ci), Text(h.Method), Num(h.WindowStart), Num(h.WindowEnd),
                Num(k?.Value), Num(k?.StdError), Text(string.Join("; ", run.Warnings.Select(w => w.Message)))]);
            sb.AppendLine(string.Join(",", cells));
        }
        return sb.ToString();
    }

    private static string Num(double? v) => v is { } d && double.IsFinite(d) ? d.ToString("R", CultureInfo.InvariantCulture) : "";

    /// <summary>A text cell: neutralised against formula injection, then quoted when it holds a comma, quote or line break.</summary>
    public static string Text(string s)
    {
        if (s.Length > 0 && s[0] is '=' or '+' or '-' or '@' or '\t' or '\r') s = "'" + s;
        return s.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
    }
}
