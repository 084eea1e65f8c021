namespace TraceKin.Reports;

/// <summary>
/// Keeps every write of TraceKin inside its output folder: a folder it writes into must be a real directory (created
/// by us, or found there and not a symbolic link), and a file it replaces must not be a link either. TraceKin never
/// writes through, replaces or removes a link inside the output folder; it refuses with
/// <see cref="OutputPathException"/>, which names the link and where it points. The output folder itself may be a
/// link (the user chose it).
/// </summary>
public static class OutputPaths
{
    /// <summary>
    /// Makes sure <paramref name="folder"/> (inside <paramref name="root"/>, or the root itself) exists as a chain of
    /// real directories below the root, creating the missing ones one level at a time; returns its full path.
    /// </summary>
    public static string EnsureFolder(string root, string folder)
    {
        var rootFull = Path.TrimEndingDirectorySeparator(Path.GetFullPath(root));
        var full = Path.TrimEndingDirectorySeparator(Path.GetFullPath(folder));
        EnsureRoot(rootFull);
        if (full == rootFull) return full;
        var rel = Path.GetRelativePath(rootFull, full);
        if (rel == ".." || rel.StartsWith(".." + Path.DirectorySeparatorChar, StringComparison.Ordinal) || Path.IsPathRooted(rel))
            throw new OutputPathException($"{full} is outside the output folder {rootFull}; TraceKin writes only inside it");
        var at = rootFull;
        foreach (var part in rel.Split(Path.DirectorySeparatorChar, StringSplitOptions.RemoveEmptyEntries))
        {
            at = Path.Combine(at, part);
            var info = new DirectoryInfo(at);
            if (info.LinkTarget is { } target) throw Link(at, target, "folder");
            if (info.Exists) continue;
            if (File.Exists(at))
                throw new OutputPathException($"{at} is a file where TraceKin needs a folder; move it away or choose another output folder");
            Directory.CreateDirectory(at);
            // Made by us a moment ago; if something else swapped in a link meanwhile, stop rather than write through it.
            if (new DirectoryInfo(at).LinkTarget is { } late) throw Link(at, late, "folder");
        }
        return full;
    }

    /// <summary>
    /// The folder of <paramref name="file"/>, made sure of as in <see cref="EnsureFolder"/>, after checking that the
    /// file, when it is there, is not a link and not a folder.
    /// </summary>
    public static string EnsureFileFolder(string root, string file)
    {
        var dir = EnsureFolder(root, Path.GetDirectoryName(Path.GetFullPath(file))!);
        CheckFile(file);
        return dir;
    }

    /// <summary>Throws when <paramref name="file"/> is a link or a folder (a missing file is fine: it will be created).</summary>
    public static void CheckFile(string file)
    {
        var info = new FileInfo(file);
        if (info.LinkTarget is { } target) throw Link(Path.GetFullPath(file), target, "file");
        if (Directory.Exists(file))
            throw new OutputPathException($"{Path.GetFullPath(file)} is a folder where TraceKin writes a file; move it away or choose another output folder");
    }

    /// <summary>The output folder itself: created when missing; must be a folder (it may be a link to one).</summary>
    public static void EnsureRoot(string root)
    {
        var full = Path.GetFullPath(root);
        if (File.Exists(full) && !Directory.Exists(full))
            throw new OutputPathException($"{full} is a file, not a folder; give --out a folder (it is created when missing)");
        if (Directory.Exists(full)) return;
        // Every missing parent is created too; a parent that is a file makes this throw an IOException.
        var parent = Path.GetDirectoryName(Path.TrimEndingDirectorySeparator(full));
        for (var p = parent; p is not null; p = Path.GetDirectoryName(p))
        {
            if (Directory.Exists(p)) break;
            if (File.Exists(p))
                throw new OutputPathException($"cannot create the folder {full}: {p} is a file, not a folder");
        }
        Directory.CreateDirectory(full);
    }

    /// <summary>
    /// The files below <paramref name="folder"/>, recursively, without following or listing links: a recursive listing
    /// of the runtime goes into a linked folder, and deleting or hashing what it lists would reach outside.
    /// </summary>
    public static IEnumerable<string> FilesBelow(string folder, string pattern = "*") =>
        Directory.EnumerateFiles(folder, pattern, new EnumerationOptions
        {
            RecurseSubdirectories = true,
            AttributesToSkip = FileAttributes.ReparsePoint,
            MatchType = MatchType.Win32,
            MatchCasing = MatchCasing.PlatformDefault,
            IgnoreInaccessible = false,
        });

    private static OutputPathException Link(string path, string target, string what) =>
        new($"{path} is a symbolic link (to {target}) where TraceKin writes a {what}; TraceKin never writes through a link inside the output folder — remove the link or choose another output folder");
}

/// <summary>An output path TraceKin refuses to write (a link, a file where a folder belongs, a path outside the output folder).</summary>
public sealed class OutputPathException(string message) : IOException(message);
