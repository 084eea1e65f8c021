using System.Diagnostics;
using System.Globalization;
using System.Text;
using TraceKin.Ingest;
using TraceKin.Traces;

// Ingest benchmark: writes a synthetic export, then times ExportReader.FromFile against File.ReadAllBytes in the same run.
// Usage: dotnet run -c Release --project bench/TraceKin.Bench.Ingest -- [rows=1000000] [repeats=5] [--memory]
//        dotnet run -c Release --project bench/TraceKin.Bench.Ingest -- csvhelper [rows=10000] [repeats=7] [reads=300]
if (args.Length > 0 && args[0] == "csvhelper")
{
    CsvHelperComparison.Run(args.Length > 1 ? int.Parse(args[1], CultureInfo.InvariantCulture) : 10_000,
        args.Length > 2 ? int.Parse(args[2], CultureInfo.InvariantCulture) : 7, args.Length > 3 ? int.Parse(args[3], CultureInfo.InvariantCulture) : 300);
    return;
}
var rows = args.Length > 0 && int.TryParse(args[0], out var r) ? r : 1_000_000;
var repeats = args.Length > 1 && int.TryParse(args[1], out var k) ? k : 5;
var memoryOnly = args.Contains("--memory");
var dir = Path.Combine(Path.GetTempPath(), "tracekin-bench");
Directory.CreateDirectory(dir);
var path = Path.Combine(dir, $"export-{rows}.csv");
if (!File.Exists(path)) Write(path, rows);
var size = new FileInfo(path).Length;
Console.WriteLine($"file: {path} ({size / 1e6:F1} MB, {rows:N0} rows, 3 columns)");

if (memoryOnly)
{
    // Peak working set of one read, compared with the file size (run in a fresh process for a clean number).
    GC.Collect();
    var before = Process.GetCurrentProcess().PeakWorkingSet64;
    var run = ExportReader.FromFile(path, IngestSettings.Default);
    var peak = Process.GetCurrentProcess().PeakWorkingSet64;
    var managedPeak = GC.GetGCMemoryInfo(GCKind.Any).HeapSizeBytes;
    Console.WriteLine($"points: {run.Channels[0].Count:N0}");
    Console.WriteLine($"peak working set: {peak / 1e6:F1} MB (before read {before / 1e6:F1} MB); growth {(peak - before) / (double)size:F2}× file size");
    Console.WriteLine($"total allocated during read: {GC.GetTotalAllocatedBytes(true) / 1e6:F1} MB = {GC.GetTotalAllocatedBytes(true) / (double)size:F2}× file size; heap now {managedPeak / 1e6:F1} MB");
    return;
}

// warm-up
ExportReader.FromFile(path, IngestSettings.Default);
File.ReadAllBytes(path);
var parse = new List<double>();
var raw = new List<double>();
var parseCpu = new List<double>();
var rawCpu = new List<double>();
var me = Process.GetCurrentProcess();
for (var i = 0; i < repeats; i++)
{
    me.Refresh();
    var cpu = me.TotalProcessorTime;
    var sw = Stopwatch.StartNew();
    var bytes = File.ReadAllBytes(path);
    raw.Add(sw.Elapsed.TotalSeconds);
    me.Refresh();
    rawCpu.Add((me.TotalProcessorTime - cpu).TotalSeconds);
    GC.KeepAlive(bytes);
    bytes = null;
    me.Refresh();
    cpu = me.TotalProcessorTime;
    sw.Restart();
    var run = ExportReader.FromFile(path, IngestSettings.Default);
    parse.Add(sw.Elapsed.TotalSeconds);
    me.Refresh();
    parseCpu.Add((me.TotalProcessorTime - cpu).TotalSeconds);
    if (run.Channels[0].Count != rows) throw new InvalidOperationException("row count mismatch");
}
var p = parse.Min();
var b = raw.Min();
Console.WriteLine($"date: {DateTime.UtcNow:yyyy-MM-dd}  runtime: {Environment.Version}  cores: {Environment.ProcessorCount}");
Console.WriteLine($"ExportReader.FromFile: best {p * 1000:F0} ms = {size / p / 1e6:F0} MB/s (median {Median(parse) * 1000:F0} ms)");
Console.WriteLine($"File.ReadAllBytes:     best {b * 1000:F0} ms = {size / b / 1e6:F0} MB/s");
Console.WriteLine($"ratio parse time / read time: {p / b:F1}");
Console.WriteLine($"CPU time (less sensitive to other load): parse best {parseCpu.Min() * 1000:F0} ms = {size / parseCpu.Min() / 1e6:F0} MB/s; read best {rawCpu.Min() * 1000:F0} ms");

if (args.Contains("--phases"))
{
    var bytes = File.ReadAllBytes(path);
    for (var i = 0; i < 3; i++)
    {
        var alloc = GC.GetTotalAllocatedBytes(true);
        var gcs = GC.CollectionCount(0) + GC.CollectionCount(1) + GC.CollectionCount(2);
        me.Refresh();
        var cpu = me.TotalProcessorTime;
        ExportReader.FromBytes(bytes, "bench.csv", IngestSettings.Default);
        me.Refresh();
        Console.WriteLine($"FromBytes CPU {(me.TotalProcessorTime - cpu).TotalMilliseconds:F0} ms, allocated {(GC.GetTotalAllocatedBytes(true) - alloc) / 1e6:F1} MB, GCs {GC.CollectionCount(0) + GC.CollectionCount(1) + GC.CollectionCount(2) - gcs}");
        me.Refresh();
        cpu = me.TotalProcessorTime;
        var n = 0;
        foreach (var ch in bytes) if (ch == (byte)';') n++;
        me.Refresh();
        Console.WriteLine($"  byte loop CPU {(me.TotalProcessorTime - cpu).TotalMilliseconds:F0} ms ({n})");
    }
}

static double Median(List<double> xs) => xs.Order().ElementAt(xs.Count / 2);

static void Write(string path, int rows)
{
    // Invented first-order decay with noise, fixed seed; semicolon and decimal comma to exercise detection.
    var rng = new Random(1);
    var tmp = path + ".tmp";
    using (var w = new StreamWriter(tmp, false, new UTF8Encoding(false)))
    {
        w.Write("instrument: bench photometer\nmixed at: 0\ntime (s);A520;T (°C)\n");
        var sb = new StringBuilder();
        for (var i = 0; i < rows; i++)
        {
            var t = i * 0.05;
            var a = 0.9 * Math.Exp(-t / 20000) + 0.05 + (rng.NextDouble() - 0.5) * 0.002;
            sb.Append(t.ToString("F2", CultureInfo.InvariantCulture).Replace('.', ',')).Append(';')
              .Append(a.ToString("F5", CultureInfo.InvariantCulture).Replace('.', ',')).Append(';')
              .Append((25 + (rng.NextDouble() - 0.5) * 0.1).ToString("F2", CultureInfo.InvariantCulture).Replace('.', ',')).Append('\n');
            if (sb.Length > 1 << 16)
            {
                w.Write(sb);
                sb.Clear();
            }
        }
        w.Write(sb);
    }
    File.Move(tmp, path, true);
}
