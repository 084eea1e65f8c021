using TraceKin.Reports;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Analysis;

/// <summary>
/// Background writing of plot files: everything queued is on disk, whole, once Complete returns, and a file that
/// cannot be written is reported rather than thrown (one bad output never stops a batch; common practice, no source).
/// </summary>
public class OutputQueueTests
{
    [Fact]
    public void Every_queued_file_is_on_disk_with_its_bytes_when_Complete_returns()
    {
        using var dir = new RepoPaths.TempDir();
        var queue = new OutputQueue(writers: 2, capacity: 3);
        var expected = Enumerable.Range(0, 40).ToDictionary(i => Path.Combine(dir.Path, $"f{i:00}.bin"), i => Enumerable.Range(0, 1000 + i).Select(b => (byte)(b * i)).ToArray());
        foreach (var (path, bytes) in expected) queue.Enqueue(path, bytes);

        Assert.Empty(queue.Complete());
        foreach (var (path, bytes) in expected) Assert.Equal(bytes, File.ReadAllBytes(path));
        Assert.Equal(40, Directory.GetFiles(dir.Path).Length); // no temporary file left behind
    }

    [Fact]
    public void A_file_that_cannot_be_written_is_returned_by_Complete_and_the_others_are_written()
    {
        using var dir = new RepoPaths.TempDir();
        var blocker = Path.Combine(dir.Path, "not-a-folder");
        File.WriteAllText(blocker, "a file where a folder is needed");
        var queue = new OutputQueue(writers: 1);
        queue.Enqueue(Path.Combine(blocker, "plot.png"), [1, 2, 3]);
        queue.Enqueue(Path.Combine(dir.Path, "ok.png"), [4, 5, 6]);

        var failed = queue.Complete();
        Assert.Equal(Path.Combine(blocker, "plot.png"), Assert.Single(failed).Path);
        Assert.Equal(new byte[] { 4, 5, 6 }, File.ReadAllBytes(Path.Combine(dir.Path, "ok.png")));
    }
}
