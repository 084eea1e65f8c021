using System.Collections.Concurrent;
using System.Threading.Channels;

namespace TraceKin.Reports;

/// <summary>
/// Writes files (each through <see cref="AtomicFile"/>: temp name, flush to disk, rename) on a few background threads,
/// so that analysis workers hand over a finished plot and go on to the next run instead of waiting for the disk.
/// At most <c>capacity</c> files wait in memory; a worker that finds the queue full waits (memory stays bounded).
/// <see cref="Complete"/> waits until every file is on disk and returns the ones that could not be written.
/// </summary>
public sealed class OutputQueue : IDisposable
{
    private readonly Channel<(string Path, byte[] Bytes, string? Root)> _channel;
    private readonly Task[] _writers;
    private readonly ConcurrentQueue<(string Path, string Error)> _failures = new();
    private IReadOnlyList<(string Path, string Error)>? _completed;

    public OutputQueue(int writers = 3, int capacity = 32)
    {
        _channel = Channel.CreateBounded<(string, byte[], string?)>(new BoundedChannelOptions(capacity)
        {
            FullMode = BoundedChannelFullMode.Wait,
            SingleReader = writers == 1,
        });
        // Dedicated threads: a flush to disk blocks, and must not hold a thread-pool thread the workers need.
        _writers = Enumerable.Range(0, Math.Max(1, writers))
            .Select(_ => Task.Factory.StartNew(Drain, CancellationToken.None, TaskCreationOptions.LongRunning, TaskScheduler.Default))
            .ToArray();
    }

    /// <summary>Queues one file (inside the output folder <paramref name="root"/>, see <see cref="AtomicFile"/>); blocks only while the queue is full.</summary>
    public void Enqueue(string path, byte[] bytes, string? root = null)
    {
        var writer = _channel.Writer;
        while (!writer.TryWrite((path, bytes, root)))
        {
            if (!writer.WaitToWriteAsync().AsTask().GetAwaiter().GetResult())
                throw new InvalidOperationException("the output queue is already complete");
        }
    }

    /// <summary>Waits for every queued file to be written; returns the files that failed, with the reason.</summary>
    public IReadOnlyList<(string Path, string Error)> Complete()
    {
        if (_completed is not null) return _completed;
        _channel.Writer.TryComplete();
        Task.WaitAll(_writers);
        return _completed = _failures.OrderBy(f => f.Path, StringComparer.Ordinal).ToArray();
    }

    public void Dispose() => Complete();

    private void Drain()
    {
        var reader = _channel.Reader;
        while (reader.WaitToReadAsync().AsTask().GetAwaiter().GetResult())
            while (reader.TryRead(out var item))
            {
                try { AtomicFile.WriteAllBytes(item.Path, item.Bytes, item.Root); }
                catch (Exception ex)
                {
                    // Any failure stays with its file (a defect of ours names its type); the other files are still written.
                    _failures.Enqueue((item.Path, ex is IOException or UnauthorizedAccessException ? ex.Message : $"{ex.GetType().Name}: {ex.Message}"));
                }
            }
    }
}
