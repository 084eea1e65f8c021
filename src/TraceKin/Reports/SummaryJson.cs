using System.Text.Json;
using TraceKin.Analysis;
using TraceKin.Traces;

namespace TraceKin.Reports;

/// <summary>
/// summary.json: the machine-readable results, with stable field names (documented in docs/formats.md and
/// docs/summary.schema.json), serialised from the records of SummaryRecords.cs (SummaryJsonContext). Numbers are
/// written round-trip exact; a number that is not finite is written as null; text as itself in UTF-8, escaped only
/// where JSON needs it or a reader would not see it (SummaryTextEncoder). No time stamps, so the same inputs give the
/// same bytes.
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
    private static RateConventionRecord? RateConvention(SeriesResult r)
    {
        if (r.Config?.Signal is not { } s) return null;
        var nu = Math.Abs(s.Coefficient);
        var forSpecies = nu != 1 && r.Findings?.RateConstant is { } k
            ? new SpeciesRateConstantRecord(
                s.Coefficient < 0 ? $"rate = −d[{s.Species}]/dt" : $"rate = d[{s.Species}]/dt",
                nu, nu * k.Value, nu * k.StdError, k.Unit, [nu * k.Ci95Low, nu * k.Ci95High])
            : null;
        return new RateConventionRecord(s.Species, s.Coefficient, $"(1/ν)·d[{s.Species}]/dt", forSpecies);
    }

    public static void WriteTo(SeriesResult r, Stream stream, bool plots = true) =>
        JsonSerializer.Serialize(stream, Record(r, plots), SummaryJsonContext.Writer.SummaryRecord);

    /// <summary>
    /// How many pairs of runs summary.json and report.html list (the first in plan order); every listed pair is in
    /// pair-ratios.csv (<see cref="PairRatiosCsv"/>), and the total count is given beside them.
    /// </summary>
    public const int ListedPairRatios = 20;

    /// <summary>summary.json as records. Runs are mapped as they are written, so a big series is never held twice.</summary>
    internal static SummaryRecord Record(SeriesResult r, bool plots = true)
    {
        // The plot files' names only when there are plots: at 20,000 runs the table of names is a few megabytes.
        var names = !plots ? null : r.Plan is { } plan ? RunFileNames.For(plan) : RunFileNames.For(r.Runs.Select(x => x.Id));
        var f0 = r.Findings;
        var k = f0?.RateConstant;
        return new SummaryRecord(
            Tool: "TraceKin",
            ToolVersion: r.ToolVersion,
            Series: r.Name,
            // rates.laws: the integrated laws every run was restricted to (absent when every law competed).
            ImposedLaws: r.Config?.Rates.Laws,
            Runs: r.Runs.Select(run => Run(run, names is null ? null : "plots/" + names.PlotFile(run.Id))),
            Orders: SeriesModelsJson.Orders(f0?.Orders ?? []),
            RateConstant: k is null ? null : new HeadlineRateConstantRecord(k.Value, k.StdError, k.Unit, k.Dof, [k.Ci95Low, k.Ci95High], k.Method,
                k.LawChoiceStdError,
                // k = v0/Π[X]0^n scales with the followed species' concentration scale; the runs share its constants,
                // so the relative systematic uncertainty carries over whole (common practice, no source).
                r.Runs.Count == 0 ? null : r.Runs.Max(x => x.Converted.RelativeSystematicUncertainty)),
            RateConstantPerRun: (f0?.PerRunK ?? []).Select(pk => new PerRunRateConstantRecord(pk.RunId, pk.Value, pk.StdError)).ToList(),
            RateConvention: RateConvention(r),
            PairRatioCount: f0?.PairCount ?? 0,
            PairRatioTable: PairRatiosCsv.FileName,
            PairRatiosFirst: (f0?.PairRatios ?? []).Take(ListedPairRatios)
                .Select(p => new PairRatioRecord(p.RunA, p.RunB, p.Species, p.ConcentrationRatio, p.RateRatio, p.Order, p.StdError)).ToList(),
            ChosenLaw: f0?.ChosenLaw,
            Design: SeriesModelsJson.Design(f0),
            PowerLaw: SeriesModelsJson.PowerLaw(f0),
            Saturation: SeriesModelsJson.Saturation(f0),
            OtherLaws: SeriesModelsJson.OtherLaws(f0),
            Temperature: SeriesModelsJson.Temperature(f0),
            Arrhenius: SeriesModelsJson.Arrhenius(f0),
            Eyring: SeriesModelsJson.Eyring(f0),
            GlobalFit: SeriesModelsJson.GlobalFit(f0),
            Replicates: r.Replicates.Count > 0 ? Replicates(r) : null,
            Rejected: r.Rejected.Select(p => new RejectedRecord(p.File, p.Line, p.Column, p.Key, p.Input, p.Found, p.Expected, p.Hint, p.Message)).ToList(),
            Warnings: Warnings(r.Warnings.Concat(f0?.Warnings ?? []).ToList()));
    }

    private static RunRecord Run(RunResult run, string? plotFile)
    {
        var relSys = run.Converted.RelativeSystematicUncertainty;
        // Each run's headline only: every estimator and every law's fit are in the per-run tables (RunTables), so
        // summary.json stays about a kilobyte per run however many runs and laws there are.
        var chosen = run.Rates.Fits.FirstOrDefault(f => f.Chosen);
        return new RunRecord(
            Id: run.Id,
            File: run.File,
            Sha256: run.InputSha256,
            PlotFile: plotFile,
            Temperature: run.Plan.TemperatureK,
            InitialConcentrations: Numbers(run.Plan.InitialConcentrations),
            InitialRate: InitialRate(run.Rates.Headline, relSys),
            ChosenLaw: chosen is null ? null : new RunLawRecord(chosen.Law, chosen.Drift, chosen.Fit.Converged, chosen.AkaikeWeight,
                new RunRateConstantRecord(chosen.RateConstant, chosen.RateConstantStdError, chosen.RateConstantUnit, [chosen.Ci95Low, chosen.Ci95High]),
                chosen.HalfLife, chosen.HalfLifeStdError, chosen.LackOfFit),
            HeadlineRule: run.Rates.HeadlineRule,
            RateResolved: run.Rates.IsResolved,
            UnresolvedBecause: run.Rates.Unresolved,
            DeadTime: run.Rates.DeadTime,
            NoIntegerLawFits: run.Rates.NoIntegerLawFits,
            SpikeCount: run.Rates.Spikes.Count,
            SystematicRelativeUncertainty: relSys,
            Warnings: Warnings(run.Warnings));
    }

    /// <summary>Named numbers (concentrations by species, rounded orders), in ordinal order of their names.</summary>
    internal static IReadOnlyDictionary<string, double?> Numbers(IReadOnlyDictionary<string, double> values)
    {
        var sorted = new SortedDictionary<string, double?>(StringComparer.Ordinal);
        foreach (var (name, v) in values) sorted.Add(name, v);
        return sorted;
    }

    /// <summary>
    /// An initial rate. Its systematic uncertainty is the concentration scale's relative uncertainty (rates scale with it),
    /// written beside the statistical standard error, never combined with it (JCGM 100:2008 keeps the components listed).
    /// </summary>
    private static InitialRateRecord InitialRate(Rates.InitialRate h, double relativeSystematic) =>
        new(h.Value, h.StdError, h.Dof, h.Unit, h.Method, h.WindowStart, h.WindowEnd, h.PointsUsed,
            Math.Abs(h.Value) * relativeSystematic, h.ModelStdError);

    /// <summary>Replicate groups (runs planned alike): their rates' spread beside the fits' standard errors; written only when there are some.</summary>
    private static List<ReplicateGroupRecord> Replicates(SeriesResult r)
    {
        var unit = r.Runs.FirstOrDefault()?.Rates.Headline.Unit ?? Units.RateUnit;
        return r.Replicates.Select(g => new ReplicateGroupRecord(g.Runs, g.Conditions(), g.Mean, g.StdDev, g.MeanStdError, unit,
            g.Outliers.Select(o => new ReplicateOutlierRecord(o.Run, o.Score)).ToList())).ToList();
    }

    private static List<WarningRecord> Warnings(IReadOnlyList<Warning> warnings) =>
        warnings.Select(x => new WarningRecord(x.Code, x.Where, x.Message)).ToList();
}
