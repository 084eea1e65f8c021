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
        var full = Path.GetFullPath(path);
        var dir = OutputPaths.EnsureFileFolder(root ?? Path.GetDirectoryName(full)!, full);
        var temp = Path.Combine(dir, $".{Path.GetFileName(full)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
        try
        {
            // CreateNew fails on any existing entry, a link included, so the temporary file is always our own.
            using (var fs = new FileStream(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16))
            {
                write(fs);
                fs.Flush(flushToDisk: durable);
            }
            // Checked again just before the rename: a link put there while we wrote is refused, not replaced.
            OutputPaths.CheckFile(full);
            File.Move(temp, full, overwrite: true);
        }
        finally
        {
            if (File.Exists(temp)) File.Delete(temp);
        }
    }

    public static void WriteAllText(string path, string text, string? root = null) =>
        Write(path, s => { var b = new System.Text.UTF8Encoding(false).GetBytes(text); s.Write(b); }, root);

    public static void WriteAllBytes(string path, byte[] bytes, string? root = null, bool durable = true) => Write(path, s => s.Write(bytes), root, durable);
}
