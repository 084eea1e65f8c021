using TraceKin.Cli;
using TraceKin.Tests.Watch;

namespace TraceKin.Tests.Cli;

// The one lock of an output folder, taken by `analyse` and by `watch` (robustness, no source needed).
public class OutputLockTests
{
    [Fact]
    public void A_second_taker_of_the_same_output_folder_is_refused_with_the_holders_process_id_until_the_first_lets_go()
    {
        var dir = SeriesFixture.TempFolder("lock");
        try
        {
            using (var first = OutputLock.TryTake(dir, "watch", out var none))
            {
                Assert.NotNull(first);
                Assert.Null(none);
                Assert.Null(OutputLock.TryTake(dir, "analyse", out var refusal));
                Assert.Contains("another tracekin", refusal, StringComparison.Ordinal);
                Assert.Contains($"process {Environment.ProcessId}, tracekin watch", refusal, StringComparison.Ordinal);
                Assert.Contains(OutputLock.FileName, refusal, StringComparison.Ordinal);
            }
            using var second = OutputLock.TryTake(dir, "analyse", out _);
            Assert.NotNull(second);
        }
        finally { Directory.Delete(dir, recursive: true); }
    }

    [Fact]
    public void A_lock_file_that_is_a_symbolic_link_is_refused_and_its_target_is_left_untouched()
    {
        var dir = SeriesFixture.TempFolder("lock-link");
        var elsewhere = SeriesFixture.TempFolder("lock-target");
        try
        {
            var target = Path.Combine(elsewhere, "precious.txt");
            File.WriteAllText(target, "keep me");
            File.CreateSymbolicLink(Path.Combine(dir, OutputLock.FileName), target);
            var ex = Assert.Throws<TraceKin.Reports.OutputPathException>(() => OutputLock.TryTake(dir, "analyse", out _));
            Assert.Contains("symbolic link", ex.Message, StringComparison.Ordinal);
            Assert.Equal("keep me", File.ReadAllText(target));
        }
        finally
        {
            Directory.Delete(dir, recursive: true);
            Directory.Delete(elsewhere, recursive: true);
        }
    }
}
