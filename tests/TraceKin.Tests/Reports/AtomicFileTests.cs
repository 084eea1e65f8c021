using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Reports;

// Writes stay inside the output folder: no write through a linked folder or file (robustness, no source needed).
public sealed class AtomicFileTests : IDisposable
{
    private readonly RepoPaths.TempDir _out = new();
    private readonly RepoPaths.TempDir _elsewhere = new();

    public void Dispose()
    {
        _out.Dispose();
        _elsewhere.Dispose();
    }

    private string[] Elsewhere() => Directory.EnumerateFileSystemEntries(_elsewhere.Path, "*", SearchOption.AllDirectories).Order(StringComparer.Ordinal).ToArray();

    [Fact]
    public void A_write_creates_the_missing_folders_inside_the_output_folder_and_leaves_no_temporary_file()
    {
        var path = Path.Combine(_out.Path, "plots", "deeper", "a.png");
        AtomicFile.WriteAllBytes(path, [1, 2, 3], root: _out.Path);
        Assert.Equal(new byte[] { 1, 2, 3 }, File.ReadAllBytes(path));
        Assert.Single(Directory.EnumerateFiles(_out.Path, "*", SearchOption.AllDirectories));
    }

    [Fact]
    public void A_linked_folder_inside_the_output_folder_is_refused_and_nothing_is_written_through_it()
    {
        Directory.CreateSymbolicLink(Path.Combine(_out.Path, "plots"), _elsewhere.Path);
        var ex = Assert.Throws<OutputPathException>(() => AtomicFile.WriteAllBytes(Path.Combine(_out.Path, "plots", "run-R1.png"), [1], root: _out.Path));
        Assert.Contains(Path.Combine(_out.Path, "plots"), ex.Message, StringComparison.Ordinal);
        Assert.Contains("symbolic link", ex.Message, StringComparison.Ordinal);
        Assert.Empty(Elsewhere());
        Assert.NotNull(new DirectoryInfo(Path.Combine(_out.Path, "plots")).LinkTarget); // the link itself is left alone
    }

    [Fact]
    public void A_linked_folder_higher_up_the_path_is_refused_too()
    {
        Directory.CreateSymbolicLink(Path.Combine(_out.Path, "series"), _elsewhere.Path);
        Assert.Throws<OutputPathException>(() => AtomicFile.WriteAllText(Path.Combine(_out.Path, "series", "plots", "k.png"), "x", root: _out.Path));
        Assert.Empty(Elsewhere());
    }

    [Fact]
    public void A_target_file_that_is_a_link_is_neither_written_through_nor_replaced()
    {
        var target = Path.Combine(_elsewhere.Path, "precious.json");
        File.WriteAllText(target, "keep");
        var link = Path.Combine(_out.Path, "summary.json");
        File.CreateSymbolicLink(link, target);
        Assert.Throws<OutputPathException>(() => AtomicFile.WriteAllText(link, "{}", root: _out.Path));
        Assert.Equal("keep", File.ReadAllText(target));
        Assert.Equal(target, new FileInfo(link).LinkTarget);
        Assert.Single(Directory.EnumerateFileSystemEntries(_out.Path)); // no temporary file left
    }

    [Fact]
    public void A_dangling_link_at_the_target_is_refused_and_nothing_is_created_where_it_points()
    {
        var target = Path.Combine(_elsewhere.Path, "made-by-nobody.txt");
        File.CreateSymbolicLink(Path.Combine(_out.Path, "runs.csv"), target);
        Assert.Throws<OutputPathException>(() => AtomicFile.WriteAllText(Path.Combine(_out.Path, "runs.csv"), "x", root: _out.Path));
        Assert.False(File.Exists(target));
    }

    [Fact]
    public void A_path_outside_the_output_folder_is_refused()
    {
        Assert.Throws<OutputPathException>(() => AtomicFile.WriteAllText(Path.Combine(_out.Path, "..", "escaped.txt"), "x", root: _out.Path));
        Assert.False(File.Exists(Path.Combine(Path.GetDirectoryName(_out.Path)!, "escaped.txt")));
    }

    [Fact]
    public void A_file_where_a_folder_belongs_is_refused_with_a_message_saying_so()
    {
        File.WriteAllText(Path.Combine(_out.Path, "plots"), "not a folder");
        var ex = Assert.Throws<OutputPathException>(() => AtomicFile.WriteAllBytes(Path.Combine(_out.Path, "plots", "a.png"), [1], root: _out.Path));
        Assert.Contains("is a file where TraceKin needs a folder", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Listing_the_files_below_an_output_folder_does_not_go_into_linked_folders_or_list_linked_files()
    {
        Directory.CreateDirectory(Path.Combine(_out.Path, "plots"));
        File.WriteAllText(Path.Combine(_out.Path, "plots", "a.png"), "ours");
        File.WriteAllText(Path.Combine(_elsewhere.Path, "b.png"), "not ours");
        Directory.CreateSymbolicLink(Path.Combine(_out.Path, "linked"), _elsewhere.Path);
        File.CreateSymbolicLink(Path.Combine(_out.Path, "plots", "c.png"), Path.Combine(_elsewhere.Path, "b.png"));
        Assert.Equal([Path.Combine(_out.Path, "plots", "a.png")], OutputPaths.FilesBelow(_out.Path).ToArray());
        // The runtime's own recursive listing does go through the link, which is why FilesBelow exists.
        Assert.Contains(Path.Combine(_out.Path, "linked", "b.png"), Directory.EnumerateFiles(_out.Path, "*", SearchOption.AllDirectories));
    }

    [Fact]
    public void A_file_written_over_time_appears_only_when_committed_and_an_abandoned_one_leaves_the_old_file()
    {
        var path = Path.Combine(_out.Path, "law-fits.csv");
        File.WriteAllText(path, "old");
        using (var pending = AtomicFile.Begin(path, _out.Path))
        {
            pending.Stream.Write("new rows"u8);
            pending.Stream.Flush();
            Assert.Equal("old", File.ReadAllText(path)); // readers see the old file while rows are streamed
        }
        Assert.Equal("old", File.ReadAllText(path)); // disposed without a commit: nothing replaced
        Assert.Single(Directory.EnumerateFiles(_out.Path)); // and no temporary file left
        using (var pending = AtomicFile.Begin(path, _out.Path))
        {
            pending.Stream.Write("new rows"u8);
            pending.Commit();
        }
        Assert.Equal("new rows", File.ReadAllText(path));
        Assert.Single(Directory.EnumerateFiles(_out.Path));
    }

    [Fact]
    public void Streamed_tables_that_cannot_be_written_fail_their_write_without_stopping_the_analysis()
    {
        // A link where a table goes is refused when the tables are opened; the runs are still analysed and the failure
        // comes out of Write as an IOException, which analyse logs and counts like any output's.
        File.CreateSymbolicLink(Path.Combine(_out.Path, RunTables.FitsFile), Path.Combine(_elsewhere.Path, "target.csv"));
        using var tables = new RunTables(_out.Path);
        var result = TraceKin.Analysis.SeriesRunner.Analyse(RepoPaths.Sample("violet-complex-acid"), new TraceKin.Analysis.AnalysisOptions { Workers = 2, RunSink = tables });
        Assert.Equal(8, result.Runs.Count);
        Assert.All(result.Runs, r => Assert.DoesNotContain(r.Warnings, w => w.Code == "run-output-failed"));
        Assert.Throws<IOException>(() => tables.Write(result, _out.Path));
        Assert.Empty(Elsewhere());
        Assert.Empty(Directory.EnumerateFiles(_out.Path, ".*.tmp"));
    }
}
