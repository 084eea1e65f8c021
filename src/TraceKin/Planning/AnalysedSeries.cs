using System.Text.Json;
using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Series;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Planning;

/// <summary>
/// An analysed series read back for planning: the runs the series fits used (initial rate, its standard error, starting
/// concentrations, temperature), refitted by the Series stage with the series' [model] settings so the planner starts
/// from exactly the findings the report shows. Read from summary.json (fields: docs/formats.md), or from a series folder
/// analysed in memory (nothing is written).
/// </summary>
public sealed record AnalysedSeries(string Name, IReadOnlyList<RunPoint> Runs, SeriesFindings Findings, ModelSettings Settings, Plan? Plan)
{
    /// <summary>summary.json as `analyse` writes it; settings from the series' series.toml when known, else the defaults.</summary>
    public static AnalysedSeries FromSummary(string path, ModelSettings? settings = null, Plan? plan = null)
    {
        var file = Path.GetFileName(path);
        JsonDocument doc;
        try { doc = JsonDocument.Parse(File.ReadAllBytes(path)); }
        catch (JsonException ex)
        {
            throw Fail.At(file, (int)(ex.LineNumber ?? 0) + 1, (int)(ex.BytePositionInLine ?? 0) + 1, "text that is not JSON", "summary.json as tracekin analyse writes it");
        }
        using (doc) return FromJson(doc.RootElement, file, settings ?? ModelSettings.Default, plan);
    }

    /// <summary>A series folder (plan.csv, series.toml, exports) analysed in memory.</summary>
    public static AnalysedSeries FromFolder(string folder)
    {
        var result = SeriesRunner.Analyse(folder, new AnalysisOptions { Retention = TraceRetention.None });
        if (result.Config is null || result.Plan is null)
        {
            var p = result.Rejected.FirstOrDefault();
            throw p is null ? Fail.At(folder, 1, 1, "a series folder that could not be read", "plan.csv and series.toml") : new InputException(p);
        }
        using var ms = new MemoryStream();
        SummaryJson.WriteTo(result, ms, plots: false);
        using var doc = JsonDocument.Parse(ms.ToArray());
        return FromJson(doc.RootElement, SummaryJson.FileName, result.Config.Model, result.Plan);
    }

    private static AnalysedSeries FromJson(JsonElement root, string file, ModelSettings settings, Plan? plan)
    {
        if (root.ValueKind != JsonValueKind.Object || !root.TryGetProperty("runs", out var runs) || runs.ValueKind != JsonValueKind.Array)
            throw Fail.Setting(file, "runs", "no runs array", "summary.json as tracekin analyse writes it (a \"runs\" array)");
        var name = root.TryGetProperty("series", out var s) && s.ValueKind == JsonValueKind.String ? s.GetString() ?? "" : "";
        var points = new List<RunPoint>();
        var i = 0;
        foreach (var r in runs.EnumerateArray())
        {
            var key = $"runs[{i++}]";
            var id = r.TryGetProperty("id", out var idEl) && idEl.ValueKind == JsonValueKind.String ? idEl.GetString()! : throw Fail.Setting(file, key + ".id", "no run id", "a run id");
            if (r.TryGetProperty("rateResolved", out var res) && res.ValueKind == JsonValueKind.False && !settings.UseUnresolved) continue;
            if (!r.TryGetProperty("initialRate", out var ir) || ir.ValueKind != JsonValueKind.Object) continue;
            var v = Number(ir, "value");
            var se = Number(ir, "stdError");
            if (!double.IsFinite(v)) continue;
            var conc = new Dictionary<string, double>(StringComparer.Ordinal);
            if (r.TryGetProperty("initialConcentrations", out var c) && c.ValueKind == JsonValueKind.Object)
                foreach (var kv in c.EnumerateObject())
                    if (kv.Value.ValueKind == JsonValueKind.Number) conc[kv.Name] = kv.Value.GetDouble();
            double? t = r.TryGetProperty("temperature", out var te) && te.ValueKind == JsonValueKind.Number ? te.GetDouble() : null;
            points.Add(new RunPoint(id, v, se, conc, t) { RateSystematicError = Math.Max(0, NumberOr(ir, "modelStdError", 0)) });
        }
        if (points.Count == 0)
            throw Fail.Setting(file, "runs", "no run with an initial rate the series fits used", "an analysed series with at least one usable run");
        if (!root.TryGetProperty("orders", out var orders) || orders.ValueKind != JsonValueKind.Array || orders.GetArrayLength() == 0)
            throw Fail.Setting(file, "orders", "no fitted orders", "a series whose power-law fit gave orders (see the series' warnings for why it did not)",
                "add runs that vary each species independently, analyse again, then plan");
        if (root.TryGetProperty("powerLaw", out var pl) && pl.ValueKind == JsonValueKind.Object && pl.TryGetProperty("fit", out var fit) &&
            fit.ValueKind == JsonValueKind.Object && fit.TryGetProperty("converged", out var conv) && conv.ValueKind == JsonValueKind.False)
            throw Fail.Setting(file, "powerLaw.fit.converged", "false", "a converged fit of the power law to plan from",
                "the orders shown are from the log-log line only; fix the series (see its warnings) before planning on it");

        var findings = OrderAnalysis.Analyse(points, settings);
        if (findings.PowerLawFit is not { HasUsableErrors: true })
            throw Fail.Setting(file, "powerLaw.fit", "a power-law fit that did not converge when refitted", "a converged fit of the power law to plan from");
        return new AnalysedSeries(name, points, findings, settings, plan);
    }

    private static double Number(JsonElement e, string name) =>
        e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.Number ? v.GetDouble() : double.NaN;

    private static double NumberOr(JsonElement e, string name, double fallback) =>
        e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.Number ? v.GetDouble() : fallback;
}
