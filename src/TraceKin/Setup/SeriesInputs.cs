using System.Runtime.InteropServices;

namespace TraceKin.Setup;

/// <summary>Why an input file named by plan.csv or series.toml may not be opened: what was found, what was expected.</summary>
public sealed record InputRefusal(string Found, string Expected, string Hint)
{
    /// <summary>Nothing is there (yet): `watch` waits for such a file, every other refusal is final for that content.</summary>
    public bool Missing { get; init; }
}

/// <summary>
/// The rule for every file a series names (exports in plan.csv, a calibration file in series.toml, and the two setup
/// files themselves): it must resolve, after following every symbolic link, to a regular file inside the series
/// folder (itself taken by its real path), no larger than a limit read from the file's metadata. Nothing is opened
/// here, so a named pipe, a device or a socket is refused before an open that could block or never end.
/// </summary>
public static class SeriesInputs
{
    /// <summary>Symbolic links followed before giving up (the limit Linux uses for one path, MAXSYMLINKS).</summary>
    private const int MaxLinks = 40;

    /// <summary>
    /// Checks <paramref name="relative"/> (as written in plan.csv or series.toml) against <paramref name="folder"/>.
    /// Returns null when the file may be read, with <paramref name="path"/> the real path to open (so a link swapped
    /// after the check is not followed to somewhere else); otherwise the refusal.
    /// </summary>
    /// <param name="allowOutside">The user's opt-in to files that resolve outside the series folder.</param>
    public static InputRefusal? Check(string folder, string relative, bool allowOutside, long maxBytes, out string path)
    {
        path = Path.Combine(folder, relative);
        string real, realFolder;
        try
        {
            realFolder = RealPath(folder);
            real = RealPath(path);
        }
        catch (IOException ex)
        {
            return new InputRefusal($"{Quote(relative)}, a path that cannot be resolved ({ex.Message})", "a file in the series folder", "check for a loop of symbolic links");
        }
        if (!allowOutside && !IsWithin(real, realFolder))
        {
            var how = Path.IsPathRooted(relative) ? "an absolute path"
                : real != Path.GetFullPath(path) ? "a path through a symbolic link"
                : "a path";
            return new InputRefusal($"{Quote(relative)}, {how} that resolves to {real}, outside the series folder {realFolder}",
                "a file inside the series folder",
                "copy the file into the series folder, or pass --allow-outside-files to `tracekin analyse` if reading it from there is intended");
        }
        var kind = KindOf(real, out var size);
        switch (kind)
        {
            case FileKind.Missing:
                return new InputRefusal($"{Quote(relative)}: no such file (looked for {real})", "an existing file in the series folder", "check the spelling, or copy the file in")
                {
                    Missing = true,
                };
            case FileKind.Directory:
                return new InputRefusal($"{Quote(relative)}, a folder", "a regular file", "name the export file itself, not its folder");
            case FileKind.Regular:
                break;
            default:
                return new InputRefusal($"{Quote(relative)}, {Describe(kind)} ({real})", "a regular file",
                    "an export must be a file saved on disk; a pipe or device is never opened (reading it could block or never end)");
        }
        if (size > maxBytes)
            return new InputRefusal($"{Quote(relative)}, a file of {size:N0} bytes", $"at most {maxBytes:N0} bytes", "is this a time-course export?");
        path = real;
        return null;
    }

    /// <summary>True when <paramref name="path"/> is <paramref name="folder"/> or below it (both already real paths).</summary>
    public static bool IsWithin(string path, string folder)
    {
        var root = Path.TrimEndingDirectorySeparator(folder) + Path.DirectorySeparatorChar;
        return path.StartsWith(root, StringComparison.Ordinal);
    }

    /// <summary>
    /// The path with every symbolic link resolved and every "." and ".." applied in the order the operating system
    /// applies them (a ".." after a link leaves the link's target, not the link's folder), like POSIX realpath(3).
    /// Components that do not exist are kept as written.
    /// </summary>
    public static string RealPath(string path)
    {
        var full = Path.IsPathRooted(path) ? path : Path.Join(Directory.GetCurrentDirectory(), path);
        var root = Path.GetPathRoot(full) ?? "/";
        var pending = new Stack<string>();
        Push(pending, full[root.Length..]);
        var current = root;
        var links = 0;
        while (pending.Count > 0)
        {
            var part = pending.Pop();
            if (part.Length == 0 || part == ".") continue;
            if (part == "..")
            {
                current = Path.GetDirectoryName(current) ?? current;
                continue;
            }
            var next = Path.Join(current, part);
            string? target;
            try { target = new FileInfo(next).LinkTarget; }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException) { target = null; }
            if (target is null)
            {
                current = next;
                continue;
            }
            if (++links > MaxLinks) throw new IOException($"more than {MaxLinks} symbolic links");
            if (Path.IsPathRooted(target))
            {
                current = Path.GetPathRoot(target) ?? root;
                target = target[current.Length..];
            }
            Push(pending, target);
        }
        return current;
    }

    private static void Push(Stack<string> pending, string relative)
    {
        var parts = relative.Split([Path.DirectorySeparatorChar, Path.AltDirectorySeparatorChar]);
        for (var i = parts.Length - 1; i >= 0; i--) pending.Push(parts[i]);
    }

    internal enum FileKind { Missing, Regular, Directory, Fifo, CharacterDevice, BlockDevice, Socket, Other }

    private static string Describe(FileKind kind) => kind switch
    {
        FileKind.Fifo => "a named pipe (FIFO)",
        FileKind.CharacterDevice => "a character device",
        FileKind.BlockDevice => "a block device",
        FileKind.Socket => "a socket",
        _ => "not a regular file",
    };

    /// <summary>What is at <paramref name="path"/> (links followed) and its size from the metadata; nothing is opened.</summary>
    internal static FileKind KindOf(string path, out long size)
    {
        size = 0;
        if (Directory.Exists(path)) return FileKind.Directory;
        if (OperatingSystem.IsLinux() && Statx(path, out var mode, out size) is { } linux) return linux;
        // Elsewhere .NET reports pipes, devices and sockets as files of length 0: an export of length 0 is empty
        // anyway, so refusing every such entry unopened loses nothing.
        var fi = new FileInfo(path);
        if (!fi.Exists) return FileKind.Missing;
        size = fi.Length;
        return size > 0 ? FileKind.Regular : FileKind.Other;
    }

    // statx(2) (Linux ≥ 4.11, glibc ≥ 2.28): its struct statx has one layout on every architecture, unlike struct stat,
    // so the file type (stx_mode, bytes 28–29) and size (stx_size, bytes 40–47) can be read from a plain buffer.
    [DllImport("libc", EntryPoint = "statx", SetLastError = true)]
    private static extern int NativeStatx(int dirfd, [MarshalAs(UnmanagedType.LPUTF8Str)] string path, int flags, uint mask, byte[] buffer);

    private const int AtFdCwd = -100;
    private const uint StatxType = 0x1, StatxSize = 0x200;

    private static FileKind? Statx(string path, out int mode, out long size)
    {
        mode = 0;
        size = 0;
        var buffer = new byte[256];
        try
        {
            if (NativeStatx(AtFdCwd, path, 0, StatxType | StatxSize, buffer) != 0)
                return Marshal.GetLastPInvokeError() == 2 ? FileKind.Missing : null; // ENOENT
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            return null;
        }
        mode = BitConverter.ToUInt16(buffer, 28);
        size = BitConverter.ToInt64(buffer, 40);
        // S_IFMT bits, POSIX <sys/stat.h>
        return (mode & 0xF000) switch
        {
            0x8000 => FileKind.Regular,
            0x4000 => FileKind.Directory,
            0x1000 => FileKind.Fifo,
            0x2000 => FileKind.CharacterDevice,
            0x6000 => FileKind.BlockDevice,
            0xC000 => FileKind.Socket,
            _ => FileKind.Other,
        };
    }

    private static string Quote(string s) => Traces.Fail.Quote(s);
}
