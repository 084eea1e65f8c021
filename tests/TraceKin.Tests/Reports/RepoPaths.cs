namespace TraceKin.Tests.Reports;

/// <summary>Finds the repository root (the folder holding TraceKin.sln) from the test binaries, for the bundled sample and docs.</summary>
public static class RepoPaths
{
    public static string Root { get; } = FindRoot();

    public static string Sample => Path.Combine(Root, "sample-traces", "violet-complex-acid");

    public static string Docs => Path.Combine(Root, "docs");

    private static string FindRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "TraceKin.sln"))) return dir.FullName;
        throw new InvalidOperationException("TraceKin.sln not found above " + AppContext.BaseDirectory);
    }

    /// <summary>A fresh empty folder under the system temp folder.</summary>
    public static string NewTempDir(string prefix)
    {
        var dir = Path.Combine(Path.GetTempPath(), $"{prefix}-{Guid.NewGuid():N}");
        Directory.CreateDirectory(dir);
        return dir;
    }

    public static void CopyDir(string from, string to)
    {
        Directory.CreateDirectory(to);
        foreach (var f in Directory.EnumerateFiles(from)) File.Copy(f, Path.Combine(to, Path.GetFileName(f)), overwrite: true);
    }
}
