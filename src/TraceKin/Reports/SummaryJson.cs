using static TraceKin.Reports.JsonNumbers;
using System.Text.Json;
using TraceKin.Analysis;
using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Reports;

/// <summary>
/// summary.json: the machine-readable results, with stable field names (documented in docs/formats.md and
/// docs/summary.schema.json). Numbers are written round-trip exact; a number that is not finite is written as null.
/// No time stamps, so the same inputs give the same bytes.
/// </summary>
/// <param name="plots">Whether the run plots are drawn: each run's <c>plotFile</c> names its picture, or is null.</param>
public sealed class SummaryJson(bool plots = true) : ISeriesReportWriter
{
    public const string FileName = "summary.json";

    public IReadOnlyList<string> Files => [FileName];

    public void Write(SeriesResult result, string outDir) =>
        AtomicFile.Write(Path.Combine(outDir, FileName), s => WriteTo(result, s, plots), root: outDir);

    /// <summary>
    /// How rates and k are defined: rate = (1/ν)·d[X]/dt for the followed species X with coefficient ν, the rate of
    /// reaction (IUPAC Gold Book, "rate of reaction", doi:10.1351/goldbook.R05156). When |ν| ≠ 1 the headline k is also
    /// given for the convention that uses X's own rate of change, |d[X]/dt| = |ν|·k·Π[X]^n, labelled with it.
    /// </summary>
    private static void RateConvention(Utf8JsonWriter w, SeriesResult r)
    {
        if (r.Config?.Signal is not { } s) { w.WriteNull("rateConvention"); return; }
        w.WriteStartObject("rateConvention");
        w.WriteString("species", s.Species);
        Num(w, "coefficient", s.Coefficient);
        w.WriteString("rate", $"(1/ν)·d[{s.Species}]/dt");
        var nu = Math.Abs(s.Coefficient);
        if (nu != 1 && r.Findings?.RateConstant is { } k)
        {
            w.WriteStartObject("rateConstantForSpeciesRate");
            w.WriteString("convention", s.Coefficient < 0 ? $"rate = −d[{s.Species}]/dt" : $"rate = d[{s.Species}]/dt");
            Num(w, "factor", nu);
            Num(w, "value", nu * k.Value);
            Num(w, "stdError", nu * k.StdError);
            w.WriteString("unit", k.Unit);
            Pair(w, "ci95", nu * k.Ci95Low, nu * k.Ci95High);
            w.WriteEndObject();
        }
        else w.WriteNull("rateConstantForSpeciesRate");
        w.WriteEndObject();
    }

    public static void WriteTo(SeriesResult r, Stream stream, bool plots = true)
    {
        var names = r.Plan is { } plan ? RunFileNames.For(plan) : RunFileNames.For(r.Runs.Select(x => x.Id));
        // The structure is fixed by this code (and checked against the schema by the tests), so the writer's own
        // per-token validation is skipped: it is a fifth of the time of a large summary.
        using var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true, SkipValidation = true });
        w.WriteStartObject();
        w.WriteString("tool", "TraceKin");
        w.WriteString("toolVersion", r.ToolVersion);
        w.WriteString("series", r.Name);
        w.WriteStartArray("runs");
        foreach (var run in r.Runs)
        {
            Spill(w);
            w.WriteStartObject();
            w.WriteString("id", run.Id);
            w.WriteString("file", run.File);
            w.WriteString("sha256", run.InputSha256);
            if (plots) w.WriteString("plotFile", "plots/" + names.PlotFile(run.Id));
            else w.WriteNull("plotFile");
            Num(w, "temperature", run.Plan.TemperatureK);
            w.WriteStartObject("initialConcentrations");
            foreach (var (sp, c) in run.Plan.InitialConcentrations.OrderBy(kv => kv.Key, StringComparer.Ordinal)) Num(w, sp, c);
            w.WriteEndObject();
            var h = run.Rates.Headline;
            w.WritePropertyName("initialRate");
            var relSys = run.Converted.RelativeSystematicUncertainty;
            InitialRate(w, h, relSys);
            // Each run's headline only: every estimator and every law's fit are in the per-run tables (RunTables), so
            // summary.json stays about a kilobyte per run however many runs and laws there are.
            if (run.Rates.Fits.FirstOrDefault(f => f.Chosen) is { } chosen)
            {
                w.WriteStartObject("chosenLaw");
                w.WriteString("model", chosen.Law);
                w.WriteBoolean("drift", chosen.Drift);
                w.WriteBoolean("converged", chosen.Fit.Converged);
                Num(w, "akaikeWeight", chosen.AkaikeWeight);
                w.WriteStartObject("rateConstant");
                Num(w, "value", chosen.RateConstant);
                Num(w, "stdError", chosen.RateConstantStdError);
                w.WriteString("unit", chosen.RateConstantUnit);
                Pair(w, "ci95", chosen.Ci95Low, chosen.Ci95High);
                w.WriteEndObject();
                Num(w, "halfLife", chosen.HalfLife);
                Num(w, "halfLifeStdError", chosen.HalfLifeStdError);
                w.WriteBoolean("lackOfFit", chosen.LackOfFit);
                w.WriteEndObject();
            }
            else w.WriteNull("chosenLaw");
            w.WriteString("headlineRule", run.Rates.HeadlineRule);
            w.WriteBoolean("rateResolved", run.Rates.IsResolved);
            if (run.Rates.Unresolved is { } why) w.WriteString("unresolvedBecause", why);
            else w.WriteNull("unresolvedBecause");
            Num(w, "deadTime", run.Rates.DeadTime);
            w.WriteBoolean("noIntegerLawFits", run.Rates.NoIntegerLawFits);
            w.WriteNumber("spikeCount", run.Rates.Spikes.Count);
            Num(w, "systematicRelativeUncertainty", run.Converted.RelativeSystematicUncertainty);
            Warnings(w, run.Warnings);
            w.WriteEndObject();
        }
        w.WriteEndArray();

        var f0 = r.Findings;
        Orders(w, "orders", f0?.Orders ?? []);
        if (f0?.RateConstant is { } k)
        {
            w.WriteStartObject("rateConstant");
            EstimateFields(w, k.Value, k.StdError, k.Unit, k.Dof, k.Ci95Low, k.Ci95High, k.Method);
            Num(w, "lawChoiceStdError", k.LawChoiceStdError);
            // k = v0/Π[X]0^n scales with the followed species' concentration scale; the runs share its constants,
            // so the relative systematic uncertainty carries over whole (common practice, no source).
            Num(w, "systematicRelativeUncertainty", r.Runs.Count == 0 ? null : r.Runs.Max(x => x.Converted.RelativeSystematicUncertainty));
            w.WriteEndObject();
        }
        else w.WriteNull("rateConstant");
        w.WriteStartArray("rateConstantPerRun");
        foreach (var pk in f0?.PerRunK ?? [])
        {
            w.WriteStartObject();
            w.WriteString("run", pk.RunId);
            Num(w, "value", pk.Value);
            Num(w, "stdError", pk.StdError);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        RateConvention(w, r);
        w.WriteStartArray("pairRatios");
        foreach (var p in f0?.PairRatios ?? [])
        {
            Spill(w);
            w.WriteStartObject();
            w.WriteString("runA", p.RunA);
            w.WriteString("runB", p.RunB);
            w.WriteString("species", p.Species);
            Num(w, "concentrationRatio", p.ConcentrationRatio);
            Num(w, "rateRatio", p.RateRatio);
            Num(w, "order", p.Order);
            Num(w, "stdError", p.StdError);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        SeriesModelsJson.Write(w, f0);
        if (r.Replicates.Count > 0) Replicates(w, r);
        w.WriteStartArray("rejected");
        foreach (var p in r.Rejected)
        {
            w.WriteStartObject();
            w.WriteString("file", p.File);
            w.WriteNumber("line", p.Line);
            w.WriteNumber("column", p.Column);
            if (p.Key is not null) w.WriteString("key", p.Key);
            if (p.Input is not null) w.WriteString("input", p.Input);
            w.WriteString("found", p.Found);
            w.WriteString("expected", p.Expected);
            w.WriteString("hint", p.Hint);
            w.WriteString("message", p.Message);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        Warnings(w, r.Warnings.Concat(f0?.Warnings ?? []).ToList());
        w.WriteEndObject();
    }

    /// <summary>Hands what is buffered to the stream now and then, so a big series never sits whole in memory.</summary>
    private static void Spill(Utf8JsonWriter w)
    {
        if (w.BytesPending > 1 << 16) w.Flush();
    }

    /// <summary>
    /// An initial rate. Its systematic uncertainty is the concentration scale's relative uncertainty (rates scale with it),
    /// written beside the statistical standard error, never combined with it (JCGM 100:2008 keeps the components listed).
    /// </summary>
    private static void InitialRate(Utf8JsonWriter w, Rates.InitialRate h, double relativeSystematic)
    {
        w.WriteStartObject();
        Num(w, "value", h.Value);
        Num(w, "stdError", h.StdError);
        w.WriteNumber("dof", h.Dof);
        w.WriteString("unit", h.Unit);
        w.WriteString("method", h.Method);
        Num(w, "windowStart", h.WindowStart);
        Num(w, "windowEnd", h.WindowEnd);
        w.WriteNumber("points", h.PointsUsed);
        Num(w, "systematicStdError", Math.Abs(h.Value) * relativeSystematic);
        Num(w, "modelStdError", h.ModelStdError);
        w.WriteEndObject();
    }

    /// <summary>Replicate groups (runs planned alike): their rates' spread beside the fits' standard errors; written only when there are some.</summary>
    private static void Replicates(Utf8JsonWriter w, SeriesResult r)
    {
        w.WriteStartArray("replicates");
        foreach (var g in r.Replicates)
        {
            w.WriteStartObject();
            w.WriteStartArray("runs");
            foreach (var id in g.Runs) w.WriteStringValue(id);
            w.WriteEndArray();
            w.WriteString("conditions", g.Conditions());
            Num(w, "meanRate", g.Mean);
            Num(w, "stdDev", g.StdDev);
            Num(w, "meanStdError", g.MeanStdError);
            w.WriteString("unit", r.Runs.FirstOrDefault()?.Rates.Headline.Unit ?? Units.RateUnit);
            w.WriteStartArray("outliers");
            foreach (var (id, score) in g.Outliers)
            {
                w.WriteStartObject();
                w.WriteString("run", id);
                Num(w, "score", score);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteEndObject();
        }
        w.WriteEndArray();
    }

    private static void Warnings(Utf8JsonWriter w, IReadOnlyList<Warning> warnings)
    {
        w.WriteStartArray("warnings");
        foreach (var x in warnings)
        {
            w.WriteStartObject();
            w.WriteString("code", x.Code);
            w.WriteString("where", x.Where);
            w.WriteString("message", x.Message);
            w.WriteEndObject();
        }
        w.WriteEndArray();
    }
}
