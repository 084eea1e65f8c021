namespace TraceKin.Cli.Watch;

/// <summary>What the watcher compares between two looks at a file: its length and last-write time.</summary>
public readonly record struct FileSignature(long Length, DateTime LastWriteUtc)
{
    /// <summary>The signature of the file at <paramref name="path"/>, or null when there is no such file.</summary>
    public static FileSignature? Of(string path)
    {
        try
        {
            var fi = new FileInfo(path);
            return fi.Exists ? new FileSignature(fi.Length, fi.LastWriteTimeUtc) : null;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            return null;
        }
    }
}

/// <summary>
/// Decides when a file an instrument is writing has settled: its signature must stay the same over a settle interval
/// measured on the injected clock. A file whose last write is already well past the settle interval when first seen
/// (e.g. present at start-up) counts as settled at once. Thread-safe.
/// </summary>
public sealed class FileStability(TimeProvider time, TimeSpan settle)
{
    /// <summary>
    /// Extra age a last-write time must have before it is trusted on first sight: some file systems store times
    /// to the second or two (FAT: 2 s), so a recent time stamp can lag the real last write (common practice, no source).
    /// </summary>
    public static readonly TimeSpan TimestampSlack = TimeSpan.FromSeconds(2);

    private readonly Dictionary<string, (FileSignature Signature, DateTimeOffset QuietSince)> _seen = new(StringComparer.Ordinal);
    private readonly Lock _gate = new();

    public TimeSpan Settle { get; } = settle;

    /// <summary>
    /// Records a look at a file and returns the moment from which it counts as stable, if its signature does not
    /// change again. The file is stable now when the returned moment is not after <see cref="TimeProvider.GetUtcNow"/>.
    /// </summary>
    public DateTimeOffset Observe(string path, FileSignature signature)
    {
        var now = time.GetUtcNow();
        lock (_gate)
        {
            if (_seen.TryGetValue(path, out var seen) && seen.Signature == signature)
                return seen.QuietSince + Settle;
            var written = new DateTimeOffset(DateTime.SpecifyKind(signature.LastWriteUtc, DateTimeKind.Utc));
            var quietSince = written + Settle + TimestampSlack <= now ? written : now;
            _seen[path] = (signature, quietSince);
            return quietSince + Settle;
        }
    }

    /// <summary>True when the file has been seen with this signature for at least the settle interval.</summary>
    public bool IsStable(string path, FileSignature signature) => Observe(path, signature) <= time.GetUtcNow();

    /// <summary>Starts the settle interval again (the file could not be opened, or changed while being read).</summary>
    public void Restart(string path)
    {
        lock (_gate) _seen.Remove(path);
    }

    /// <summary>Forgets a file that has gone.</summary>
    public void Forget(string path) => Restart(path);
}
