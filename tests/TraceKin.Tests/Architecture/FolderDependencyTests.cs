using System.Text.RegularExpressions;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Architecture;

/// <summary>
/// The library's folders depend on each other one way only: the shared folders (Traces below all, then Fitting and
/// Setup), then the stages in pipeline order (Ingest → Signal → Rates → Series → Analysis → Reports), then the tools
/// built on them (Simulation, Planning). Read from the source text: a file depends on a folder when it names
/// TraceKin.&lt;Folder&gt; (a using directive or a qualified name) outside comments. Layering of this kind is common
/// practice, no source.
/// </summary>
public sealed partial class FolderDependencyTests
{
    private static readonly string[][] Layers =
    [
        ["Traces"],
        ["Fitting", "Setup"],
        ["Ingest"],
        ["Signal"],
        ["Rates"],
        ["Series"],
        ["Analysis"],
        ["Reports"],
        ["Simulation", "Planning"],
    ];

    private static int Layer(string folder) => Array.FindIndex(Layers, l => l.Contains(folder));

    internal static Dictionary<string, Dictionary<string, List<string>>> Dependencies(string libraryRoot)
    {
        var deps = new Dictionary<string, Dictionary<string, List<string>>>(StringComparer.Ordinal);
        foreach (var file in Directory.EnumerateFiles(libraryRoot, "*.cs", SearchOption.AllDirectories))
        {
            var rel = Path.GetRelativePath(libraryRoot, file);
            var parts = rel.Split(Path.DirectorySeparatorChar);
            if (parts.Length < 2 || parts[0] is "obj" or "bin") continue;
            var folder = parts[0];
            var text = Comments().Replace(File.ReadAllText(file), "");
            foreach (Match m in Named().Matches(text))
            {
                var target = m.Groups[1].Value;
                if (target == folder || target == "Core") continue;
                if (!deps.TryGetValue(folder, out var d)) deps[folder] = d = new(StringComparer.Ordinal);
                if (!d.TryGetValue(target, out var files)) d[target] = files = [];
                if (!files.Contains(rel)) files.Add(rel);
            }
        }
        return deps;
    }

    [Fact]
    public void Every_folder_of_the_library_has_a_layer()
    {
        var root = Path.Combine(RepoPaths.Root, "src", "TraceKin");
        var folders = Directory.EnumerateDirectories(root).Select(Path.GetFileName).Where(f => f is not ("obj" or "bin")).ToList();
        Assert.All(folders, f => Assert.True(Layer(f!) >= 0, $"src/TraceKin/{f} has no place in the layers; add it to {nameof(FolderDependencyTests)}"));
    }

    [Fact]
    public void No_folder_depends_on_a_later_or_equal_layer()
    {
        var root = Path.Combine(RepoPaths.Root, "src", "TraceKin");
        var wrong = new List<string>();
        foreach (var (from, targets) in Dependencies(root))
            foreach (var (to, files) in targets)
            {
                if (Layer(to) < 0) continue; // a name such as TraceKin.Cli in a text, not a folder of the library
                if (Layer(to) >= Layer(from)) wrong.Add($"{from} → {to} ({string.Join(", ", files.Take(3))})");
            }
        Assert.True(wrong.Count == 0, "dependencies against the layering: " + string.Join("; ", wrong));
    }

    [Fact]
    public void The_check_sees_a_dependency_against_the_order()
    {
        // A folder written for the test: Traces naming Reports must be caught.
        using var dir = new RepoPaths.TempDir();
        Directory.CreateDirectory(Path.Combine(dir.Path, "Traces"));
        File.WriteAllText(Path.Combine(dir.Path, "Traces", "X.cs"), "using TraceKin.Reports; // a comment naming TraceKin.Series\nnamespace TraceKin.Traces;\n");
        var deps = Dependencies(dir.Path);
        Assert.Equal(["Reports"], deps["Traces"].Keys);
    }

    [GeneratedRegex(@"//[^\n]*|/\*.*?\*/", RegexOptions.Singleline)]
    private static partial Regex Comments();

    [GeneratedRegex(@"\bTraceKin\.([A-Z][A-Za-z]+)\b")]
    private static partial Regex Named();
}
