namespace TraceKin.Cli.Watch;

/// <summary>
/// What the watcher compares between two looks at a file: its length and last-write time, and whether its last line
/// is still open (<paramref name="Unterminated"/>: the file is empty or its last byte is not a line end).
/// </summary>
public readonly record struct FileSignature(long Length, DateTime LastWriteUtc, bool Unterminated = false)
{
    /// <summary>The signature of the file at <paramref name="path"/>, or null when there is no such file.</summary>
    public static FileSignature? Of(string path)
    {
        try
        {
            var fi = new FileInfo(path);
            return fi.Exists ? new FileSignature(fi.Length, fi.LastWriteTimeUtc, fi.Length == 0 || !EndsWithLineEnd(path)) : null;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            return null;
        }
    }

    /// <summary>
    /// True when the last byte is LF or CR, also in UTF-16 (LF/CR followed or preceded by a zero byte). A file that
    /// cannot be opened counts as ended: whether it can be read is decided when it is taken.
    /// </summary>
    private static bool EndsWithLineEnd(string path)
    {
        try
        {
            using var fs = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, 1);
            if (fs.Length == 0) return false;
            Span<byte> tail = stackalloc byte[2];
            var n = (int)Math.Min(2, fs.Length);
            fs.Seek(-n, SeekOrigin.End);
            fs.ReadExactly(tail[..n]);
            static bool IsEnd(byte b) => b is (byte)'\n' or (byte)'\r';
            var last = tail[n - 1];
            return IsEnd(last) || (n == 2 && last == 0 && IsEnd(tail[0]));
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            return true;
        }
    }
}

/// <summary>
/// Decides when a file an instrument is writing has settled: its signature must stay the same over a settle interval
/// measured on the injected clock. A file whose last line has no line end yet (an instrument that paused in the
/// middle of a row) must stay the same for <see cref="UnterminatedFactor"/> settle intervals instead. A file whose
/// last write is already well past its interval when first seen (e.g. present at start-up) counts as settled at once.
/// Thread-safe.
/// </summary>
public sealed class FileStability(TimeProvider time, TimeSpan settle)
{
    /// <summary>
    /// How many settle intervals a file that does not end with a line end must stay unchanged: a pause in the middle
    /// of a row is more likely a writer still at work than a finished export (our own rule, no source).
    /// </summary>
    public const int UnterminatedFactor = 4;

    /// <summary>
    /// Extra age a last-write time must have before it is trusted on first sight: some file systems store times
    /// to the second or two (FAT: 2 s), so a recent time stamp can lag the real last write (common practice, no source).
    /// </summary>
    public static readonly TimeSpan TimestampSlack = TimeSpan.FromSeconds(2);

    private readonly Dictionary<string, (FileSignature Signature, DateTimeOffset QuietSince)> _seen = new(StringComparer.Ordinal);
    private readonly Lock _gate = new();

    public TimeSpan Settle { get; } = settle;

    /// <summary>The settle interval that applies to a file with this signature.</summary>
    public TimeSpan SettleFor(FileSignature signature) => signature.Unterminated ? UnterminatedFactor * Settle : Settle;

    /// <summary>
    /// Records a look at a file and returns the moment from which it counts as stable, if its signature does not
    /// change again. The file is stable now when the returned moment is not after <see cref="TimeProvider.GetUtcNow"/>.
    /// </summary>
    public DateTimeOffset Observe(string path, FileSignature signature)
    {
        var now = time.GetUtcNow();
        lock (_gate)
        {
            var settle = SettleFor(signature);
            if (_seen.TryGetValue(path, out var seen) && seen.Signature == signature)
                return seen.QuietSince + settle;
            var written = new DateTimeOffset(DateTime.SpecifyKind(signature.LastWriteUtc, DateTimeKind.Utc));
            var quietSince = written + settle + TimestampSlack <= now ? written : now;
            _seen[path] = (signature, quietSince);
            return quietSince + settle;
        }
    }

    /// <summary>True when the file has been seen with this signature for at least its settle interval.</summary>
    public bool IsStable(string path, FileSignature signature) => Observe(path, signature) <= time.GetUtcNow();

    /// <summary>Starts the settle interval again (the file could not be opened, or changed while being read).</summary>
    public void Restart(string path)
    {
        lock (_gate) _seen.Remove(path);
    }

    /// <summary>Forgets a file that has gone.</summary>
    public void Forget(string path) => Restart(path);
}
