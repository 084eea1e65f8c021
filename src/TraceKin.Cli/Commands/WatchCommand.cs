using System.CommandLine;
using System.Runtime.InteropServices;
using TraceKin.Analysis;
using TraceKin.Cli.Watch;
using TraceKin.Reports;

namespace TraceKin.Cli.Commands;

/// <summary>
/// `tracekin watch INBOX --out OUT`: every series folder in the inbox is analysed as its exports arrive and settle,
/// and again when one changes; a ledger in OUT makes restarts neither repeat nor skip work.
/// </summary>
public static class WatchCommand
{
    public static Command Create()
    {
        var inbox = new Argument<DirectoryInfo>("inbox") { Description = "Folder whose sub-folders are series folders (plan.csv, series.toml, exports)." };
        var output = new Option<DirectoryInfo>("--out", "-o") { Description = "Results folder: one sub-folder per series, the ledger and the log.", Required = true };
        var once = new Option<bool>("--once") { Description = "Process what is in the inbox now, then exit (0 all analysed, 2 some input rejected or a series failed)." };
        var settle = new Option<int>("--settle-ms") { Description = "How long a file must stay unchanged before it is taken, in ms (default 2000).", DefaultValueFactory = _ => 2000 };
        var rescan = new Option<int>("--rescan-ms") { Description = "How often the whole inbox is looked at again, in ms (default 30000).", DefaultValueFactory = _ => 30000 };
        var jobs = new Option<int>("--jobs") { Description = "Series analysed at once (default 2).", DefaultValueFactory = _ => 2 };
        var workers = new Option<int>("--workers") { Description = "Runs of one series analysed at once (default: number of cores).", DefaultValueFactory = _ => Environment.ProcessorCount };
        var noPlots = new Option<bool>("--no-plots") { Description = "Skip the PNG plots (numbers only)." };
        var decimalComma = new Option<bool>("--decimal-comma") { Description = "Write the CSV tables with ';' between cells and decimal commas (for spreadsheets in such locales)." };
        var verbose = new Option<bool>("--verbose") { Description = "Log each run's progress to the log file." };
        var cmd = new Command("watch", "Watch an inbox of series folders: analyse each export once it has settled, re-analyse on change, never lose or repeat work.")
        {
            inbox, output, once, settle, rescan, jobs, workers, noPlots, decimalComma, verbose,
        };
        cmd.SetAction(pr =>
        {
            if (pr.GetValue(settle) < 0 || pr.GetValue(rescan) < 1 || pr.GetValue(jobs) < 1 || pr.GetValue(workers) < 1)
            {
                Console.Error.WriteLine("tracekin watch: --settle-ms must be ≥ 0, and --rescan-ms, --jobs and --workers ≥ 1");
                return ExitCodes.Usage;
            }
            var options = new WatchOptions
            {
                Inbox = pr.GetValue(inbox)!.FullName,
                Out = pr.GetValue(output)!.FullName,
                Once = pr.GetValue(once),
                Settle = TimeSpan.FromMilliseconds(pr.GetValue(settle)),
                Rescan = TimeSpan.FromMilliseconds(pr.GetValue(rescan)),
                Jobs = pr.GetValue(jobs),
                Workers = pr.GetValue(workers),
                Plots = !pr.GetValue(noPlots),
                Csv = pr.GetValue(decimalComma) ? TraceKin.Reports.CsvStyle.DecimalComma : TraceKin.Reports.CsvStyle.Standard,
            };
            return Run(options, pr.GetValue(verbose));
        });
        return cmd;
    }

    public static int Run(WatchOptions options, bool verbose = false, TextWriter? error = null)
    {
        error ??= Console.Error;
        if (!Directory.Exists(options.Inbox))
        {
            error.WriteLine($"tracekin watch: inbox folder not found: {options.Inbox}");
            return ExitCodes.Usage;
        }
        var inboxRoot = Path.TrimEndingDirectorySeparator(options.Inbox) + Path.DirectorySeparatorChar;
        if ((Path.TrimEndingDirectorySeparator(options.Out) + Path.DirectorySeparatorChar).StartsWith(inboxRoot, StringComparison.Ordinal))
        {
            error.WriteLine("tracekin watch: --out must not be inside the inbox (the watcher would see its own outputs)");
            return ExitCodes.Usage;
        }
        OutputLock? held;
        try
        {
            held = OutputLock.TryTake(options.Out, "watch", out var refusal);
            if (held is null)
            {
                error.WriteLine($"tracekin watch: {refusal}");
                return ExitCodes.Usage;
            }
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            error.WriteLine($"tracekin watch: cannot use --out {options.Out}: {ex.Message}");
            return ExitCodes.Usage;
        }
        using (held)
        {
            Serilog.Core.Logger log;
            Ledger ledger;
            try
            {
                CheckOutputs(options.Out);
                log = WatchLog.Create(options.Out, verbose);
                try { ledger = Ledger.Open(options.Out); }
                catch { log.Dispose(); throw; }
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                error.WriteLine($"tracekin watch: cannot write into --out {options.Out}: {ex.Message}");
                return ExitCodes.CannotWrite;
            }
            using (log)
            using (ledger)
                return Serve(options, log, ledger, error);
        }
    }

    /// <summary>
    /// Refuses (with <see cref="TraceKin.Reports.OutputPathException"/>) when one of the watcher's own files in OUT is
    /// a link or of the wrong kind: the ledger, the log files, the snapshot folder.
    /// </summary>
    public static void CheckOutputs(string outDir)
    {
        OutputPaths.CheckFile(Path.Combine(outDir, Ledger.FileName));
        foreach (var entry in new DirectoryInfo(outDir).EnumerateFileSystemInfos("tracekin-watch-*.log"))
            OutputPaths.CheckFile(entry.FullName);
        OutputPaths.CheckFile(Path.Combine(outDir, WatchLog.TodayFile()));
        OutputPaths.EnsureFolder(outDir, Path.Combine(outDir, SeriesWatch.WorkFolder));
    }

    private static int Serve(WatchOptions options, Serilog.Core.Logger log, Ledger ledger, TextWriter error)
    {
        if (ledger.IgnoredLines > 0)
            log.Warning("ignored {Count} incomplete line(s) of the ledger {Ledger} (an interrupted write)", ledger.IgnoredLines, ledger.Path);
        log.Information("TraceKin {Version}: watching {Inbox}, results in {Out} (settle {Settle} ms{Once})",
            SeriesRunner.ToolVersion, options.Inbox, options.Out, options.Settle.TotalMilliseconds, options.Once ? ", once" : "");

        using var stop = new CancellationTokenSource();
        using var onInt = PosixSignalRegistration.Create(PosixSignal.SIGINT, ctx => { ctx.Cancel = true; stop.Cancel(); });
        using var onTerm = PosixSignalRegistration.Create(PosixSignal.SIGTERM, ctx => { ctx.Cancel = true; stop.Cancel(); });
        var loop = new WatchLoop(options, ledger, TimeProvider.System, log, line =>
        {
            lock (error) error.WriteLine(Traces.PrintableText.Escape(line));
            log.Information("{Status}", line);
        });
        if (!options.Once) error.WriteLine($"tracekin watch: watching {options.Inbox} (Ctrl+C to stop)");
        loop.RunAsync(stop.Token).GetAwaiter().GetResult();
        log.Information("stopped after {Count} analysis pass(es)", loop.Analyses);

        // Exit 2 when some input of a series is rejected, or a series could not be analysed or written at all.
        foreach (var name in loop.FailedSeries)
            log.Error("{Series}: its last pass failed; its results are missing or out of date (see the messages above)", name);
        return loop.FailedSeries.Count == 0 && loop.RejectedInputs == 0 ? ExitCodes.Ok : ExitCodes.SomeRejected;
    }
}
