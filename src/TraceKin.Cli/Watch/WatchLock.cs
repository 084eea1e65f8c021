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

    /// <summary>Takes the lock, or returns null with a message saying who holds it.</summary>
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
            var holder = "";
            try
            {
                using var peek = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete);
                using var reader = new StreamReader(peek);
                var text = reader.ReadToEnd().Trim();
                if (text.Length > 0) holder = $" (process {text})";
            }
            catch (IOException) { }
            refusal = $"another tracekin watch is already writing to {outDir}{holder}; stop it first, or choose another --out folder (lock file {path})";
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
