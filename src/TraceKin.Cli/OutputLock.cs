using System.Globalization;
using System.Text;
using TraceKin.Reports;

namespace TraceKin.Cli;

/// <summary>
/// Keeps a second tracekin off an output folder while one writes there (`analyse` for the length of one analysis,
/// `watch` for its whole life): the lock file is held open with no sharing (an exclusive advisory lock on POSIX,
/// released by the kernel even when the process is killed, so a stale lock never blocks anyone). The lock file
/// itself cannot be read by others while it is held, so the holder's process id and command are written beside it,
/// in <see cref="OwnerFileName"/>, for the refusal message. The lock file is never deleted: deleting it while a
/// second process waits on it would let a third take a fresh one at the same time.
/// </summary>
public sealed class OutputLock : IDisposable
{
    public const string FileName = ".tracekin.lock";
    public const string OwnerFileName = ".tracekin.lock.owner";

    private readonly FileStream _stream;
    private readonly string _ownerPath;

    private OutputLock(FileStream stream, string ownerPath)
    {
        _stream = stream;
        _ownerPath = ownerPath;
    }

    /// <summary>
    /// Takes the lock of <paramref name="outDir"/> (created when missing), or returns null with a message naming the
    /// holder. Throws <see cref="IOException"/> (e.g. <see cref="OutputPathException"/>) or
    /// <see cref="UnauthorizedAccessException"/> when the folder cannot be used at all.
    /// </summary>
    public static OutputLock? TryTake(string outDir, string command, out string? refusal)
    {
        OutputPaths.EnsureRoot(outDir);
        var path = Path.Combine(outDir, FileName);
        var ownerPath = Path.Combine(outDir, OwnerFileName);
        OutputPaths.CheckFile(path);
        FileStream stream;
        try
        {
            stream = new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
        }
        catch (IOException) when (HeldByAnother(path))
        {
            refusal = $"another tracekin ({Owner(ownerPath)}) is already writing to {outDir}; wait until it has finished, or choose another --out folder (lock file {path})";
            return null;
        }
        try
        {
            stream.SetLength(0);
            stream.Write(Encoding.ASCII.GetBytes(Environment.ProcessId.ToString(CultureInfo.InvariantCulture) + "\n"));
            stream.Flush(flushToDisk: true);
            AtomicFile.WriteAllText(ownerPath, $"{Environment.ProcessId.ToString(CultureInfo.InvariantCulture)} {command}\n", root: outDir);
        }
        catch
        {
            stream.Dispose();
            throw;
        }
        refusal = null;
        return new OutputLock(stream, ownerPath);
    }

    /// <summary>
    /// Whether a failed open was another process's lock, not another trouble (a read-only file system, say): a shared
    /// open for reading is refused only while someone holds the file exclusively.
    /// </summary>
    private static bool HeldByAnother(string path)
    {
        if (!File.Exists(path)) return false;
        try
        {
            using var probe = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite);
            return false;
        }
        catch (IOException) { return true; }
        catch (UnauthorizedAccessException) { return false; }
    }

    /// <summary>"process 1234, tracekin analyse", from the owner file; a plain phrase when it cannot be read.</summary>
    private static string Owner(string ownerPath)
    {
        try
        {
            if (new FileInfo(ownerPath).LinkTarget is null && File.Exists(ownerPath))
            {
                var parts = File.ReadAllText(ownerPath).Trim().Split(' ', 2);
                if (parts.Length == 2 && int.TryParse(parts[0], NumberStyles.None, CultureInfo.InvariantCulture, out var pid) && parts[1].All(char.IsAsciiLetterLower))
                    return $"process {pid}, tracekin {parts[1]}";
            }
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException) { }
        return "a process whose id could not be read";
    }

    public void Dispose()
    {
        // The owner file goes first, while the lock is still held, so it never removes a later holder's file.
        try { if (new FileInfo(_ownerPath).LinkTarget is null) File.Delete(_ownerPath); }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException) { }
        _stream.Dispose();
    }
}
