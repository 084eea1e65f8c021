using System.Collections.Concurrent;
using System.Reflection;
using System.Security.Cryptography;
using TraceKin.Ingest;
using TraceKin.Rates;
using TraceKin.Series;
using TraceKin.Setup;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Analysis;

/// <summary>
/// Runs the stages over one series folder: plan.csv + series.toml → per run Ingest → Signal → Rates (in parallel,
/// a bad file rejected with its located problem while the others go on) → Series. Output order follows the plan.
/// </summary>
public static class SeriesRunner
{
    public const string PlanFile = "plan.csv";
    public const string ConfigFile = "series.toml";
    /// <summary>The plate map kept beside plan.csv (the grids `tracekin plate-plan` turns into plan rows); not an export.</summary>
    public const string PlateMapFile = "plate-map.csv";

    public static string ToolVersion { get; } =
        typeof(SeriesRunner).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion.Split('+')[0] ?? "0.0.0";

    public static SeriesResult Analyse(string folder, AnalysisOptions? options = null, CancellationToken cancel = default)
    {
        options ??= new AnalysisOptions();
        var rejected = new List<Problem>();
        SeriesConfig? config = null, read = null;
        Plan? plan = null;
        // Each setup file is hashed from the bytes it is parsed from, once; the reports show these hashes.
        var hashes = new Dictionary<string, string>(StringComparer.Ordinal);
        string? configText = null;
        try
        {
            configText = ReadSetup(folder, ConfigFile, options, hashes);
            read = SeriesConfig.FromText(configText, ConfigFile);
            CheckNamedFiles(folder, read, configText, options);
            // the series is analysed only once the files series.toml names are read too
            config = read with { Signal = read.Signal.WithFilesFrom(folder) };
        }
        catch (InputException ex) { rejected.Add(read?.Locate(ex.Problem) ?? ex.Problem); }
        catch (IOException ex) { rejected.Add(Missing(ConfigFile, ex)); }
        // plan.csv, or the plate maps series.toml's [plate] names (wells a map problem leaves out are rejected alone)
        // (with series.toml rejected: its [plate] table, if it was read, still says where the plan is)
        if (read is not null || configText is null || !SeriesPlan.DeclaresPlate(configText))
        {
            (plan, var planProblems) = SeriesPlan.Read(folder, config ?? read, options, hashes);
            rejected.AddRange(planProblems);
        }
        if (config is null || plan is null)
            return new SeriesResult(folder, config, plan, [], rejected, null, [], ToolVersion) { SetupHashes = hashes };
        // Names series.toml gives (species, per-run parameter columns) must exist before any run is read.
        try { SeriesCheck.Check(config, plan); }
        catch (InputException ex)
        {
            rejected.Add(plan.Locate(config.Locate(ex.Problem)));
            return new SeriesResult(folder, config, plan, [], rejected, null, [], ToolVersion) { SetupHashes = hashes };
        }

        options.Planned?.Invoke(plan.Rows.Count);
        var runsClock = System.Diagnostics.Stopwatch.StartNew();
        var slots = new (RunResult? Run, Problem? Problem, RunTrace? FitTrace)[plan.Rows.Count];
        options.RunSink?.Begin(plan);
        // Rows are handed to the workers one at a time in plan order (not in a block per worker), so runs finish
        // close to plan order and a sink that writes in plan order (RunTables) holds only a few runs back.
        var sinkFailures = new ConcurrentQueue<Warning>();
        var order = Partitioner.Create(Enumerable.Range(0, plan.Rows.Count), EnumerablePartitionerOptions.NoBuffering);
        var exports = new SharedExports(folder, plan, config, options);
        var byRun = options.Reuse is null ? null : plan.Rows.ToDictionary(r => r.Run, StringComparer.Ordinal);
        var madeBlanks = new ConcurrentDictionary<string, BlankSubtraction>(StringComparer.Ordinal);
        // The runs kept without their points share one copy of every value that repeats between them.
        var shared = options.Retention == TraceRetention.None ? new SharedValues() : null;
        Parallel.ForEach(order, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, options.Workers), CancellationToken = cancel }, i =>
        {
            var row = plan.Rows[i];
            // a run whose every input is as in the last pass (watch) is taken as it was, without reading its export
            var key = options.Reuse?.Key(row, row.BlankRuns.Select(id => byRun![id]).ToList(), config);
            RunResult? run;
            Problem? problem = null;
            if (key is not null && options.Reuse!.TryTake(key, out var kept)) run = kept;
            else
            {
                (run, problem) = AnalyseRun(row, config, exports.Take(row), row.BlankRuns.Select(id => exports.TakeBlank(id)).ToList(), madeBlanks);
                if (run is not null && key is not null) options.Reuse!.Keep(key, run);
                else options.Reuse?.Computed();
            }
            // a plan built from a plate map: the problem is placed at the map cell (or setting) the plan cell came from
            if (problem is not null) problem = plan.Locate(problem);
            RunTrace? fitTrace = null;
            if (run is not null)
            {
                if (options.RunSink is { } sink) run = Deliver(sink, run);
                // Plain invariant numbers: the stages before Reports do not use its formatter (the CLI may reformat).
                options.Progress?.Invoke(row.Run, FormattableString.Invariant($"{row.File}: v0 = {run.Rates.Headline.Value:G4} ± {run.Rates.Headline.StdError:G2} {run.Rates.Headline.Unit}"));
                // Only what the summary, the report and the series need stays alive once the sink has seen every point:
                // the series stage gets the points of the full trace its global fit uses, the rest a display copy.
                if (options.Retention != TraceRetention.Full)
                {
                    // Only the global fit (model.global_fit) reads the traces again: without it, none is kept.
                    if (config.Model.GlobalFit) fitTrace = GlobalFit.Thin(SeriesTrace(run));
                    run = options.Retention == TraceRetention.None
                        ? RunThinning.Strip(run, keepEveryFit: options.RunSink is null || plan.Rows.Count <= options.KeepEveryFitUpTo, shared)
                        : RunThinning.Thin(run, options.RetainedColumns);
                }
            }
            else
            {
                options.Progress?.Invoke(row.Run, $"rejected: {problem!.Message}");
                // A rejected row has no run to carry the sink's failure: it becomes a series warning, never a stop.
                try { options.RunSink?.Rejected(row); }
                catch (Exception ex) when (ex is not OperationCanceledException)
                {
                    sinkFailures.Enqueue(new Warning("run-output-failed", row.File, $"an output could not note this rejected run ({ex.GetType().Name}: {ex.Message})"));
                }
            }
            slots[i] = (run, problem, fitTrace);
        });

        var analysed = slots.Where(s => s.Run is not null).ToList();
        var runs = analysed.Select(s => s.Run!).ToList();
        rejected.AddRange(slots.Where(s => s.Problem is not null).Select(s => s.Problem!));
        var warnings = new List<Warning>();
        warnings.AddRange(sinkFailures.OrderBy(w => w.Where, StringComparer.Ordinal));
        foreach (var unused in UnplannedExports(folder, plan, config.Plate?.Maps ?? []))
            warnings.Add(new Warning("file-not-in-plan", unused, config.Plate is null ? "this file is in the series folder but not in plan.csv; it was not analysed" : "this file is in the series folder but no mapped well reads it; it was not analysed"));

        // A run whose initial rate is unresolved is reported but kept out of the series fits unless the user asks.
        var unresolved = analysed.Where(s => !s.Run!.Rates.IsResolved).Select(s => s.Run!.Id).ToList();
        if (unresolved.Count > 0)
        {
            // The ids are listed up to a point; every run says so itself in summary.json (rateResolved).
            var listed = string.Join(", ", unresolved.Take(20)) + (unresolved.Count > 20 ? $" and {unresolved.Count - 20} more" : "");
            warnings.Add(new Warning("unresolved-runs", "series", config.Model.UseUnresolved
                ? $"{unresolved.Count} run(s) with an unresolved initial rate are kept in the series fits, as model.use_unresolved asks: {listed}"
                : $"{unresolved.Count} run(s) with an unresolved initial rate are left out of the series fits (model.use_unresolved = true keeps them): {listed}"));
        }
        // rates.laws listing a law these settings never fit (whatever the run): said once here, not on every run.
        if (IntegratedLawFitter.NeverFitted(config.Rates.Laws, config.Rates.Drift, config.Rates.LimitingReactant is not null) is { Count: > 0 } never)
            warnings.Add(new Warning("imposed-law-never-fitted", "series", "of the laws rates.laws lists, " +
                string.Join("; ", never.Select(x => $"{x.Law} is fitted to no run: {x.Why}")) + "; the others were fitted"));
        // A product curve whose end level is not known: where no decelerating law could be fitted the rate is a
        // straight line's slope, low by about half the conversion the run spans if the reaction slows (docs/methods.md,
        // "A product's end level from the plan"); the plan's limiting reactant would fix the end level.
        if (config.Signal.Coefficient > 0 && config.Rates.LimitingReactant is null)
        {
            var straight = runs.Where(r => r.Plan.Role != "blank" && r.Rates.ChosenLaw is { Law: "zero order" or "zero order + drift" }).Select(r => r.Id).ToList();
            if (straight.Count > 0)
                warnings.Add(new Warning("product-end-unknown", "series", string.Create(System.Globalization.CultureInfo.InvariantCulture,
                    $"{straight.Count} of {runs.Count(r => r.Plan.Role != "blank")} product run(s) ({string.Join(", ", straight.Take(10))}{(straight.Count > 10 ? ", …" : "")}) got a straight-line (zero-order) rate: the product's end level is not known, so a slowing as the substrate is used cannot be seen in them; if it slows, such a rate reads low by about half the conversion the run spans and its interval is too narrow. If the product forms from one reactant whose [X]0 the plan gives and the reaction runs to completion, set rates.limiting_reactant to fit each run with that end level")));
        }
        // Blank runs are shown with their own (near-zero) rates but are no point of the rate law.
        var points = analysed.Where(s => s.Run!.Plan.Role != "blank" && (config.Model.UseUnresolved || s.Run!.Rates.IsResolved)).Select(s => (Run: s.Run!, s.FitTrace)).Select(x => new RunPoint(x.Run.Id, x.Run.Rates.Headline.Value, x.Run.Rates.Headline.StdError, x.Run.Plan.InitialConcentrations, x.Run.Plan.TemperatureK)
        {
            Trace = x.FitTrace ?? SeriesTrace(x.Run),
            RateSystematicError = x.Run.Rates.Headline.ModelStdError,
        }).ToList();
        SeriesFindings? findings = null;
        // The runs' stripped records were promoted among their full versions' garbage: one compacting collection packs
        // them together before the series stage allocates. Aggressive, not only forced: the freed regions go back to
        // the system at once instead of staying committed for later allocations (bench/README.md, "Memory, 2026-12-04
        // 04:50 UTC": about 8 MB less at the peak of a 20,000-run batch, no measurable time).
        if (options.CompactAfterRuns) GC.Collect(2, GCCollectionMode.Aggressive, blocking: true, compacting: true);
        var seriesClock = System.Diagnostics.Stopwatch.StartNew();
        try { findings = OrderAnalysis.Analyse(points, config.Model); }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            // A defect in the series analysis must not lose the per-run results: report it plainly instead.
            warnings.Add(new Warning("series-analysis-failed", "series", $"the series analysis stopped with an internal error ({ex.GetType().Name}: {ex.Message}); per-run results are still written; please report this"));
        }
        var replicates = ReplicateGroup.Find(runs.Where(r => r.Plan.Role != "blank")
            .Select(r => new ReplicateRun(r.Id, r.Rates.Headline.Value, r.Rates.Headline.StdError, r.Plan.InitialConcentrations, r.Plan.TemperatureK)).ToList());
        foreach (var g in replicates)
            foreach (var (id, score) in g.Outliers)
                warnings.Add(new Warning("replicate-outlier", id, string.Create(System.Globalization.CultureInfo.InvariantCulture,
                    $"this run's initial rate lies apart from its replicates ({string.Join(", ", g.Runs)}; {g.Conditions()}): modified z-score {score:0.0}, beyond ±{ReplicateGroup.OutlierScore} (Iglewicz and Hoaglin)")));
        return new SeriesResult(folder, config, plan, runs, rejected, findings, warnings, ToolVersion) {
            Replicates = replicates,
            SetupHashes = hashes,
            RunsTime = runsClock.Elapsed - seriesClock.Elapsed,
            SeriesStageTime = seriesClock.Elapsed,
        };
    }

    /// <summary>One run through Ingest → Signal → Rates; bad input becomes its located problem, never an exception.</summary>
    public static (RunResult? Run, Problem? Problem) AnalyseRun(string folder, PlanRow row, SeriesConfig config) => AnalyseRun(folder, row, config, false);

    /// <param name="allowOutsideFiles">Read the export even when it resolves outside <paramref name="folder"/>.</param>
    public static (RunResult? Run, Problem? Problem) AnalyseRun(string folder, PlanRow row, SeriesConfig config, bool allowOutsideFiles) =>
        AnalyseRun(row, config, ReadExport(folder, row, config, allowOutsideFiles, null));

    /// <summary>
    /// One export read and parsed, or why not: a refusal or read failure (located at a plan row's file cell by
    /// <see cref="AtFileCell"/>), a located parse problem, or a defect of ours. Shared by every run that names the file.
    /// </summary>
    internal sealed record ExportRead(RunExport? Export, string? Hash, (string Found, string Expected, string Hint)? AtFile, Problem? Parse, Exception? Defect);

    /// <summary>Reads and parses the export a plan row names; never throws for bad input.</summary>
    internal static ExportRead ReadExport(string folder, PlanRow row, SeriesConfig config, bool allowOutsideFiles, Action<string>? parsed)
    {
        try
        {
            // Only a regular file inside the series folder, checked from its metadata before anything is opened.
            if (SeriesInputs.Check(folder, row.File, allowOutsideFiles, ExportReader.MaxBytes, out var path) is { } refusal)
                return new(null, null, (refusal.Found, refusal.Expected, refusal.Hint), null, null);
            // A pooled buffer, not a new large-object array per file: the bytes are not needed once parsed.
            ExportBytes bytes;
            try { bytes = ExportBytes.Read(path); }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                return new(null, null, (ex is FileNotFoundException ? $"{Fail.Quote(row.File)}: no such file" : $"{Fail.Quote(row.File)}, a file that cannot be read ({ex.Message})",
                    "the export named in plan.csv", "check the file column of plan.csv"), null, null);
            }
            using (bytes)
            {
                var hash = Convert.ToHexStringLower(SHA256.HashData(bytes.Memory.Span));
                parsed?.Invoke(row.File);
                return new(ExportReader.FromBytes(bytes.Memory, row.File, config.Ingest), hash, null, null, null);
            }
        }
        catch (InputException ex) { return new(null, null, null, ex.Problem, null); }
        catch (Exception ex) when (ex is not OperationCanceledException) { return new(null, null, null, null, ex); }
    }

    /// <summary>One run through Signal → Rates from its export as read (shared with the other runs of the file).</summary>
    internal static (RunResult? Run, Problem? Problem) AnalyseRun(PlanRow row, SeriesConfig config, ExportRead read) => AnalyseRun(row, config, read, []);

    /// <param name="blanks">The blank runs the row subtracts (<see cref="PlanRow.BlankRuns"/>) with their exports as read.</param>
    /// <param name="madeBlanks">Blank means made so far in this analysis, shared by the runs that subtract the same blanks.</param>
    internal static (RunResult? Run, Problem? Problem) AnalyseRun(PlanRow row, SeriesConfig config, ExportRead read, IReadOnlyList<(PlanRow Row, ExportRead Read)> blanks,
        ConcurrentDictionary<string, BlankSubtraction>? madeBlanks = null)
    {
        if (read.AtFile is { } refused) return (null, AtFileCell(row, refused.Found, refused.Expected, refused.Hint));
        if (read.Defect is { } defect) return (null, Internal(row, defect));
        if (read.Parse is { } parseProblem) return (null, Located(parseProblem, row, config, null));
        var export = read.Export!;
        try
        {
            // A run that names its own channel (a well of a plate) reads that one; else series.toml's signal.channel.
            if (row.Channel is { } own)
            {
                if (export.FindChannel(own) is null)
                    throw new InputException(new Problem(PlanFile, row.ChannelCell.Line > 0 ? row.ChannelCell.Line : row.Line, Math.Max(1, row.ChannelCell.Column),
                        $"channel {Fail.Quote(own)}, which {Fail.Quote(row.File)} does not have",
                        $"a channel of {Fail.Quote(row.File)}: {ChannelList(export)}", "check the plan's channel column against the export's column or well names") { Input = row.File });
                config = config with { Signal = config.Signal with { Channel = own } };
            }
            BlankSubtraction? blank = null;
            if (blanks.Count > 0)
            {
                blank = BlankSubtraction.Of(row, export.Channel(config.Signal.Channel), blanks, config, madeBlanks);
                export = blank.Apply(export, config.Signal.Channel);
            }
            var converted = Conversion.ToConcentration(export, row, config.Signal, config.File);
            double? reference = row.InitialConcentrations.TryGetValue(converted.Species, out var c0) && converted.Coefficient < 0 ? c0 : null;
            // With exactly one other reacting species in the plan, its [B]0 lets the Rates stage also try the
            // mixed second-order and pseudo-first-order laws.
            var others = row.InitialConcentrations.Where(kv => kv.Key != converted.Species && kv.Value > 0).ToList();
            double? partner = reference is not null && others.Count == 1 ? others[0].Value : null;
            // A product whose limiting reactant the plan gives rises by ν_P·[X]0/|ν_X| at complete reaction.
            var endKnown = false;
            if (config.Rates.LimitingReactant is { } limiting && converted.Coefficient > 0)
            {
                if (!row.InitialConcentrations.TryGetValue(limiting, out var x0) || !(x0 > 0))
                    throw new InputException(new Problem(PlanFile, row.Line, 1,
                        $"no positive [{limiting}]0 on run {Fail.Quote(row.Run)}",
                        $"a [{limiting}]0 for every run, as rates.limiting_reactant = {Fail.Quote(limiting)} asks",
                        $"add a [{limiting}]0 column to the plan, or remove rates.limiting_reactant"));
                reference = converted.Coefficient * x0 / Math.Abs(config.Rates.LimitingCoefficient);
                partner = null;
                endKnown = true;
            }
            var rates = RateAnalysis.Analyse(converted.Concentration, converted.Coefficient, reference, config.Rates, row.File, partner, endKnown);
            if (blank is not null) (converted, rates) = blank.CarryUncertainty(converted, rates, export.Channel(config.Signal.Channel));
            var warnings = OwnWarnings(export, config.Signal.Channel).Concat(converted.Warnings).Concat(rates.Warnings).ToList();
            return (new RunResult(row, read.Hash!, OwnChannels(export, row, config.Signal), converted, rates, warnings), null);
        }
        catch (InputException ex)
        {
            return (null, Located(ex.Problem, row, config, export));
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            return (null, Internal(row, ex));
        }
    }

    /// <summary>
    /// A run that names its own channel keeps only the channels it reads (its own, the reference and check channels):
    /// the other wells of the plate are other runs', and keeping them would grow every run with the plate.
    /// </summary>
    private static RunExport OwnChannels(RunExport export, PlanRow row, Signal.SignalSettings s)
    {
        if (row.Channel is null || export.Channels.Count <= 1) return export;
        var kept = new[] { s.Channel, s.ReferenceChannel, s.CheckChannel }.OfType<string>().Select(export.FindChannel).OfType<Trace>().Distinct().ToArray();
        return export with { Channels = kept };
    }

    /// <summary>A defect of ours must not stop the batch: it is reported against the file, plainly.</summary>
    private static Problem Internal(PlanRow row, Exception ex) =>
        AtFileCell(row, $"an internal error while analysing {Fail.Quote(row.File)} ({ex.GetType().Name}: {ex.Message})", "a readable export",
            "please report this with the file attached");

    private static string ChannelList(RunExport export) =>
        string.Join(", ", export.Channels.Take(12).Select(c => c.Name)) + (export.Channels.Count > 12 ? $" … ({export.Channels.Count} in all)" : "");

    /// <summary>
    /// The export's warnings that concern this run: in a file of many channels, a warning about another channel (a
    /// saturated or flat well) belongs to that channel's run only.
    /// </summary>
    private static IEnumerable<Warning> OwnWarnings(RunExport export, string? channel)
    {
        if (channel is null || export.Channels.Count <= 1) return export.Warnings;
        var own = export.FindChannel(channel)!;
        return export.Warnings.Where(w => w.Channel is not { } named || WellName.SameChannel(named, own.Name));
    }

    /// <summary>
    /// A problem raised after reading, by a stage that sees numbers but no lines, gets a location: a settings problem
    /// the key in series.toml, a plan-row problem its row's first column, a problem with the file before it was read
    /// the plan's cell, a problem with the whole trace the line where the export's data begin (the found text says
    /// which lines hold them).
    /// </summary>
    private static Problem Located(Problem p, PlanRow row, SeriesConfig config, RunExport? export)
    {
        if (p.Line > 0) return p.Column > 0 ? p : p with { Column = 1 };
        if (p.Key is not null) return config.Locate(p) with { Input = p.Input ?? row.File };
        // before the export was read (a file that changed between the check and the read): the plan's cell
        if (export is null) return AtFileCell(row, $"{Fail.Quote(row.File)}: {p.Found}", p.Expected, p.Hint);
        var (first, last) = export.DataLines;
        if (p.File == row.File && first > 0)
            return p with { Line = first, Column = 1, Found = $"{p.Found} (data rows on lines {first}–{last})" };
        return p;
    }

    private static RunTrace SeriesTrace(RunResult r) =>
        new(r.Converted.Species, r.Converted.Coefficient, r.Converted.Concentration.Times, r.Converted.Concentration.Values);

    /// <summary>Hands a run to the sink; a sink that fails (a plot that cannot be written) becomes a warning on that run.</summary>
    private static RunResult Deliver(IRunSink sink, RunResult run)
    {
        try
        {
            sink.Accept(run);
            return run;
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            var w = new Warning("run-output-failed", run.File, $"an output for this run could not be written ({ex.GetType().Name}: {ex.Message})");
            return run with { Warnings = [.. run.Warnings, w] };
        }
    }

    internal static Problem Missing(string file, IOException ex) =>
        new(file, 1, 1, ex is FileNotFoundException or DirectoryNotFoundException ? "no such file" : ex.Message, $"{file} in the series folder", "see docs/formats.md");

    /// <summary>A problem with the file a plan row names, located at that row's file cell in plan.csv.</summary>
    private static Problem AtFileCell(PlanRow row, string found, string expected, string hint) =>
        new(PlanFile, row.FileLine > 0 ? row.FileLine : row.Line, Math.Max(1, row.FileColumn), found, expected, hint) { Input = row.File };

    /// <summary>
    /// plan.csv or series.toml, read only when it is a regular file inside the folder (same rule as the exports).
    /// Records in <paramref name="hashes"/> (when given) the SHA-256 of the bytes read, or why there is none.
    /// </summary>
    internal static string ReadSetup(string folder, string name, AnalysisOptions options, Dictionary<string, string>? hashes = null)
    {
        // A setup file is small; the export limit is only a guard against reading a disk image by mistake.
        if (SeriesInputs.Check(folder, name, options.AllowOutsideFiles, ExportReader.MaxBytes, out var path) is { } refusal)
        {
            if (hashes is not null) hashes[name] = refusal.Missing ? SeriesResult.SetupMissing : SeriesResult.SetupNotRead;
            throw Fail.At(name, 1, 1, refusal.Found, refusal.Expected, refusal.Hint);
        }
        byte[] bytes;
        try { bytes = File.ReadAllBytes(path); }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            if (hashes is not null) hashes[name] = ex is FileNotFoundException or DirectoryNotFoundException ? SeriesResult.SetupMissing : SeriesResult.SetupUnreadable;
            throw;
        }
        if (hashes is not null) hashes[name] = Convert.ToHexStringLower(SHA256.HashData(bytes));
        // Decoded as File.ReadAllText does: UTF-8 unless a byte order mark says otherwise.
        using var text = new StreamReader(new MemoryStream(bytes, writable: false), System.Text.Encoding.UTF8, detectEncodingFromByteOrderMarks: true);
        return text.ReadToEnd();
    }

    /// <summary>Files that series.toml names (the calibration standards) follow the rule for exports, located at the key's value.</summary>
    private static void CheckNamedFiles(string folder, SeriesConfig config, string configText, AnalysisOptions options)
    {
        if (config.Signal.Calibration is not { File: { } file } cal) return;
        // The followed species' file, then each other species' own file when the standards are kept one species per file.
        foreach (var (named, key) in cal.OtherFiles.Select((f, k) => (f, $"signal.calibration.other[{k}].file")).Prepend((file, "signal.calibration.file")))
        {
            if (SeriesInputs.Check(folder, named, options.AllowOutsideFiles, ExportReader.MaxBytes, out _) is not { } refusal) continue;
            var (line, column) = TomlValueAt(configText, named);
            throw new InputException(new Problem(ConfigFile, line, column, refusal.Found, refusal.Expected, refusal.Hint, key));
        }
    }

    /// <summary>1-based line and column of the first quoted occurrence of <paramref name="value"/> in TOML text (1, 1 when absent).</summary>
    private static (int Line, int Column) TomlValueAt(string text, string value)
    {
        var lines = text.Replace("\r\n", "\n").Split('\n');
        for (var i = 0; i < lines.Length; i++)
            foreach (var quoted in new[] { $"\"{value}\"", $"'{value}'" })
                if (lines[i].IndexOf(quoted, StringComparison.Ordinal) is var at and >= 0) return (i + 1, at + 1);
        return (1, 1);
    }

    private static IEnumerable<string> UnplannedExports(string folder, Plan plan, IReadOnlyList<string> maps)
    {
        var planned = new HashSet<string>(plan.Rows.Select(r => r.File).Concat(maps), StringComparer.Ordinal);
        foreach (var f in Directory.EnumerateFiles(folder).Select(Path.GetFileName).OfType<string>().Order(StringComparer.Ordinal))
        {
            if (f is PlanFile or ConfigFile or PlateMapFile || f.StartsWith('.') || planned.Contains(f)) continue;
            var ext = Path.GetExtension(f).ToLowerInvariant();
            if (ExportFormats.Extensions.Contains(ext)) yield return f;
        }
    }

    /// <summary>
    /// Every export read and parsed once however many plan rows name it (the wells of a plate): the first run to need
    /// a file reads it, the others wait for that read, and the parsed export is let go when its last run has taken it.
    /// </summary>
    private sealed class SharedExports(string folder, Plan plan, SeriesConfig config, AnalysisOptions options)
    {
        private readonly ConcurrentDictionary<string, Lazy<ExportRead>> _reads = new(StringComparer.Ordinal);
        private readonly Dictionary<string, PlanRow> _byRun = plan.Rows.ToDictionary(r => r.Run, StringComparer.Ordinal);

        // a file's uses: its own runs and every use of one of its runs as a blank (looked up by id: a plate of 384
        // wells subtracting 32 blanks each is 11,000 uses)
        private readonly ConcurrentDictionary<string, int> _left = Uses(plan);

        private static ConcurrentDictionary<string, int> Uses(Plan plan)
        {
            var byRun = plan.Rows.ToDictionary(r => r.Run, r => r.File, StringComparer.Ordinal);
            var left = new ConcurrentDictionary<string, int>(StringComparer.Ordinal);
            foreach (var r in plan.Rows)
            {
                left.AddOrUpdate(r.File, 1, (_, n) => n + 1);
                foreach (var id in r.BlankRuns) left.AddOrUpdate(byRun[id], 1, (_, n) => n + 1);
            }
            return left;
        }

        /// <summary>The export of a blank run another run subtracts (counted among its file's uses).</summary>
        public (PlanRow Row, ExportRead Read) TakeBlank(string run) => (_byRun[run], Take(_byRun[run]));

        public ExportRead Take(PlanRow row)
        {
            var lazy = _reads.GetOrAdd(row.File, _ => new Lazy<ExportRead>(
                () => ReadExport(folder, row, config, options.AllowOutsideFiles, options.ExportParsed), LazyThreadSafetyMode.ExecutionAndPublication));
            var read = lazy.Value;
            if (_left.AddOrUpdate(row.File, 0, (_, n) => n - 1) <= 0) _reads.TryRemove(row.File, out _);
            return read;
        }
    }
}
