using GateTasks.Engine.IO;

namespace GateTasks.Engine.Tests.FileSystem;

/// <summary>
/// The read-in-place view Parquet.Net is handed: its asynchronous reads finish before they return (no thread-pool
/// hop), and what they read is the file's content as .NET's own File.ReadAllBytes (System.IO, .NET 10) reads it.
/// (That FileStream's own asynchronous read on a file opened for synchronous access goes to the thread pool is
/// observed .NET behaviour, not tested here: whether it has finished when it returns is a race.)
/// </summary>
public sealed class SynchronousReadStreamTests : IDisposable
{
    private readonly string _path = Path.Combine(Directory.CreateTempSubdirectory("gatetasks-syncread-").FullName, "data.bin");

    public SynchronousReadStreamTests()
    {
        var bytes = new byte[200_000];
        new Random(7).NextBytes(bytes);
        File.WriteAllBytes(_path, bytes);
    }

    public void Dispose()
    {
        try { Directory.Delete(Path.GetDirectoryName(_path)!, recursive: true); } catch (IOException) { }
    }

    [Fact]
    public async Task Asynchronous_reads_finish_in_place_and_read_the_files_bytes()
    {
        var expected = File.ReadAllBytes(_path);
        await using var stream = new SynchronousReadStream(new FileStream(_path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16, FileOptions.RandomAccess));
        var read = new byte[expected.Length];
        var total = 0;
        stream.Seek(-8, SeekOrigin.End);
        var tail = new byte[8];
        var pending = stream.ReadAsync(tail.AsMemory());
        Assert.True(pending.IsCompleted);
        Assert.Equal(8, await pending);
        Assert.Equal(expected[^8..], tail);
        stream.Position = 0;
        while (total < read.Length)
        {
            var task = stream.ReadAsync(read, total, Math.Min(30_000, read.Length - total), CancellationToken.None);
            Assert.True(task.IsCompleted);
            var n = await task;
            Assert.True(n > 0);
            total += n;
        }
        Assert.Equal(expected, read);
    }

    [Fact]
    public void A_cancelled_read_is_cancelled_and_the_view_writes_nothing()
    {
        using var stream = new SynchronousReadStream(File.OpenRead(_path));
        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();
        Assert.True(stream.ReadAsync(new byte[4].AsMemory(), cancelled.Token).IsCanceled);
        Assert.False(stream.CanWrite);
        Assert.Throws<NotSupportedException>(() => stream.Write([1], 0, 1));
    }
}
