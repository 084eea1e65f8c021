namespace TraceKin.Reports;

/// <summary>
/// Writes a file so that no reader ever sees half of it: write a temporary file in the same folder, flush it to disk,
/// then rename it over the target (rename is atomic within one file system on POSIX).
/// Given the output folder (<c>root</c>), every folder from it down to the file's is first made sure of as a real
/// directory (<see cref="OutputPaths"/>), so the temporary file and the rename never land outside the output folder
/// through a linked folder; and a target that is a link is refused, never replaced or written through. Without a root
/// the file's folder is created when missing and only the target is checked.
/// </summary>
public static class AtomicFile
{
    /// <param name="durable">Flush the file to disk before the rename (false for disposable copies: the rename still
    /// hides a half-written file, but a power cut may lose the content).</param>
    public static void Write(string path, Action<Stream> write, string? root = null, bool durable = true)
    {
        using var pending = Begin(path, root, durable);
        write(pending.Stream);
        pending.Commit();
    }

    /// <summary>
    /// Starts a file that is written over time (rows streamed as runs finish): the temporary file is created now, in
    /// the target's folder; <see cref="PendingFile.Commit"/> flushes and renames it over the target, and disposing
    /// without a commit removes it, so the target is either the old file or the whole new one.
    /// </summary>
    public static PendingFile Begin(string path, string? root = null, bool durable = true)
    {
        var full = Path.GetFullPath(path);
        var dir = OutputPaths.EnsureFileFolder(root ?? Path.GetDirectoryName(full)!, full);
        var temp = Path.Combine(dir, $".{Path.GetFileName(full)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
        // CreateNew fails on any existing entry, a link included, so the temporary file is always our own.
        return new PendingFile(full, temp, new FileStream(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16), durable);
    }

    public static void WriteAllText(string path, string text, string? root = null) =>
        Write(path, s => { var b = new System.Text.UTF8Encoding(false).GetBytes(text); s.Write(b); }, root);

    public static void WriteAllBytes(string path, byte[] bytes, string? root = null, bool durable = true) => Write(path, s => s.Write(bytes), root, durable);
}

/// <summary>A file being written through a temporary file next to it (see <see cref="AtomicFile.Begin"/>).</summary>
public sealed class PendingFile : IDisposable
{
    private readonly string _target, _temp;
    private readonly FileStream _stream;
    private readonly bool _durable;
    private bool _done;

    internal PendingFile(string target, string temp, FileStream stream, bool durable)
    {
        _target = target;
        _temp = temp;
        _stream = stream;
        _durable = durable;
    }

    /// <summary>Where to write the content (the temporary file).</summary>
    public Stream Stream => _stream;

    public string Target => _target;

    /// <summary>Flushes the content to disk and renames it over the target.</summary>
    public void Commit()
    {
        if (_done) throw new InvalidOperationException("the file is already committed or abandoned");
        _done = true;
        try
        {
            _stream.Flush(flushToDisk: _durable);
            _stream.Dispose();
            // Checked again just before the rename: a link put there while we wrote is refused, not replaced.
            OutputPaths.CheckFile(_target);
            File.Move(_temp, _target, overwrite: true);
        }
        finally
        {
            if (File.Exists(_temp)) File.Delete(_temp);
        }
    }

    /// <summary>Without a commit: removes the temporary file, leaving the target as it was.</summary>
    public void Dispose()
    {
        if (_done) return;
        _done = true;
        _stream.Dispose();
        if (File.Exists(_temp)) File.Delete(_temp);
    }
}
