namespace TraceKin.Reports;

/// <summary>
/// Writes a file so that no reader ever sees half of it: write a temporary file in the same folder, flush it to disk,
/// then rename it over the target (rename is atomic within one file system on POSIX).
/// </summary>
public static class AtomicFile
{
    public static void Write(string path, Action<Stream> write)
    {
        var dir = Path.GetDirectoryName(Path.GetFullPath(path))!;
        Directory.CreateDirectory(dir);
        var temp = Path.Combine(dir, $".{Path.GetFileName(path)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
        try
        {
            using (var fs = new FileStream(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16))
            {
                write(fs);
                fs.Flush(flushToDisk: true);
            }
            File.Move(temp, path, overwrite: true);
        }
        finally
        {
            if (File.Exists(temp)) File.Delete(temp);
        }
    }

    public static void WriteAllText(string path, string text) =>
        Write(path, s => { var b = new System.Text.UTF8Encoding(false).GetBytes(text); s.Write(b); });

    public static void WriteAllBytes(string path, byte[] bytes) => Write(path, s => s.Write(bytes));
}
