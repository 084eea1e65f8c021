namespace TraceKin.Tests.Support;

/// <summary>Finds files of the repository from the test assembly's folder.</summary>
public static class RepoPaths
{
    public static string Root { get; } = FindRoot();

    public static string Sample(string name) => Path.Combine(Root, "sample-traces", name);

    public static string Docs => Path.Combine(Root, "docs");

    /// <summary>A fresh empty folder under the system temp folder (the caller deletes it).</summary>
    public static string NewTempDir(string prefix)
    {
        var dir = System.IO.Path.Combine(System.IO.Path.GetTempPath(), $"{prefix}-{Guid.NewGuid():N}");
        Directory.CreateDirectory(dir);
        return dir;
    }

    /// <summary>Copies a folder's files (not sub-folders) into <paramref name="to"/>.</summary>
    public static void CopyDir(string from, string to)
    {
        Directory.CreateDirectory(to);
        foreach (var f in Directory.EnumerateFiles(from)) File.Copy(f, System.IO.Path.Combine(to, System.IO.Path.GetFileName(f)), overwrite: true);
    }

    private static string FindRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "TraceKin.sln"))) dir = dir.Parent;
        return dir?.FullName ?? throw new InvalidOperationException("TraceKin.sln not found above " + AppContext.BaseDirectory);
    }

    /// <summary>A fresh temporary folder, deleted when disposed.</summary>
    public sealed class TempDir : IDisposable
    {
        public TempDir() => Directory.CreateDirectory(Path);
        public string Path { get; } = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "tracekin-test-" + Guid.NewGuid().ToString("N"));
        public void Dispose()
        {
            try { Directory.Delete(Path, recursive: true); } catch (IOException) { }
        }
    }

    /// <summary>Copies a folder's files (not sub-folders) into a new temp folder.</summary>
    public static TempDir CopyOf(string folder)
    {
        var t = new TempDir();
        CopyDir(folder, t.Path);
        return t;
    }
}
