using System.Text;
using System.Text.Json;

namespace TraceKin.Cli.Watch;

/// <summary>
/// The watch ledger: an append-only journal in the output folder, one complete JSON record per line, each line
/// flushed to disk before the next piece of work starts. A torn last line (the process was killed while appending)
/// is not a record: it is cut off when the ledger is opened, so the next record starts on a clean line.
/// </summary>
public sealed class Ledger : IDisposable
{
    public const string FileName = ".tracekin-ledger.jsonl";

    private static readonly JsonSerializerOptions Json = new() { WriteIndented = false };

    private readonly FileStream _stream;
    private readonly Lock _gate = new();
    private readonly Dictionary<string, LedgerRecord> _latest = new(StringComparer.Ordinal);
    private long _sequence;

    public string Path { get; }

    /// <summary>Lines that were not complete records (at most the torn last one, in normal use).</summary>
    public int IgnoredLines { get; }

    private Ledger(string path, FileStream stream, IEnumerable<LedgerRecord> records, int ignored)
    {
        Path = path;
        _stream = stream;
        IgnoredLines = ignored;
        foreach (var r in records)
        {
            _latest[r.Series] = r;
            _sequence = Math.Max(_sequence, r.Sequence);
        }
    }

    public static Ledger Open(string outDir)
    {
        var path = System.IO.Path.Combine(outDir, FileName);
        var stream = new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.Read);
        var bytes = new byte[stream.Length];
        stream.ReadExactly(bytes);
        var (records, ignored, cleanLength) = Parse(bytes);
        if (cleanLength < bytes.Length)
        {
            stream.SetLength(cleanLength);
            stream.Flush(flushToDisk: true);
        }
        stream.Seek(0, SeekOrigin.End);
        return new Ledger(path, stream, records, ignored);
    }

    /// <summary>Every complete record of a ledger file, in order (for tests and tools).</summary>
    public static IReadOnlyList<LedgerRecord> ReadAll(string path) =>
        File.Exists(path) ? Parse(File.ReadAllBytes(path)).Records : [];

    /// <summary>Parses the journal; returns the records, the number of lines skipped, and the length up to the last newline.</summary>
    public static (List<LedgerRecord> Records, int Ignored, long CleanLength) Parse(byte[] bytes)
    {
        var records = new List<LedgerRecord>();
        var ignored = 0;
        var lastNewline = Array.LastIndexOf(bytes, (byte)'\n');
        var cleanLength = lastNewline + 1;
        if (cleanLength < bytes.Length) ignored++;
        var text = Encoding.UTF8.GetString(bytes, 0, cleanLength);
        foreach (var line in text.Split('\n'))
        {
            if (line.Length == 0) continue;
            try
            {
                var r = JsonSerializer.Deserialize<LedgerRecord>(line, Json);
                if (r is not null) records.Add(r);
                else ignored++;
            }
            catch (JsonException)
            {
                ignored++;
            }
        }
        return (records, ignored, cleanLength);
    }

    /// <summary>The series' most recent committed record, or null when it was never analysed.</summary>
    public LedgerRecord? Latest(string series)
    {
        lock (_gate) return _latest.GetValueOrDefault(series);
    }

    public IReadOnlyList<LedgerRecord> LatestAll()
    {
        lock (_gate) return _latest.Values.ToList();
    }

    /// <summary>Appends one record as one line and forces it to disk; numbers it with the next sequence number.</summary>
    public LedgerRecord Append(LedgerRecord record)
    {
        lock (_gate)
        {
            var numbered = record with { Sequence = ++_sequence };
            var line = JsonSerializer.SerializeToUtf8Bytes(numbered, Json);
            var buffer = new byte[line.Length + 1];
            line.CopyTo(buffer, 0);
            buffer[^1] = (byte)'\n';
            _stream.Write(buffer);
            _stream.Flush(flushToDisk: true);
            _latest[numbered.Series] = numbered;
            return numbered;
        }
    }

    public void Dispose() => _stream.Dispose();
}
