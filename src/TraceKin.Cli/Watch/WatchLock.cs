namespace TraceKin.Cli.Watch;

/// <summary>
/// Keeps a second watcher off the same output folder: the lock file is held open with no sharing for the watcher's
/// life (an exclusive advisory lock on POSIX, released by the kernel even when the process is killed).
/// </summary>
public sealed class WatchLock : IDisposable
{
    public const string FileName = ".tracekin-watch.lock";

    private readonly FileStream _stream;

    private WatchLock(FileStream stream) => _stream = stream;

    /// <summary>Takes the lock, or returns null with a message saying why not.</summary>
    public static WatchLock? TryTake(string outDir, out string? refusal)
    {
        Directory.CreateDirectory(outDir);
        var path = Path.Combine(outDir, FileName);
        FileStream stream;
        try
        {
            stream = new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
        }
        catch (IOException)
        {
            // The holder's lock also keeps us from reading its process id, which is in the file.
            refusal = $"another tracekin watch is already writing to {outDir}; stop it first, or choose another --out folder (lock file {path}, which holds its process id)";
            return null;
        }
        stream.SetLength(0);
        var pid = System.Text.Encoding.ASCII.GetBytes(Environment.ProcessId.ToString(System.Globalization.CultureInfo.InvariantCulture) + "\n");
        stream.Write(pid);
        stream.Flush(flushToDisk: true);
        refusal = null;
        return new WatchLock(stream);
    }

    public void Dispose() => _stream.Dispose();
}
