using System.Diagnostics;
using System.Globalization;
using TraceKin.Analysis;
using TraceKin.Ingest;
using TraceKin.Rates;
using TraceKin.Reports;
using TraceKin.Setup;
using TraceKin.Signal;
using TraceKin.Traces;

// Benchmark-only timings over one series folder (plan.csv + series.toml + exports):
//   TraceKin.Bench parse  SERIES [--workers N]   read and parse every planned export, nothing else
//   TraceKin.Bench stages SERIES [--workers N] [--no-plots]
//                                                time each stage per run (read, SHA-256, parse, convert, rates,
//                                                plot) and sum
//   TraceKin.Bench render SERIES                 CPU time per PNG (one thread) for ways of rendering the run plots
//   TraceKin.Bench render SERIES --parts         one run plot's thread CPU by part (law curve, build, each series
//                                                drawn alone, encoding); run with DOTNET_TieredCompilation=0
//   TraceKin.Bench ingest SERIES [--repeat N] [--read-all-bytes]
//                                                read (ExportBytes, or File.ReadAllBytes as SeriesRunner does), parse
//                                                and convert only, one thread, best of N passes per stage (thread CPU);
//                                                prints ms per file and a SHA-256 of every time, value and concentration
//                                                bit, so two builds can be checked to give identical numbers
//   TraceKin.Bench phases SERIES --out DIR [--plots] [--full]
//                                                the library path of `analyse` (no logging): time of the parallel
//                                                run stage and of each series writer, managed heap and GC counts
//   TraceKin.Bench memory SERIES --out DIR [--plots] [--wait FILE] [--breakdown]
//                                                the path of `analyse` (its options and SeriesOutputs, no logging):
//                                                live managed heap before and after the analysis (bytes a run
//                                                retains), after the outputs, and the peak working set; --wait
//                                                pauses after the analysis until FILE exists (for dotnet-gcdump);
//                                                --breakdown lists the bytes the result holds by path and by type;
//                                                --allocations samples what the outputs allocate, by type and heap
// Output is `key=value` lines on stdout so that bench/batch.sh can pick the numbers up.
if (args.Length < 2 || args[0] is not ("parse" or "stages" or "render" or "phases" or "ingest" or "memory"))
{
    Console.Error.WriteLine("usage: TraceKin.Bench parse|stages|render|phases|ingest|memory SERIES [--workers N] [--out DIR] [--full] [--repeat N]");
    return 2;
}
var folder = args[1];
var workers = Environment.ProcessorCount;
for (var i = 2; i < args.Length - 1; i++)
    if (args[i] == "--workers") workers = int.Parse(args[i + 1], CultureInfo.InvariantCulture);

var config = SeriesConfig.FromFile(Path.Combine(folder, SeriesRunner.ConfigFile));
var plan = Plan.FromFile(Path.Combine(folder, SeriesRunner.PlanFile));
var rows = plan.Rows;
var options = new ParallelOptions { MaxDegreeOfParallelism = workers };
var ci = CultureInfo.InvariantCulture;

// Warm up: JIT and the first render are one-off costs that a batch pays once; time them separately.
string? outDir = null;
for (var i = 2; i < args.Length - 1; i++)
    if (args[i] == "--out") outDir = args[i + 1];
var plotsWanted = args.Contains("--plots");
var full = args.Contains("--full");

var warm = Stopwatch.StartNew();
_ = ExportReader.FromFile(Path.Combine(folder, rows[0].File), config.Ingest);
var warmParse = warm.Elapsed.TotalSeconds;

if (args[0] == "parse")
{
    long bytes = 0, points = 0;
    var sw = Stopwatch.StartNew();
    Parallel.For(0, rows.Count, options, i =>
    {
        var path = Path.Combine(folder, rows[i].File);
        var export = ExportReader.FromFile(path, config.Ingest);
        Interlocked.Add(ref bytes, new FileInfo(path).Length);
        Interlocked.Add(ref points, export.Channels.Sum(c => (long)c.Count));
    });
    var s = sw.Elapsed.TotalSeconds;
    Console.WriteLine(string.Create(ci, $"runs={rows.Count}"));
    Console.WriteLine(string.Create(ci, $"workers={workers}"));
    Console.WriteLine(string.Create(ci, $"first_parse_seconds={warmParse:F3}"));
    Console.WriteLine(string.Create(ci, $"parse_seconds={s:F3}"));
    Console.WriteLine(string.Create(ci, $"parse_mb_per_second={bytes / 1e6 / s:F1}"));
    Console.WriteLine(string.Create(ci, $"points={points}"));
    return 0;
}

if (args[0] == "ingest")
{
    var repeat = 5;
    for (var i = 2; i < args.Length - 1; i++)
        if (args[i] == "--repeat") repeat = int.Parse(args[i + 1], CultureInfo.InvariantCulture);
    var paths = rows.Select(r => Path.Combine(folder, r.File)).ToArray();
    var readAllBytes = args.Contains("--read-all-bytes");
    // warm-up pass over every file: JIT tiers settle before anything is timed
    foreach (var (row, path) in rows.Zip(paths))
        _ = Conversion.ToConcentration(ExportReader.FromBytes(File.ReadAllBytes(path), row.File, config.Ingest), row, config.Signal, config.File);
    double bestRead = double.MaxValue, bestParse = double.MaxValue, bestConvert = double.MaxValue, bestCpu = double.MaxValue;
    string digest = "";
    var me = Process.GetCurrentProcess();
    for (var pass = 0; pass < repeat; pass++)
    {
        long tr = 0, tp = 0, tc = 0, cr = 0, cp = 0, cc = 0;
        using var sha = System.Security.Cryptography.IncrementalHash.CreateHash(System.Security.Cryptography.HashAlgorithmName.SHA256);
        var gen0 = GC.CollectionCount(0);
        me.Refresh();
        var cpu0 = me.TotalProcessorTime;
        for (var i = 0; i < rows.Count; i++)
        {
            var (t0, u0) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
            using var lease = readAllBytes ? null : ExportBytes.Read(paths[i]);
            var bytes = lease?.Memory ?? File.ReadAllBytes(paths[i]);
            var (t1, u1) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
            var export = ExportReader.FromBytes(bytes, rows[i].File, config.Ingest);
            var (t2, u2) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
            var converted = Conversion.ToConcentration(export, rows[i], config.Signal, config.File);
            var (t3, u3) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
            tr += t1 - t0;
            tp += t2 - t1;
            tc += t3 - t2;
            cr += u1 - u0;
            cp += u2 - u1;
            cc += u3 - u2;
            var c = converted.Concentration;
            sha.AppendData(System.Runtime.InteropServices.MemoryMarshal.AsBytes(c.Times.AsSpan()));
            sha.AppendData(System.Runtime.InteropServices.MemoryMarshal.AsBytes(c.Values.AsSpan()));
            foreach (var ch in export.Channels) sha.AppendData(System.Runtime.InteropServices.MemoryMarshal.AsBytes(ch.Values.AsSpan()));
            sha.AppendData(System.Text.Encoding.UTF8.GetBytes(string.Join("|", export.Detected.Select(d => d.Key + "=" + d.Value)) +
                string.Join("|", converted.UncertaintyBudget.Select(d => d.Key + "=" + d.Value.ToString("R", ci))) + converted.RelativeSystematicUncertainty.ToString("R", ci)));
        }
        me.Refresh();
        var cpu = (me.TotalProcessorTime - cpu0).TotalSeconds;
        digest = Convert.ToHexStringLower(sha.GetHashAndReset());
        var n = (double)rows.Count;
        double Ms(long ticks) => ticks * 1000.0 / Stopwatch.Frequency / n;
        double CpuMs(long ns) => ns / 1e6 / n;
        Console.WriteLine(string.Create(ci, $"pass={pass} wall ms/file: read={Ms(tr):F3} parse={Ms(tp):F3} convert={Ms(tc):F3}; thread CPU ms/file: read={CpuMs(cr):F3} parse={CpuMs(cp):F3} convert={CpuMs(cc):F3}; process CPU ms/file={cpu * 1000 / n:F3} gen0_gcs={GC.CollectionCount(0) - gen0}"));
        bestRead = Math.Min(bestRead, CpuMs(cr));
        bestParse = Math.Min(bestParse, CpuMs(cp));
        bestConvert = Math.Min(bestConvert, CpuMs(cc));
        bestCpu = Math.Min(bestCpu, cpu * 1000 / n);
    }
    Console.WriteLine(string.Create(ci, $"runs={rows.Count}"));
    Console.WriteLine(string.Create(ci, $"best_read_cpu_ms_per_file={bestRead:F3}"));
    Console.WriteLine(string.Create(ci, $"best_parse_cpu_ms_per_file={bestParse:F3}"));
    Console.WriteLine(string.Create(ci, $"best_convert_cpu_ms_per_file={bestConvert:F3}"));
    Console.WriteLine(string.Create(ci, $"best_process_cpu_ms_per_file={bestCpu:F3}"));
    Console.WriteLine(string.Create(ci, $"load_average={File.ReadAllText("/proc/loadavg").Split(' ')[0]}"));
    Console.WriteLine($"digest={digest}");
    return 0;
}

if (args[0] == "memory")
{
    outDir ??= Path.Combine(Path.GetTempPath(), "tracekin-bench-memory");
    Directory.CreateDirectory(outDir);
    string? wait = null;
    for (var i = 2; i < args.Length - 1; i++)
        if (args[i] == "--wait") wait = args[i + 1];
    var proc = Process.GetCurrentProcess();
    var before = GC.GetTotalMemory(true);
    var sw = Stopwatch.StartNew();
    SeriesResult result;
    IReadOnlyList<OutputFailure> failed;
    using (var outputs = new SeriesOutputs(outDir, plotsWanted))
    {
        // as AnalyseCommand.Analyse sets them
        result = SeriesRunner.Analyse(folder, new AnalysisOptions
        {
            Workers = workers,
            RunSink = outputs.RunSink,
            Retention = TraceRetention.None,
            KeepEveryFitUpTo = ReportHtml.MaxListedRuns,
        });
        var analysed = sw.Elapsed.TotalSeconds;
        var after = GC.GetTotalMemory(true);
        proc.Refresh();
        Console.WriteLine(string.Create(ci, $"runs={result.Runs.Count}"));
        Console.WriteLine(string.Create(ci, $"analyse_seconds={analysed:F3}"));
        Console.WriteLine(string.Create(ci, $"heap_before_mb={before / 1e6:F1}"));
        Console.WriteLine(string.Create(ci, $"heap_after_analyse_live_mb={after / 1e6:F1}"));
        Console.WriteLine(string.Create(ci, $"retained_bytes_per_run={(after - before) / (double)Math.Max(1, result.Runs.Count):F0}"));
        Console.WriteLine(string.Create(ci, $"peak_working_set_after_analyse_mb={proc.PeakWorkingSet64 / 1048576.0:F0}"));
        void GcInfo(string when)
        {
            var info = GC.GetGCMemoryInfo(GCKind.Any);
            Console.WriteLine(string.Create(ci, $"gc_{when}: heap_mb={info.HeapSizeBytes / 1e6:F1} fragmented_mb={info.FragmentedBytes / 1e6:F1} committed_mb={info.TotalCommittedBytes / 1e6:F1} gen0_budget_after_mb={info.GenerationInfo[0].SizeAfterBytes / 1e6:F1} gen0_before_mb={info.GenerationInfo[0].SizeBeforeBytes / 1e6:F1} max_committed_mb={GC.GetGCMemoryInfo(GCKind.Ephemeral).TotalCommittedBytes / 1e6:F1}"));
        }
        GcInfo("after_analyse");
        if (args.Contains("--breakdown"))
        {
            var walk = new HeapWalk();
            foreach (var run in result.Runs) walk.Walk(run, "run");
            if (result.Plan is { } p) walk.Walk(p, "plan");
            if (result.Findings is { } f) walk.Walk(f, "findings");
            walk.Walk(result.Warnings, "warnings");
            walk.Walk(result.Replicates, "replicates");
            var n = (double)Math.Max(1, result.Runs.Count);
            Console.WriteLine(string.Create(ci, $"walked_mb={walk.Bytes / 1e6:F1}"));
            foreach (var (path, (bytes, count)) in walk.ByPath.OrderByDescending(kv => kv.Value.Bytes).Take(45))
                Console.WriteLine(string.Create(ci, $"path {path}: {bytes / n:F0} B/run, {count / n:F1} objects/run"));
            foreach (var (path, (bytes, count)) in walk.RepeatedText.OrderByDescending(kv => kv.Value.Bytes).Take(20))
                Console.WriteLine(string.Create(ci, $"repeated text {path}: {bytes / n:F0} B/run, {count / n:F1} strings/run"));
            foreach (var (type, (bytes, count)) in walk.ByType.OrderByDescending(kv => kv.Value.Bytes).Take(35))
                Console.WriteLine(string.Create(ci, $"type {type}: {bytes / n:F0} B/run, {count / n:F1} objects/run"));
        }
        {
            // The series stage again on the same per-run results: what it allocates and how much the heap grows meanwhile.
            var points = result.Runs.Select(r => new TraceKin.Series.RunPoint(r.Id, r.Rates.Headline.Value, r.Rates.Headline.StdError, r.Plan.InitialConcentrations, r.Plan.TemperatureK)).ToList();
            using var seriesSampler = args.Contains("--allocations") ? new AllocationSampler() : null;
            var allocated = GC.GetTotalAllocatedBytes(true);
            var clock = Stopwatch.StartNew();
            seriesSampler?.Start();
            var findings = TraceKin.Series.OrderAnalysis.Analyse(points, config.Model);
            seriesSampler?.Stop();
            seriesSampler?.Print("series", ci);
            Console.WriteLine(string.Create(ci, $"series_stage_again_seconds={clock.Elapsed.TotalSeconds:F3} allocated_mb={(GC.GetTotalAllocatedBytes(true) - allocated) / 1e6:F1} findings_live_mb={(GC.GetTotalMemory(true) - after) / 1e6:F1}"));
            GC.KeepAlive(findings);
        }
        if (wait is not null)
        {
            Console.WriteLine($"pid={Environment.ProcessId} waiting for {wait}");
            while (!File.Exists(wait)) Thread.Sleep(200);
        }
        using var sampler = args.Contains("--allocations") ? new AllocationSampler() : null;
        GC.Collect(2, GCCollectionMode.Aggressive, blocking: true, compacting: true);
        GcInfo("before_write");
        sw.Restart();
        var allocatedBefore = GC.GetTotalAllocatedBytes(true);
        sampler?.Start();
        failed = outputs.Write(result);
        sampler?.Stop();
        Console.WriteLine(string.Create(ci, $"write_allocated_mb={(GC.GetTotalAllocatedBytes(true) - allocatedBefore) / 1e6:F1}"));
        sampler?.Print("write", ci);
        GcInfo("after_write");
        Console.WriteLine(string.Create(ci, $"write_seconds={sw.Elapsed.TotalSeconds:F3}"));
    }
    Console.WriteLine(string.Create(ci, $"outputs_not_written={failed.Count}"));
    Console.WriteLine(string.Create(ci, $"heap_after_write_live_mb={GC.GetTotalMemory(true) / 1e6:F1}"));
    proc.Refresh();
    Console.WriteLine(string.Create(ci, $"peak_working_set_mb={proc.PeakWorkingSet64 / 1048576.0:F0}"));
    Console.WriteLine(string.Create(ci, $"gc_counts={GC.CollectionCount(0)}/{GC.CollectionCount(1)}/{GC.CollectionCount(2)}"));
    Console.WriteLine(string.Create(ci, $"load_average={File.ReadAllText("/proc/loadavg").Split(' ')[0]}"));
    GC.KeepAlive(result);
    return 0;
}

if (args[0] == "phases")
{
    outDir ??= Path.Combine(Path.GetTempPath(), "tracekin-bench-phases");
    Directory.CreateDirectory(outDir);
    var proc = Process.GetCurrentProcess();
    var sw = Stopwatch.StartNew();
    var images = plotsWanted ? new ReportPlots(Path.Combine(outDir, SeriesOutputs.PlotFolder)) : null;
    using var runPlot = plotsWanted ? new RunPlot(outDir) { Keep = images } : null;
    var result = SeriesRunner.Analyse(folder, new AnalysisOptions
    {
        Workers = workers,
        RunSink = runPlot,
        Retention = full ? TraceRetention.Full : TraceRetention.Display,
    });
    Console.WriteLine(string.Create(ci, $"analyse_seconds={sw.Elapsed.TotalSeconds:F3}"));
    if (result.Runs.Count > 0)
    {
        // What a retained run still holds, array by array (to find per-point data that escapes thinning).
        var r0 = result.Runs[0];
        Console.WriteLine(string.Create(ci, $"retained_run0=channels {string.Join("/", r0.Export.Channels.Select(c => c.Count))} concentration {r0.Converted.Concentration.Count} stdErrors {r0.Converted.StdErrors?.Length ?? 0} estimates {string.Join("/", r0.Rates.Estimates.Select(e => e.Fitted.Length))} fits {string.Join("/", r0.Rates.Fits.Select(f => $"{f.Fitted.Length}:{f.Fit.Residuals.Length}"))} spikes {r0.Rates.Spikes.Count}"));
    }
    Console.WriteLine(string.Create(ci, $"heap_after_analyse_mb={GC.GetTotalMemory(false) / 1e6:F1}"));
    Console.WriteLine(string.Create(ci, $"heap_after_analyse_live_mb={GC.GetTotalMemory(true) / 1e6:F1}"));
    Console.WriteLine(string.Create(ci, $"pair_ratios={result.Findings?.PairRatios.Count ?? 0}"));
    // The series stage alone, run again on the same per-run results (it is the serial tail of the run stage).
    var points = result.Runs.Select(r => new TraceKin.Series.RunPoint(r.Id, r.Rates.Headline.Value, r.Rates.Headline.StdError, r.Plan.InitialConcentrations, r.Plan.TemperatureK)).ToList();
    sw.Restart();
    _ = TraceKin.Series.OrderAnalysis.Analyse(points, config.Model);
    Console.WriteLine(string.Create(ci, $"series_stage_again_seconds={sw.Elapsed.TotalSeconds:F3}"));
    // Each output of SeriesOutputs.Write timed alone, one after the other (analyse writes them side by side).
    foreach (var writer in ReportSet.Numbers(plotsWanted))
    {
        sw.Restart();
        writer.Write(result, outDir);
        Console.WriteLine(string.Create(ci, $"write_{writer.GetType().Name}_seconds={sw.Elapsed.TotalSeconds:F3}"));
    }
    foreach (var plot in plotsWanted ? ReportSet.SeriesPlots() : [])
    {
        sw.Restart();
        if (plot.Draw(result) is { } png)
        {
            AtomicFile.WriteAllBytes(Path.Combine(outDir, SeriesOutputs.PlotFolder, plot.FileName), png, outDir);
            images!.AddSeries(plot.FileName, png);
        }
        Console.WriteLine(string.Create(ci, $"write_{plot.GetType().Name}_seconds={sw.Elapsed.TotalSeconds:F3}"));
    }
    sw.Restart();
    ReportHtml.Write(result, outDir, images);
    Console.WriteLine(string.Create(ci, $"write_{nameof(ReportHtml)}_seconds={sw.Elapsed.TotalSeconds:F3}"));
    proc.Refresh();
    Console.WriteLine(string.Create(ci, $"peak_working_set_mb={proc.PeakWorkingSet64 / 1048576.0:F0}"));
    Console.WriteLine(string.Create(ci, $"gc_counts={GC.CollectionCount(0)}/{GC.CollectionCount(1)}/{GC.CollectionCount(2)}"));
    Console.WriteLine(string.Create(ci, $"cpu_seconds={proc.TotalProcessorTime.TotalSeconds:F2}"));
    return 0;
}

if (args[0] == "render" && args.Contains("--parts"))
{
    // Where one run plot's CPU goes, thread CPU per phase, on one thread, best of 5 passes over the runs (up to 200):
    // the chosen law at every sample (first use of the lazy curve), the model build (decimation, bands), OxyPlot's
    // layout (Update and the measuring in Render are not separable: "draw" is layout + rasterisation), and the PNG
    // encoding (the whole PngRenderer.Render less a draw of the same model into a bitmap of the same format).
    var runs = rows.Take(200).Select(r => SeriesRunner.AnalyseRun(folder, r, config).Run!).ToList();
    long law = 0;
    foreach (var r in runs) { var u = ThreadCpu.Nanoseconds(); _ = r.Rates.Headline.Fitted; law += ThreadCpu.Nanoseconds() - u; }
    using var renderer = new PngRenderer();
    using var bitmap = new SkiaSharp.SKBitmap(new SkiaSharp.SKImageInfo(PlotStyle.Width, PlotStyle.Height, SkiaSharp.SKImageInfo.PlatformColorType, SkiaSharp.SKAlphaType.Opaque));
    using var context = new OxyPlot.SkiaSharp.SkiaRenderContext { RenderTarget = OxyPlot.SkiaSharp.RenderTarget.PixelGraphic, DpiScale = 1, UseTextShaping = false };
    byte[] Draw(OxyPlot.PlotModel model)
    {
        using var canvas = new SkiaSharp.SKCanvas(bitmap);
        context.SkCanvas = canvas;
        ((OxyPlot.IPlotModel)model).Update(true);
        canvas.Clear(SkiaSharp.SKColors.White);
        ((OxyPlot.IPlotModel)model).Render(context, new OxyPlot.OxyRect(0, 0, PlotStyle.Width, PlotStyle.Height));
        canvas.Flush();
        context.SkCanvas = null;
        return [];
    }
    _ = renderer.Render(RunPlot.Build(runs[0])); _ = Draw(RunPlot.Build(runs[0]));
    double best(Func<RunResult, long> part)
    {
        var b = double.MaxValue;
        for (var pass = 0; pass < 5; pass++)
        {
            long sum = 0;
            foreach (var r in runs) sum += part(r);
            b = Math.Min(b, sum / 1e6 / runs.Count);
        }
        return b;
    }
    long Cpu(Action a) { var u = ThreadCpu.Nanoseconds(); a(); return ThreadCpu.Nanoseconds() - u; }
    long bytes = 0;
    var build = best(r => Cpu(() => RunPlot.Build(r)));
    var draw = best(r => { var m = RunPlot.Build(r); return Cpu(() => Draw(m)); });
    var whole = best(r => { var m = RunPlot.Build(r); return Cpu(() => bytes += renderer.Render(m).Length); });
    var axes = best(r => { var m = RunPlot.Build(r); m.Series.Clear(); m.Annotations.Clear(); m.Legends.Clear(); return Cpu(() => Draw(m)); });
    var model0 = RunPlot.Build(runs[0]);
    var parts = new List<(string, double)>();
    for (var k = 0; k < model0.Series.Count; k++)
    {
        var keep = k;
        parts.Add(($"draw_axes_and_series_{keep}_{model0.Series[keep].GetType().Name}_ms", best(r => { var m = RunPlot.Build(r); var s = m.Series[keep]; m.Series.Clear(); m.Annotations.Clear(); m.Legends.Clear(); m.Series.Add(s); return Cpu(() => Draw(m)); })));
    }
    for (var k = 0; k < model0.Annotations.Count; k++)
    {
        var keep = k;
        parts.Add(($"draw_axes_and_annotation_{keep}_{model0.Annotations[keep].GetType().Name}_ms", best(r => { var m = RunPlot.Build(r); var a = m.Annotations[keep]; m.Series.Clear(); m.Annotations.Clear(); m.Legends.Clear(); m.Annotations.Add(a); return Cpu(() => Draw(m)); })));
    }
    parts.Add(("draw_without_legend_ms", best(r => { var m = RunPlot.Build(r); m.Legends.Clear(); return Cpu(() => Draw(m)); })));
    foreach (var (name, ms) in parts) Console.WriteLine(string.Create(ci, $"{name}={ms:F3}"));
    var alloc0 = GC.GetAllocatedBytesForCurrentThread();
    foreach (var r in runs) _ = renderer.Render(RunPlot.Build(r));
    var allocated = (GC.GetAllocatedBytesForCurrentThread() - alloc0) / (double)runs.Count;
    Console.WriteLine(string.Create(ci, $"runs={runs.Count}"));
    Console.WriteLine(string.Create(ci, $"allocated_kb_per_plot={allocated / 1024:F0}"));
    Console.WriteLine(string.Create(ci, $"law_at_every_sample_ms={law / 1e6 / runs.Count:F3}"));
    Console.WriteLine(string.Create(ci, $"build_ms={build:F3}"));
    Console.WriteLine(string.Create(ci, $"draw_ms={draw:F3}"));
    Console.WriteLine(string.Create(ci, $"draw_axes_text_only_ms={axes:F3}"));
    Console.WriteLine(string.Create(ci, $"render_png_ms={whole:F3}"));
    Console.WriteLine(string.Create(ci, $"encode_ms={whole - draw:F3}"));
    Console.WriteLine(string.Create(ci, $"kb_per_png={bytes / 1024.0 / runs.Count / 5:F1}"));
    Console.WriteLine(string.Create(ci, $"total_ms={law / 1e6 / runs.Count + build + whole:F3}"));
    return 0;
}

if (args[0] == "render")
{
    var models = rows.Take(40).Select(r => SeriesRunner.AnalyseRun(folder, r, config).Run!).ToList();
    var proc = System.Diagnostics.Process.GetCurrentProcess();
    void Time(string name, Func<RunResult, byte[]> render)
    {
        _ = render(models[0]);
        long size = 0;
        proc.Refresh();
        var cpu0 = proc.TotalProcessorTime;
        foreach (var m in models) size += render(m).Length;
        proc.Refresh();
        var ms = (proc.TotalProcessorTime - cpu0).TotalMilliseconds / models.Count;
        Console.WriteLine(string.Create(ci, $"{name}_cpu_ms_per_png={ms:F1} kb_per_png={size / 1024.0 / models.Count:F0}"));
    }
    {
        var r0 = models[0];
        double? reference = r0.Plan.InitialConcentrations.TryGetValue(r0.Converted.Species, out var a0) ? a0 : null;
        Time("rates_x1", r => { _ = RateAnalysis.Analyse(r.Converted.Concentration, r.Converted.Coefficient, r.Plan.InitialConcentrations[r.Converted.Species], config.Rates, r.File); return []; });
        Time("sha256_x1", r => { _ = System.Security.Cryptography.SHA256.HashData(File.ReadAllBytes(Path.Combine(folder, r.File))); return []; });
        Time("read_x1", r => { _ = File.ReadAllBytes(Path.Combine(folder, r.File)); return []; });
        var bytes0 = File.ReadAllBytes(Path.Combine(folder, r0.File));
        Time("parse_x1", r => { _ = ExportReader.FromBytes(bytes0, r0.File, config.Ingest); return []; });
    }
    Time("fresh_exporter", r => { using var s = new MemoryStream(); new OxyPlot.SkiaSharp.PngExporter { Width = 900, Height = 650 }.Export(RunPlot.Build(r), s); return s.ToArray(); });
    foreach (var (z, shaping, filter, opaque) in new[] { (6, true, SkiaSharp.SKPngEncoderFilterFlags.AllFilters, false), (1, true, SkiaSharp.SKPngEncoderFilterFlags.Up, false),
        (1, true, SkiaSharp.SKPngEncoderFilterFlags.Up, true), (1, false, SkiaSharp.SKPngEncoderFilterFlags.Up, true), (3, true, SkiaSharp.SKPngEncoderFilterFlags.Up, true), (1, true, SkiaSharp.SKPngEncoderFilterFlags.Sub, true), (1, true, SkiaSharp.SKPngEncoderFilterFlags.None, true), (3, true, SkiaSharp.SKPngEncoderFilterFlags.Up, true) })
    {
        using var renderer = new PngRenderer(zlibLevel: z, textShaping: shaping, filter: filter, opaque: opaque, ownEncoder: false);
        Time($"reused_zlib{z}_shaping{(shaping ? "on" : "off")}_{filter}_{(opaque ? "opaque" : "alpha")}", r => renderer.Render(RunPlot.Build(r)));
    }
    using (var own = new PngRenderer())
        Time("reused_own_encoder_rgb_up_fastest", r => own.Render(RunPlot.Build(r)));
    using (var renderer = new PngRenderer())
    {
        Time("build_only", r => { _ = RunPlot.Build(r); return []; });
        Time("axes_text_only", r => { var m = RunPlot.Build(r); m.Series.Clear(); m.Annotations.Clear(); return renderer.Render(m); });
        for (var k = 0; k < 4; k++)
        {
            var keep = k;
            Time($"series_{keep}_only", r => { var m = RunPlot.Build(r); var s = m.Series[keep]; m.Series.Clear(); m.Series.Add(s); return renderer.Render(m); });
        }
    }
    return 0;
}

// stages: the same work SeriesRunner does per run, with a stopwatch and the thread's CPU clock around each step
// (summed over workers, so the sums can exceed the wall time). --no-plots leaves out the plot steps, as
// `analyse --no-plots` does.
long tRead = 0, tHash = 0, tParse = 0, tConvert = 0, tRates = 0, tBuild = 0, tRender = 0;
long cRead = 0, cHash = 0, cParse = 0, cConvert = 0, cRates = 0;
var stagePlots = !args.Contains("--no-plots");
var first = Stopwatch.StartNew();
_ = RunPlot.Render(SeriesRunner.AnalyseRun(folder, rows[0], config).Run!);
var firstRender = first.Elapsed.TotalSeconds;
var wall = Stopwatch.StartNew();
Parallel.For(0, rows.Count, options, i =>
{
    var row = rows[i];
    var (t0, u0) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
    using var bytes = ExportBytes.Read(Path.Combine(folder, row.File));
    var (t1, u1) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
    _ = System.Security.Cryptography.SHA256.HashData(bytes.Memory.Span);
    var (th, uh) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
    var export = ExportReader.FromBytes(bytes.Memory, row.File, config.Ingest);
    var (t2, u2) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
    var converted = Conversion.ToConcentration(export, row, config.Signal, config.File);
    var (t3, u3) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
    // The reference amount and the partner's [B]0 as SeriesRunner.AnalyseRun takes them from the plan.
    double? reference = row.InitialConcentrations.TryGetValue(converted.Species, out var c0) && converted.Coefficient < 0 ? c0 : null;
    var others = row.InitialConcentrations.Where(kv => kv.Key != converted.Species && kv.Value > 0).ToList();
    double? partner = reference is not null && others.Count == 1 ? others[0].Value : null;
    var rates = RateAnalysis.Analyse(converted.Concentration, converted.Coefficient, reference, config.Rates, row.File, partner);
    var (t4, u4) = (Stopwatch.GetTimestamp(), ThreadCpu.Nanoseconds());
    long t5 = t4, t6 = t4;
    if (stagePlots)
    {
        var run = new RunResult(row, "", export, converted, rates, []);
        var model = RunPlot.Build(run);
        t5 = Stopwatch.GetTimestamp();
        _ = PlotStyle.ToPng(model);
        t6 = Stopwatch.GetTimestamp();
    }
    Interlocked.Add(ref cRead, u1 - u0);
    Interlocked.Add(ref cHash, uh - u1);
    Interlocked.Add(ref cParse, u2 - uh);
    Interlocked.Add(ref cConvert, u3 - u2);
    Interlocked.Add(ref cRates, u4 - u3);
    Interlocked.Add(ref tRead, t1 - t0);
    Interlocked.Add(ref tHash, th - t1);
    Interlocked.Add(ref tParse, t2 - th);
    Interlocked.Add(ref tConvert, t3 - t2);
    Interlocked.Add(ref tRates, t4 - t3);
    Interlocked.Add(ref tBuild, t5 - t4);
    Interlocked.Add(ref tRender, t6 - t5);
});
var wallS = wall.Elapsed.TotalSeconds;
double Sec(long ticks) => ticks / (double)Stopwatch.Frequency;
Console.WriteLine(string.Create(ci, $"runs={rows.Count}"));
Console.WriteLine(string.Create(ci, $"workers={workers}"));
Console.WriteLine(string.Create(ci, $"first_run_with_plot_seconds={firstRender:F3}"));
Console.WriteLine(string.Create(ci, $"wall_seconds={wallS:F3}"));
Console.WriteLine(string.Create(ci, $"sum_read_seconds={Sec(tRead):F3}"));
Console.WriteLine(string.Create(ci, $"sum_sha256_seconds={Sec(tHash):F3}"));
Console.WriteLine(string.Create(ci, $"sum_parse_seconds={Sec(tParse):F3}"));
Console.WriteLine(string.Create(ci, $"sum_convert_seconds={Sec(tConvert):F3}"));
Console.WriteLine(string.Create(ci, $"sum_rates_seconds={Sec(tRates):F3}"));
// thread CPU time (Linux; 0 elsewhere): what the stage cost itself, whoever else shares the cores
Console.WriteLine(string.Create(ci, $"sum_cpu_read_seconds={cRead / 1e9:F3}"));
Console.WriteLine(string.Create(ci, $"sum_cpu_sha256_seconds={cHash / 1e9:F3}"));
Console.WriteLine(string.Create(ci, $"sum_cpu_parse_seconds={cParse / 1e9:F3}"));
Console.WriteLine(string.Create(ci, $"sum_cpu_convert_seconds={cConvert / 1e9:F3}"));
Console.WriteLine(string.Create(ci, $"sum_cpu_rates_seconds={cRates / 1e9:F3}"));
if (stagePlots)
{
    Console.WriteLine(string.Create(ci, $"sum_plot_build_seconds={Sec(tBuild):F3}"));
    Console.WriteLine(string.Create(ci, $"sum_png_render_seconds={Sec(tRender):F3}"));
}
return 0;

/// <summary>CPU time of the calling thread (clock_gettime CLOCK_THREAD_CPUTIME_ID, Linux); 0 where unavailable.</summary>
internal static class ThreadCpu
{
    private struct TimeSpec
    {
        public long Seconds;
        public long Nanos;
    }

    [System.Runtime.InteropServices.DllImport("libc", EntryPoint = "clock_gettime")]
    private static extern int ClockGetTime(int clock, out TimeSpec time);

    public static long Nanoseconds()
    {
        if (!OperatingSystem.IsLinux()) return 0;
        return ClockGetTime(3, out var t) == 0 ? t.Seconds * 1_000_000_000 + t.Nanos : 0;
    }
}
