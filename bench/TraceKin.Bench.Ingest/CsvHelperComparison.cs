using System.Diagnostics;
using System.Globalization;
using System.Text;
using CsvHelper;
using TraceKin.Ingest;

/// <summary>
/// Our export reader against CsvHelper 34's reader on the batch file shape: a 10,000-row two-column export
/// (comma, decimal point, header `time (s),absorbance`, about 170 kB, like the files bench/batch.sh analyses).
/// Both read the same bytes from memory into arrays of doubles; CsvHelper's numbers are parsed with
/// double.TryParse(span, NumberStyles.Float, invariant) as TraceKin must (its Parse&lt;double&gt; accepts group
/// separators), with our own exact parser (Ingest/NumberCell) as an export reader built on CsvHelper would use, and,
/// for reference, with CsvHelper's own Parse&lt;double&gt;. Best of N passes of M reads each, in process CPU time
/// and wall time per file.
/// </summary>
static class CsvHelperComparison
{
    public static void Run(int rows, int repeats, int readsPerPass)
    {
        var bytes = Export(rows);
        Console.WriteLine($"file: {rows:N0} rows, 2 columns, {bytes.Length / 1e3:F1} kB; {repeats} passes of {readsPerPass} reads; runtime {Environment.Version}, {Environment.ProcessorCount} cores, {DateTime.UtcNow:yyyy-MM-dd HH:mm} UTC");
        double ours = 0, helper = 0, helperCell = 0, helperOwn = 0;
        var cases = new (string Name, Func<byte[], double> Read, Action<double> Keep)[]
        {
            ("TraceKin ExportReader.FromBytes (detection, checks, located errors)", Ours, v => ours = v),
            ("CsvHelper 34 CsvReader + double.TryParse(span, Float, invariant)", Helper, v => helper = v),
            ("CsvHelper 34 CsvReader + TraceKin's NumberCell (exact, no group separators)", HelperCell, v => helperCell = v),
            ("CsvHelper 34 CsvReader + its Parse<double> (not usable: group separators)", HelperParse, v => helperOwn = v),
        };
        var checksums = cases.Select(c => c.Read(bytes)).ToArray(); // warm-up, and every reader must read the same numbers
        if (checksums.Distinct().Count() != 1) throw new InvalidOperationException("the readers read different numbers: " + string.Join(", ", checksums));
        foreach (var (name, read, keep) in cases)
        {
            double bestCpu = double.MaxValue, bestWall = double.MaxValue;
            var me = Process.GetCurrentProcess();
            for (var pass = 0; pass < repeats; pass++)
            {
                me.Refresh();
                var cpu = me.TotalProcessorTime;
                var sw = Stopwatch.StartNew();
                for (var i = 0; i < readsPerPass; i++) read(bytes);
                var wall = sw.Elapsed.TotalMilliseconds / readsPerPass;
                me.Refresh();
                bestCpu = Math.Min(bestCpu, (me.TotalProcessorTime - cpu).TotalMilliseconds / readsPerPass);
                bestWall = Math.Min(bestWall, wall);
            }
            keep(bestCpu);
            Console.WriteLine($"{name}: {bestCpu:F3} ms CPU per file ({bytes.Length / bestCpu / 1e3:F0} MB/s), {bestWall:F3} ms wall");
        }
        Console.WriteLine($"CPU time against TraceKin's reader: CsvHelper + double.TryParse {helper / ours:F2}×, CsvHelper + NumberCell {helperCell / ours:F2}×, CsvHelper + Parse<double> {helperOwn / ours:F2}×");
    }

    private static double Ours(byte[] bytes)
    {
        var run = ExportReader.FromBytes(bytes, "bench.csv", IngestSettings.Default);
        var ch = run.Channels[0];
        return ch.Times[^1] + ch.Values[^1] + ch.Count;
    }

    private static readonly CsvReaderOptions Options = new() { Separator = ',', HasHeader = true, DetectSeparatorHint = false };

    private static double Helper(byte[] bytes)
    {
        var t = new List<double>(10_000);
        var y = new List<double>(10_000);
        using var reader = CsvReader.Create(bytes, Options);
        while (reader.Read())
        {
            if (!double.TryParse(reader.GetSpan(0), NumberStyles.Float, CultureInfo.InvariantCulture, out var a)
                || !double.TryParse(reader.GetSpan(1), NumberStyles.Float, CultureInfo.InvariantCulture, out var b))
                throw new FormatException($"row {reader.RowNumber}");
            t.Add(a);
            y.Add(b);
        }
        return t[^1] + y[^1] + t.Count;
    }

    private static double HelperCell(byte[] bytes)
    {
        var t = new List<double>(10_000);
        var y = new List<double>(10_000);
        using var reader = CsvReader.Create(bytes, Options);
        while (reader.Read())
        {
            if (NumberCell.TryParse(reader.GetSpan(0), (byte)'.', out var a) != NumberStatus.Ok
                || NumberCell.TryParse(reader.GetSpan(1), (byte)'.', out var b) != NumberStatus.Ok)
                throw new FormatException($"row {reader.RowNumber}");
            t.Add(a);
            y.Add(b);
        }
        return t[^1] + y[^1] + t.Count;
    }

    private static double HelperParse(byte[] bytes)
    {
        var t = new List<double>(10_000);
        var y = new List<double>(10_000);
        using var reader = CsvReader.Create(bytes, Options);
        while (reader.Read())
        {
            t.Add(reader.Parse<double>(0));
            y.Add(reader.Parse<double>(1));
        }
        return t[^1] + y[^1] + t.Count;
    }

    /// <summary>An invented first-order decay sampled every 0.1 s with noise (fixed seed).</summary>
    private static byte[] Export(int rows)
    {
        var rng = new Random(7);
        var sb = new StringBuilder("time (s),absorbance\n");
        for (var i = 0; i < rows; i++)
        {
            var t = i * 0.1;
            var a = 0.05 + 0.85 * Math.Exp(-t / 300) + (rng.NextDouble() - 0.5) * 0.004;
            sb.Append(t.ToString("F1", CultureInfo.InvariantCulture)).Append(',').Append(a.ToString("F6", CultureInfo.InvariantCulture)).Append('\n');
        }
        return new UTF8Encoding(false).GetBytes(sb.ToString());
    }
}
