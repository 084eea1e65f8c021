using TraceKin.Cli.Watch;

namespace TraceKin.Tests.Watch;

public class WatchLockTests
{
    [Fact]
    public void A_second_watcher_on_the_same_output_folder_is_refused_until_the_first_lets_go()
    {
        var dir = SeriesFixture.TempFolder("lock");
        using (var first = WatchLock.TryTake(dir, out var none))
        {
            Assert.NotNull(first);
            Assert.Null(none);
            Assert.Null(WatchLock.TryTake(dir, out var refusal));
            Assert.Contains("already", refusal, StringComparison.Ordinal);
            Assert.Contains(WatchLock.FileName, refusal, StringComparison.Ordinal);
        }
        using var second = WatchLock.TryTake(dir, out _);
        Assert.NotNull(second);
    }
}
