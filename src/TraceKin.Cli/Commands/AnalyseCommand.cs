using System.CommandLine;
using Serilog;
using TraceKin.Analysis;
using TraceKin.Reports;

namespace TraceKin.Cli.Commands;

/// <summary>`tracekin analyse SERIES --out DIR`: one series folder in, results folder out.</summary>
public static class AnalyseCommand
{
    public static Command Create()
    {
        var series = new Argument<DirectoryInfo>("series") { Description = "Series folder holding plan.csv, series.toml and the exports." };
        var output = new Option<DirectoryInfo>("--out", "-o") { Description = "Folder for summary.json, runs.csv, plots/ and the log.", Required = true };
        var noPlots = new Option<bool>("--no-plots") { Description = "Skip the PNG plots (numbers only)." };
        var workers = new Option<int>("--workers") { Description = "Runs analysed at once (default: number of cores).", DefaultValueFactory = _ => Environment.ProcessorCount };
        var outside = new Option<bool>("--allow-outside-files") { Description = "Also read files that plan.csv or series.toml name outside the series folder (after following links)." };
        var decimalComma = new Option<bool>("--decimal-comma") { Description = "Write the CSV tables with ';' between cells and decimal commas (for spreadsheets in such locales)." };
        var cmd = new Command("analyse", "Analyse one series folder: initial rates, fits, orders, rate constant, plots.")
        {
            series, output, noPlots, workers, outside, decimalComma,
        };
        cmd.SetAction(pr => Run(pr.GetValue(series)!, pr.GetValue(output)!, !pr.GetValue(noPlots), pr.GetValue(workers), allowOutsideFiles: pr.GetValue(outside),
            csv: pr.GetValue(decimalComma) ? CsvStyle.DecimalComma : CsvStyle.Standard));
        return cmd;
    }

    /// <summary>The files `analyse` writes directly into --out (plots/ holds the pictures).</summary>
    public static readonly string[] OutputFiles = [SummaryJson.FileName, RunsCsv.FileName, PairRatiosCsv.FileName, .. RunTables.FileNames, ReportHtml.FileName, LogFile];

    public const string LogFile = "tracekin.log";

    public static int Run(DirectoryInfo series, DirectoryInfo output, bool plots, int workers, TextWriter? error = null, bool allowOutsideFiles = false,
        CsvStyle csv = CsvStyle.Standard)
    {
        error ??= Console.Error;
        if (!series.Exists)
        {
            error.WriteLine($"tracekin: series folder not found: {series.FullName}");
            return ExitCodes.Usage;
        }
        if (workers < 1)
        {
            error.WriteLine("tracekin: --workers must be at least 1");
            return ExitCodes.Usage;
        }
        var outDir = output.FullName;
        OutputLock? held;
        try
        {
            // One analysis per --out at a time: a second one would mix its files with ours and append to our log.
            held = OutputLock.TryTake(outDir, "analyse", out var refusal);
            if (held is null)
            {
                error.WriteLine($"tracekin: {refusal}");
                return ExitCodes.Usage;
            }
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            error.WriteLine($"tracekin: cannot use --out {outDir}: {ex.Message}");
            return ExitCodes.Usage;
        }
        using (held)
        {
            try
            {
                // Everything analyse will write is checked before the first byte, so a refusal leaves --out as it was.
                CheckOutputs(outDir);
                // An earlier analysis's files go before anything is written, so the new report can never show one of
                // its plots and the log holds this analysis only.
                var removed = RemovePreviousOutputs(outDir);
                int failures;
                SeriesResult result;
                using (var log = (Serilog.Core.Logger)Logging.Create(Path.Combine(outDir, LogFile)))
                {
                    log.Information("TraceKin {Version}: analysing {Series}", SeriesRunner.ToolVersion, series.FullName);
                    if (removed > 0)
                        log.Information("removed {Count} file(s) of an earlier analysis from {Out} (summary, tables, report, log and plots are replaced as a whole)", removed, outDir);
                    (result, failures) = Analyse(series.FullName, outDir, plots, workers, log, allowOutsideFiles, csv);
                }
                if (failures > 0)
                {
                    error.WriteLine($"tracekin: {failures} output file(s) could not be written into {outDir} (see the messages above); the results there are incomplete");
                    return ExitCodes.CannotWrite;
                }
                return result.Rejected.Count == 0 ? ExitCodes.Ok : ExitCodes.SomeRejected;
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                error.WriteLine($"tracekin: cannot write the results into {outDir}: {ex.Message}");
                return ExitCodes.CannotWrite;
            }
        }
    }

    /// <summary>
    /// Refuses (with <see cref="OutputPathException"/>) when a file or folder analyse writes is a symbolic link or of
    /// the wrong kind: the fixed files, plots/ and every entry of plots/ that is a link.
    /// </summary>
    public static void CheckOutputs(string outDir)
    {
        foreach (var f in OutputFiles) OutputPaths.CheckFile(Path.Combine(outDir, f));
        var plotDir = new DirectoryInfo(Path.Combine(outDir, "plots"));
        if (plotDir.LinkTarget is null && !plotDir.Exists) return;
        OutputPaths.EnsureFolder(outDir, plotDir.FullName); // throws for a link or a file
        foreach (var entry in plotDir.EnumerateFileSystemInfos())
            if (entry.LinkTarget is not null) OutputPaths.CheckFile(entry.FullName);
    }

    /// <summary>
    /// Removes the files an earlier analysis left in <paramref name="outDir"/>, and only those: the fixed files
    /// (<see cref="OutputFiles"/>), every PNG directly in plots/, and temporary files of an interrupted write in either
    /// folder (AtomicFile's ".NAME.PID.GUID.tmp"). Only regular files are removed: links were refused by
    /// <see cref="CheckOutputs"/>, folders and anything else in --out (the lock, a watcher's files, the user's own
    /// files) are left alone. Returns how many files were removed.
    /// </summary>
    public static int RemovePreviousOutputs(string outDir)
    {
        var removed = 0;
        void Remove(FileInfo f)
        {
            if (f.LinkTarget is not null || !f.Exists) return;
            f.Delete();
            removed++;
        }
        static bool Leftover(string name) => name.StartsWith('.') && name.EndsWith(".tmp", StringComparison.Ordinal) && name != OutputLock.FileName;
        foreach (var name in OutputFiles) Remove(new FileInfo(Path.Combine(outDir, name)));
        foreach (var f in new DirectoryInfo(outDir).EnumerateFiles())
            if (Leftover(f.Name) && OutputFiles.Any(o => f.Name.StartsWith("." + o + ".", StringComparison.Ordinal))) Remove(f);
        var plotDir = new DirectoryInfo(Path.Combine(outDir, "plots"));
        if (plotDir.LinkTarget is null && plotDir.Exists)
            foreach (var f in plotDir.EnumerateFiles())
                if (f.Name.EndsWith(".png", StringComparison.Ordinal) || (Leftover(f.Name) && f.Name.Contains(".png.", StringComparison.Ordinal))) Remove(f);
        return removed;
    }

    /// <summary>Analyses and writes every output; returns the result and how many output files could not be written.</summary>
    /// <param name="seriesPlots">The series plots to draw (default <see cref="ReportSet.SeriesPlots"/>; tests put a failing one here).</param>
    public static (SeriesResult Result, int Failures) Analyse(string seriesDir, string outDir, bool plots, int workers, ILogger log, bool allowOutsideFiles = false,
        CsvStyle csv = CsvStyle.Standard, IReadOnlyList<ISeriesPlot>? seriesPlots = null)
    {
        var progress = new BatchProgress(log);
        // Run plots (queued to background writers) and the per-run tables are written as the runs finish.
        using var outputs = new SeriesOutputs(outDir, plots, csv, seriesPlots: seriesPlots);
        var options = new AnalysisOptions
        {
            AllowOutsideFiles = allowOutsideFiles,
            Workers = workers,
            RunSink = outputs.RunSink,
            // The plots are drawn by the sink from every point; the files written afterwards need numbers only.
            Retention = TraceRetention.None,
            // The per-run tables hold every fit; beyond the runs the report lists fit by fit, the result keeps the chosen.
            KeepEveryFitUpTo = ReportHtml.MaxListedRuns,
            CompactAfterRuns = true,
            Progress = progress.Report,
            Planned = progress.Planned,
        };
        var result = SeriesRunner.Analyse(seriesDir, options);
        // The series stage's working arrays are garbage now: collected, the heap packed and the freed memory given back
        // to the system (aggressive mode) before the writers allocate.
        GC.Collect(2, GCCollectionMode.Aggressive, blocking: true, compacting: true);
        var outputsClock = System.Diagnostics.Stopwatch.StartNew();
        // Every series output, the report last; one that fails is listed in the report and here, the others are written.
        var notWritten = outputs.Write(result);
        foreach (var missing in notWritten) log.Error("could not write {Output}: {Message}", missing.Output, missing.Error);
        var failures = notWritten.Count;
        // Where a batch's time goes (log file only; no time ever enters a numeric output).
        log.Debug("timing: runs {Runs} s, series stage {Series} s, outputs {Outputs} s", Seconds(result.RunsTime), Seconds(result.SeriesStageTime),
            Seconds(outputsClock.Elapsed));
        // Every warning reaches the log (and the console): problems first and as warnings, notes after them.
        foreach (var p in result.Rejected) log.Warning("rejected: {Message}", p.Message);
        var warnings = WarningTiers.All(result);
        var unconverged = WarningTiers.Unconverged(result);
        foreach (var w in warnings.Where(w => !WarningTiers.IsNote(w))) log.Warning("problem: {Warning} [{Code}]", w.ToString(), w.Code);
        foreach (var u in unconverged.Where(u => u.Chosen)) log.Warning("problem: {Run}: {Message}", u.Run, u.Message);
        if (result.Findings?.OrderFit is { Converged: false }) log.Warning("problem: orders: the order fit did not converge; its numbers are not results");
        foreach (var w in warnings.Where(WarningTiers.IsNote)) log.Information("note: {Warning} [{Code}]", w.ToString(), w.Code);
        foreach (var u in unconverged.Where(u => !u.Chosen)) log.Information("note: {Run}: {Message}", u.Run, u.Message);
        if (result.Config?.Rates.Laws is { } imposed)
            log.Information("integrated laws imposed by rates.laws: {Laws} (each run's law was imposed, not chosen among every law)", string.Join(", ", imposed));
        if (result.Findings is { } f)
        {
            foreach (var o in f.Orders)
                log.Information("order in {Species}: n = {Order}", o.Species, ReportNumber.Estimate(o.Value, o.StdError, null, o.Ci95Low, o.Ci95High));
            if (f.RateConstant is { } k)
                log.Information("rate constant k = {K}", ReportNumber.Estimate(k.Value, k.StdError, k.Unit, k.Ci95Low, k.Ci95High));
            if (f.Saturation is { } sat)
            {
                // What AICc preferred and what was used can differ (a Km beyond the measured range keeps the power law).
                log.Information("AICc prefers the {Law} law (evidence ratio {Ratio}); the rate law used is the {Chosen} law", sat.Preferred, ReportNumber.Plain(sat.EvidenceRatio, 3), f.ChosenLaw);
                if (f.ChosenLaw == "saturation")
                {
                    LogEstimate(log, "Vmax", sat.Vmax);
                    LogEstimate(log, "Km", sat.Km);
                }
            }
            foreach (var other in f.OtherLaws)
            {
                log.Information("{Law} law against the power law: AICc {Aicc} against {AiccPower} (evidence ratio {Ratio}); the rate law used is the {Chosen} law",
                    other.Law, ReportNumber.Plain(other.Aicc, 4), ReportNumber.Plain(other.AiccPowerLaw, 4), ReportNumber.Plain(other.EvidenceRatio, 3), f.ChosenLaw);
                if (f.ChosenLaw == other.Law)
                    foreach (var e in other.Estimates) LogEstimate(log, e.Name, e);
            }
            foreach (var g in f.Temperature?.Groups ?? [])
                log.Information("k at {T} K = {K}", ReportNumber.Plain(g.TemperatureK, 5), ReportNumber.Estimate(g.RateConstant.Value, g.RateConstant.StdError, g.RateConstant.Unit, g.RateConstant.Ci95Low, g.RateConstant.Ci95High));
            if (f.Temperature?.Arrhenius is { } arr)
            {
                LogEstimate(log, "activation energy Ea", arr.ActivationEnergy);
                LogEstimate(log, "pre-exponential factor A", arr.PreExponential);
            }
            if (f.Temperature?.Eyring is { } ey)
            {
                LogEstimate(log, "enthalpy of activation ΔH‡", ey.EnthalpyOfActivation);
                LogEstimate(log, "entropy of activation ΔS‡", ey.EntropyOfActivation);
            }
        }
        // A run whose plot could not be drawn or handed over carries a run-output-failed warning.
        failures += result.Runs.Sum(r => r.Warnings.Count(w => w.Code == "run-output-failed"));
        log.Information("{Analysed} run(s) analysed, {Rejected} rejected; results in {Out}", result.Runs.Count, result.Rejected.Count, outDir);
        return (result, failures);
    }

    private static string Seconds(TimeSpan t) => t.TotalSeconds.ToString("0.000", System.Globalization.CultureInfo.InvariantCulture);

    private static void LogEstimate(ILogger log, string name, TraceKin.Series.Estimate e) =>
        log.Information("{Name} = {Estimate}", name, ReportNumber.Estimate(e.Value, e.StdError, e.Unit, e.Ci95Low, e.Ci95High));
}
