using System.Security.Cryptography;
using Serilog;
using TraceKin.Analysis;
using TraceKin.Reports;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Cli.Watch;

/// <summary>
/// One watched series folder. A pass takes every settled input (plan.csv, series.toml and the exports plan.csv names),
/// reading each raw file once, read-only and without blocking its writer, into a private snapshot in the output folder;
/// compares their SHA-256 with the series' last ledger record; and when anything differs, analyses the snapshot,
/// refreshes the outputs, and only then appends the new ledger record. Exports still missing or still being written
/// are "pending": reported as warnings, analysed when they settle. Not thread-safe: one pass of a series at a time.
/// </summary>
public sealed class SeriesWatch
{
    public const string WorkFolder = ".work";

    private readonly string _folder;
    private readonly string _outDir;
    private readonly string _snapshotDir;
    private readonly string _plotKeyDir;
    private readonly WatchOptions _options;
    private readonly FileStability _stability;
    private readonly Ledger _ledger;
    private readonly TimeProvider _time;
    private readonly ILogger _log;
    private readonly Action<string> _status;
    private readonly Dictionary<string, (FileSignature Signature, string Sha256)> _snapshot = new(StringComparer.Ordinal);
    private readonly Dictionary<string, InputRefusal> _refused = new(StringComparer.Ordinal);
    private readonly HashSet<string> _announcedRefusals = new(StringComparer.Ordinal);
    // Planned exports (and setup files) that exist but cannot be read (with why); rejected once the series stops
    // waiting for them, said once, looked at again later.
    private readonly Dictionary<string, string> _unreadable = new(StringComparer.Ordinal);
    private bool _cleaned;
    // Per-run results of the last pass: a run whose export, plan row, blanks and series.toml are unchanged is not analysed again.
    private readonly RunStore _runs = new();
    private DateTimeOffset? _settlingSince;

    /// <summary>How many settle intervals a series waits for its settling exports before it is analysed without them.</summary>
    public const int MaxWaitForSettling = 5;

    public SeriesWatch(string folder, WatchOptions options, FileStability stability, Ledger ledger, TimeProvider time, ILogger log, Action<string> status)
    {
        _folder = folder;
        Name = Path.GetFileName(Path.TrimEndingDirectorySeparator(folder));
        _outDir = Path.Combine(options.Out, Name);
        _snapshotDir = Path.Combine(options.Out, WorkFolder, Name);
        _plotKeyDir = Path.Combine(options.Out, WorkFolder, ".plots", Name);
        _options = options;
        _stability = stability;
        _ledger = ledger;
        _time = time;
        _log = log;
        _status = status;
    }

    public string Name { get; }

    /// <summary>Runs of the last analysis taken unchanged from the pass before, and runs read and analysed.</summary>
    public (int Reused, int Computed) LastRunCounts => _runs.LastPass;

    /// <summary>A series folder holds series.toml and plan.csv, or series.toml with a [plate] table (its plan drawn in plate maps).</summary>
    public static bool IsSeriesFolder(string folder)
    {
        var config = Path.Combine(folder, SeriesRunner.ConfigFile);
        if (!File.Exists(config)) return false;
        if (File.Exists(Path.Combine(folder, SeriesRunner.PlanFile))) return true;
        // read only a small regular file inside the folder (never a pipe or a link out of it)
        if (SeriesInputs.Check(folder, SeriesRunner.ConfigFile, false, 1 << 20, out var path) is not null) return false;
        try { return SeriesPlan.DeclaresPlate(File.ReadAllText(path)); }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException) { return false; }
    }

    /// <summary>The setup files of the last pass: series.toml, plan.csv or the plate maps its [plate] table names.</summary>
    private readonly HashSet<string> _setupFiles = new(StringComparer.Ordinal) { SeriesRunner.PlanFile, SeriesRunner.ConfigFile };

    private bool IsSetup(string file) => _setupFiles.Contains(file);

    public SeriesPass Pass()
    {
        var now = _time.GetUtcNow();
        DateTimeOffset? recheck = null;
        var inputs = new SortedDictionary<string, string>(StringComparer.Ordinal);
        var pending = new SortedSet<string>(StringComparer.Ordinal);
        var settling = 0;
        var changing = 0; // settling files that are not unreadable: still being written

        var setupTaken = true;
        // series.toml first: whether the plan is plan.csv or plate maps is read from its copy
        foreach (var setup in SetupFiles())
        {
            var mayBeAbsent = setup != SeriesRunner.ConfigFile && (setup != SeriesRunner.PlanFile || _plateMaps is not null);
            if (FileSignature.Of(Path.Combine(_folder, setup)) is not { } found)
            {
                if (mayBeAbsent) continue; // a missing map is reported by the analysis; plan.csv beside [plate] need not be there
                return SeriesPass.Vanished;
            }
            if (Refusal(setup) is { } refused)
            {
                // a pipe, device or link out of the folder is never opened; said once, looked at again later
                if (_unreadable.TryAdd(setup, refused.Found)) _log.Warning("{Series}/{File} is not read: found {Found}; expected {Expected}", Name, setup, refused.Found, refused.Expected);
                recheck = Earliest(recheck, now + _options.Settle);
                setupTaken = false;
                continue;
            }
            // The longer settle of a file without a final line end is for exports written row by row; the setup
            // files are saved whole by an editor, and are often saved without a final line end.
            var sig = found with { Unterminated = false };
            if (TryTake(setup, sig, now, ref recheck, out var sha)) inputs[setup] = sha;
            else setupTaken = false;
        }
        _setupFiles.Clear();
        _setupFiles.UnionWith([SeriesRunner.PlanFile, SeriesRunner.ConfigFile, .. _plateMaps ?? []]);
        if (!setupTaken) return new SeriesPass(false, false, recheck, _ledger.Latest(Name)) { Waiting = true };

        var plan = ReadSetup();
        _refused.Clear();
        if (plan is not null)
        {
            foreach (var file in plan.Rows.Select(r => r.File).Distinct(StringComparer.Ordinal))
            {
                // Only regular files inside the series folder are copied (no link out of it, no pipe or device,
                // checked before any open); a missing one is waited for, like one still being written.
                if (Refusal(file) is { Missing: false } refused)
                {
                    _refused[file] = refused;
                    continue;
                }
                var raw = Path.Combine(_folder, file);
                if (FileSignature.Of(raw) is not { } sig)
                {
                    _stability.Forget(raw);
                    pending.Add(file);
                    if (NotAFile(raw) is { } why) _unreadable[file] = why;
                    else _unreadable.Remove(file);
                }
                else if (TryTake(file, sig, now, ref recheck, out var sha)) inputs[file] = sha;
                else
                {
                    pending.Add(file);
                    settling++;
                    if (!_unreadable.ContainsKey(file)) changing++;
                }
            }
        }
        PruneSnapshot(inputs.Keys);

        // While exports are still settling, wait for them (they usually arrive together) rather than analyse the
        // series once per file; but not for ever: a file written for longer than this is analysed without it.
        if (settling > 0)
        {
            _settlingSince ??= now;
            if (now - _settlingSince.Value < MaxWaitForSettling * _options.Settle)
                return new SeriesPass(false, false, recheck, _ledger.Latest(Name)) { Waiting = true };
        }
        else _settlingSince = null;

        var unreadable = pending.Count(_unreadable.ContainsKey);
        var committed = _ledger.Latest(Name);
        if (committed is not null && SameState(committed, inputs, pending) && File.Exists(Path.Combine(_outDir, SummaryJson.FileName)))
            return new SeriesPass(false, false, recheck, committed) { Rejected = RejectedIn(committed) + unreadable, Settling = changing > 0 };

        _settlingSince = null;
        var record = Analyse(committed, inputs, pending);
        if (record is null) recheck = Earliest(recheck, now + _options.Settle);
        return new SeriesPass(false, record is not null, recheck, record ?? committed)
        {
            Failed = record is null,
            Rejected = record is null ? 0 : RejectedIn(record) + unreadable,
            Settling = changing > 0,
        };
    }

    private static int RejectedIn(LedgerRecord record) => record.Inputs.Count(i => i.Status == LedgerInput.Rejected);

    /// <summary>Why a planned path that is not a readable file can never become one by settling (a folder, a dangling link); null otherwise.</summary>
    private static string? NotAFile(string path)
    {
        try
        {
            if (Directory.Exists(path)) return "a folder, not a file";
            if (new FileInfo(path).LinkTarget is { } target) return $"a symbolic link to {target}, which does not exist";
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            return ex.Message;
        }
        return null;
    }

    /// <summary>Parses the snapshot's setup as the analysis will (plan.csv, or the plate maps of [plate]); null when it is bad (the analysis then reports it).</summary>
    private Plan? ReadSetup()
    {
        try
        {
            var config = SeriesConfig.FromFile(Path.Combine(_snapshotDir, SeriesRunner.ConfigFile));
            return SeriesPlan.Read(_snapshotDir, config, new AnalysisOptions()).Plan;
        }
        catch (Exception ex) when (ex is InputException or IOException)
        {
            return null;
        }
    }

    // The plate maps the snapshot's series.toml names ([plate]); null: the plan is plan.csv.
    private IReadOnlyList<string>? _plateMaps;

    /// <summary>
    /// The setup files to take, series.toml first. Which plan files follow is read from series.toml as taken by this
    /// pass (its snapshot copy once taken): plan.csv, or the maps of its [plate] table (and plan.csv if present, so
    /// the analysis can refuse the two together). A map edited is then an input like plan.csv: its change re-analyses.
    /// </summary>
    private IEnumerable<string> SetupFiles()
    {
        yield return SeriesRunner.ConfigFile;
        _plateMaps = null;
        // the copy this pass took, else (series.toml still settling) the inbox's own, read only when it is a small
        // regular file inside the folder: a [plate] series must not look vanished for want of a plan.csv
        var copy = Path.Combine(_snapshotDir, SeriesRunner.ConfigFile);
        if (!File.Exists(copy) && SeriesInputs.Check(_folder, SeriesRunner.ConfigFile, false, 1 << 20, out var raw) is null) copy = raw;
        try
        {
            if (File.Exists(copy))
            {
                var text = File.ReadAllText(copy);
                if (SeriesPlan.DeclaresPlate(text))
                {
                    try { _plateMaps = SeriesConfig.FromText(text, SeriesRunner.ConfigFile).Plate?.Maps ?? []; }
                    catch (InputException) { _plateMaps = [PlateSettings.DefaultMap]; }
                }
            }
        }
        catch (IOException) { }
        yield return SeriesRunner.PlanFile;
        // only names that stay inside the series folder are looked at; the analysis says why another is refused
        foreach (var map in _plateMaps ?? [])
            if (map != SeriesRunner.PlanFile && map != SeriesRunner.ConfigFile && !Path.IsPathRooted(map)) yield return map;
    }

    /// <summary>
    /// Takes a settled file into the snapshot and gives its SHA-256; false (with a time to look again) while it is
    /// still settling, cannot be opened, or changes while being read.
    /// </summary>
    private bool TryTake(string file, FileSignature sig, DateTimeOffset now, ref DateTimeOffset? recheck, out string sha)
    {
        sha = "";
        var raw = Path.Combine(_folder, file);
        var stableAt = _stability.Observe(raw, sig);
        // Against the clock as read by the look itself (not the pass's start), so a zero settle interval takes a file at once.
        if (stableAt > _time.GetUtcNow())
        {
            recheck = Earliest(recheck, stableAt);
            return false;
        }
        var copy = Path.Combine(_snapshotDir, file);
        if (_snapshot.TryGetValue(file, out var taken) && taken.Signature == sig && File.Exists(copy))
        {
            sha = taken.Sha256;
            return true;
        }
        byte[] bytes;
        if (sig.Length == 0)
        {
            // Nothing to read (and a named pipe, whose length is 0, is never opened: that would wait for a writer).
            bytes = [];
        }
        else try
        {
            // Read-only, sharing everything, so the instrument can go on writing, renaming or deleting.
            using var fs = new FileStream(raw, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, 1 << 16);
            var before = (fs.Length, File.GetLastWriteTimeUtc(fs.SafeFileHandle));
            using var ms = new MemoryStream(before.Length > 0 && before.Length < int.MaxValue ? (int)before.Length : 0);
            fs.CopyTo(ms);
            var after = (fs.Length, File.GetLastWriteTimeUtc(fs.SafeFileHandle));
            if (before != (sig.Length, sig.LastWriteUtc) || after != before || ms.Length != sig.Length)
            {
                // It changed between the look and the read: let it settle again.
                _stability.Restart(raw);
                recheck = Earliest(recheck, now + _options.Settle);
                return false;
            }
            bytes = ms.ToArray();
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // Said once per file (a writer holding it exclusively is normal for a while); tried again every settle interval.
            if (_unreadable.TryAdd(file, ex.Message)) _log.Warning("{Series}/{File} cannot be opened for reading yet: {Message}", Name, file, ex.Message);
            _stability.Restart(raw);
            recheck = Earliest(recheck, now + _options.Settle);
            return false;
        }
        _unreadable.Remove(file);
        sha = Convert.ToHexStringLower(SHA256.HashData(bytes));
        // Through AtomicFile inside the output folder: a link planted in the snapshot is refused, never written through.
        // Not flushed to disk: the snapshot is disposable, and a restart copies the inputs again.
        AtomicFile.WriteAllBytes(copy, bytes, _options.Out, durable: false);
        _snapshot[file] = (sig, sha);
        return true;
    }

    /// <summary>Removes snapshot files that are not inputs now, so the analysis sees exactly the settled inputs.</summary>
    private void PruneSnapshot(IEnumerable<string> keep)
    {
        var wanted = new HashSet<string>(keep.Select(k => Path.GetFullPath(Path.Combine(_snapshotDir, k))), StringComparer.Ordinal);
        // The snapshot folder must be our own real folder before anything in it is deleted.
        OutputPaths.EnsureFolder(_options.Out, _snapshotDir);
        foreach (var f in OutputPaths.FilesBelow(_snapshotDir))
        {
            if (wanted.Contains(Path.GetFullPath(f))) continue;
            File.Delete(f);
            _snapshot.Remove(Path.GetRelativePath(_snapshotDir, f));
        }
    }

    private InputRefusal? Refusal(string file) => SeriesInputs.Check(_folder, file, allowOutside: false, Ingest.ExportReader.MaxBytes, out _);

    private static bool SameState(LedgerRecord committed, IReadOnlyDictionary<string, string> inputs, SortedSet<string> pending) =>
        committed.Inputs.Count == inputs.Count
        && committed.Inputs.All(i => inputs.TryGetValue(i.File, out var sha) && sha == i.Sha256)
        && pending.SetEquals(committed.Pending);

    private LedgerRecord? Analyse(LedgerRecord? committed, SortedDictionary<string, string> inputs, SortedSet<string> pending)
    {
        SeriesOutputs outputs;
        ChangedRunPlots? plots;
        try
        {
            // The series' results folder and the plot keys' folder are real folders inside OUT before anything is written or removed.
            OutputPaths.EnsureFolder(_options.Out, _outDir);
            OutputPaths.EnsureFolder(_options.Out, _plotKeyDir);
            if (_options.Plots) OutputPaths.EnsureFolder(_options.Out, Path.Combine(_outDir, "plots"));
            // The same outputs as analyse writes, by the same writer; each run plot is on disk before its key file.
            outputs = new SeriesOutputs(_outDir, _options.Plots, _options.Csv, root: _options.Out, queueRunPlots: false, seriesPlots: _options.SeriesPlots);
            plots = outputs.RunPlots is { } runPlots ? new ChangedRunPlots(_options.Out, _outDir, _plotKeyDir, inputs, runPlots, outputs) { Maps = _plateMaps ?? [] } : null;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            _log.Error("{Series}: not analysed, cannot write its results: {Message}", Name, ex.Message);
            return null;
        }
        using var owned = outputs;
        if (!_cleaned)
        {
            RemoveOrphanTemporaries();
            _cleaned = true;
        }
        _runs.BeginPass(inputs);
        var options = new AnalysisOptions
        {
            Reuse = _runs,
            Workers = Math.Max(1, _options.Workers),
            // Only the changed runs' plots are drawn; the per-run tables are streamed as the runs finish.
            RunSink = RunSinks.Combine(plots, outputs.Tables),
            Progress = (run, status) => _log.Debug("{Series} {Run}: {Status}", Name, run, status),
        };
        var clock = System.Diagnostics.Stopwatch.StartNew();
        var result = SeriesRunner.Analyse(_snapshotDir, options);
        _runs.EndPass();

        // An export the plan names but that has not arrived (or settled) is not a failure: it is waited for. One
        // that is there but cannot be read (or is a folder, or a dangling link) is rejected, and tried again when it
        // changes; a file refused in the inbox is missing from the copy: report why it was refused, not that the copy lacks it.
        var waiting = result.Rejected.Where(p => p.Input is { } f && pending.Contains(f)).ToList();
        var unreadable = pending.Where(_unreadable.ContainsKey).Select(f => new Problem(f, 1, 1, $"a file that cannot be read ({_unreadable[f]})",
            "an export the watcher can open for reading", "check the file (its permissions, or which program holds it); it is tried again when it changes") { Input = f }).ToList();
        result = result with
        {
            Rejected = result.Rejected.Except(waiting)
                .Select(p => p.Input is { } f && _refused.TryGetValue(f, out var r) ? p with { Found = r.Found, Expected = r.Expected, Hint = r.Hint } : p)
                .Concat(unreadable).ToList(),
            Warnings = result.Warnings.Concat(pending.Where(f => !_unreadable.ContainsKey(f)).Select(f => new Warning("export-pending", f,
                "named in plan.csv but not (yet) complete in the inbox; it is analysed as soon as it has settled"))).ToList(),
        };

        // Every output, the report last; one that fails (a run plot included) is listed in the report and logged.
        var notWritten = outputs.Write(result);
        foreach (var f in notWritten) _log.Error("{Series}: could not write {Output}: {Message}", Name, f.Output, f.Error);
        var failures = notWritten.Count;
        if (result.Plan is not null && _options.Plots)
        {
            try { RemoveStalePlots(result); }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                failures++;
                _log.Error("{Series}: could not remove the plots of runs no longer analysed: {Message}", Name, ex.Message);
            }
        }
        if (failures > 0) return null; // not committed: the series is tried again

        var setupOk = result.Config is not null && result.Plan is not null;
        var records = new List<LedgerInput>();
        foreach (var (file, sha) in inputs)
        {
            var isNew = committed?.Input(file)?.Sha256 != sha;
            var problem = result.Rejected.FirstOrDefault(p => (p.Input ?? p.File) == file);
            var isSetup = IsSetup(file);
            var status = problem is not null ? LedgerInput.Rejected : isSetup ? LedgerInput.Setup : LedgerInput.Analysed;
            records.Add(new LedgerInput(file, sha, status, isNew, problem?.Message));
        }
        var record = _ledger.Append(new LedgerRecord
        {
            Series = Name,
            At = _time.GetUtcNow(),
            Setup = setupOk ? LedgerRecord.SetupOk : LedgerRecord.SetupRejected,
            Inputs = records,
            Pending = pending.ToList(),
            Outputs = HashOutputs(),
        });
        _log.Information("{Series}: record {Seq} written, {Runs} run(s) analysed ({Kept} unchanged, kept from the last pass), {Rejected} rejected, {Pending} pending, in {Ms} ms",
            Name, record.Sequence, result.Runs.Count, _runs.LastPass.Reused, result.Rejected.Count, pending.Count, clock.ElapsedMilliseconds);
        Announce(record, result);
        // An export that cannot be read is not an input of the record; say so once, when it first counts as rejected.
        foreach (var p in unreadable.Where(p => committed?.Pending.Contains(p.File) != true))
            _status($"{Name}/{p.File}: rejected — {p.Message}");
        // A file refused in the inbox (a folder, a pipe, a link out of the series) is never copied, so it is no input of
        // the record either: said once per refusal.
        foreach (var p in result.Rejected.Where(p => p.Input is { } f && _refused.ContainsKey(f)))
            if (_announcedRefusals.Add($"{p.Input}\n{p.Found}"))
                _status($"{Name}/{p.Input}: rejected — {p.Message}");
        return record;
    }

    /// <summary>One status line per input taken for the first time in this content version.</summary>
    private void Announce(LedgerRecord record, SeriesResult result)
    {
        foreach (var input in record.Inputs.Where(i => i.New))
        {
            if (input.Status == LedgerInput.Rejected)
                // a plate map with a problem in some wells leaves the others analysed: only a setup that stops the series waits
                _status(IsSetup(input.File) && (input.File is SeriesRunner.PlanFile or SeriesRunner.ConfigFile || result.Plan is null)
                    ? $"{Name}/{input.File}: rejected, the series waits for a fix — {input.Message}"
                    : $"{Name}/{input.File}: rejected — {input.Message}");
            else if (input.Status == LedgerInput.Analysed && result.Runs.Count(r => r.File == input.File) is var many and > 1)
            {
                // a plate export: one line for all its runs, not one per well
                var ids = result.Runs.Where(r => r.File == input.File).Select(r => r.Id).ToList();
                _status($"{Name}/{input.File}: analysed, {many} runs ({ids[0]} … {ids[^1]})");
            }
            else if (input.Status == LedgerInput.Analysed && result.Runs.FirstOrDefault(r => r.File == input.File) is { } run)
            {
                var h = run.Rates.Headline;
                _status($"{Name}/{input.File}: analysed, v0 = {ReportNumber.Measured(h.Value, h.StdError)} {h.Unit}");
            }
            else if (input.Status == LedgerInput.Setup)
                _status($"{Name}/{input.File}: taken");
        }
    }

    /// <summary>
    /// Removes run plots (plots/run-*.png) that belong to no analysed run now: a run rejected, dropped from the plan,
    /// or whose file name changed. Links are left alone (TraceKin never removes what it did not write).
    /// </summary>
    private void RemoveStalePlots(SeriesResult result)
    {
        var plotDir = Path.Combine(_outDir, "plots");
        if (!Directory.Exists(plotDir)) return;
        OutputPaths.EnsureFolder(_options.Out, plotDir);
        var names = RunFileNames.For(result.Plan!);
        var current = new HashSet<string>(result.Runs.Select(r => names.PlotFile(r.Id)), StringComparer.Ordinal);
        foreach (var png in new DirectoryInfo(plotDir).EnumerateFiles("run-*.png"))
        {
            if (current.Contains(png.Name) || png.LinkTarget is not null) continue;
            png.Delete();
        }
    }

    /// <summary>Temporary files of an atomic write that a killed process never renamed (only ever ours: the lock is held).</summary>
    private void RemoveOrphanTemporaries()
    {
        foreach (var f in OutputPaths.FilesBelow(_outDir, ".*.tmp"))
        {
            if (new FileInfo(f).LinkTarget is not null) continue;
            try { File.Delete(f); }
            catch (IOException) { }
        }
    }

    private List<LedgerOutput> HashOutputs()
    {
        var outputs = new List<LedgerOutput>();
        foreach (var f in OutputPaths.FilesBelow(_outDir).Order(StringComparer.Ordinal))
        {
            var rel = Path.GetRelativePath(_outDir, f).Replace('\\', '/');
            if (rel.Split('/').Any(part => part.StartsWith('.'))) continue;
            if (new FileInfo(f).LinkTarget is not null) continue; // not ours, and never read through
            try
            {
                using var fs = new FileStream(f, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete);
                outputs.Add(new LedgerOutput(rel, Convert.ToHexStringLower(SHA256.HashData(fs))));
            }
            catch (FileNotFoundException) { }
        }
        return outputs;
    }

    private static DateTimeOffset Earliest(DateTimeOffset? a, DateTimeOffset b) => a is { } x && x < b ? x : b;
}
