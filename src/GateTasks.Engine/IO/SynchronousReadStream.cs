namespace GateTasks.Engine.IO;

/// <summary>
/// A read-only view of a stream whose asynchronous reads complete at once, on the calling thread. Parquet.Net reads
/// only asynchronously; on a file opened for synchronous access each such read is handed to the thread pool and
/// awaited back, so opening a small file started the pool's threads and paid a hop per read. The engine awaits
/// Parquet.Net synchronously anyway (no synchronisation context), so nothing is lost by reading in place.
/// </summary>
internal sealed class SynchronousReadStream(Stream inner, bool leaveOpen = false) : Stream
{
    /// <inheritdoc />
    public override bool CanRead => inner.CanRead;

    /// <inheritdoc />
    public override bool CanSeek => inner.CanSeek;

    /// <inheritdoc />
    public override bool CanWrite => false;

    /// <inheritdoc />
    public override long Length => inner.Length;

    /// <inheritdoc />
    public override long Position
    {
        get => inner.Position;
        set => inner.Position = value;
    }

    /// <inheritdoc />
    public override int Read(byte[] buffer, int offset, int count) => inner.Read(buffer, offset, count);

    /// <inheritdoc />
    public override int Read(Span<byte> buffer) => inner.Read(buffer);

    /// <inheritdoc />
    public override int ReadByte() => inner.ReadByte();

    /// <inheritdoc />
    public override Task<int> ReadAsync(byte[] buffer, int offset, int count, CancellationToken cancellationToken)
    {
        if (cancellationToken.IsCancellationRequested) return Task.FromCanceled<int>(cancellationToken);
        try
        {
            return Task.FromResult(inner.Read(buffer, offset, count));
        }
        catch (Exception e)
        {
            return Task.FromException<int>(e);
        }
    }

    /// <inheritdoc />
    public override ValueTask<int> ReadAsync(Memory<byte> buffer, CancellationToken cancellationToken = default)
    {
        if (cancellationToken.IsCancellationRequested) return ValueTask.FromCanceled<int>(cancellationToken);
        try
        {
            return new ValueTask<int>(inner.Read(buffer.Span));
        }
        catch (Exception e)
        {
            return ValueTask.FromException<int>(e);
        }
    }

    /// <inheritdoc />
    public override long Seek(long offset, SeekOrigin origin) => inner.Seek(offset, origin);

    /// <inheritdoc />
    public override void Flush()
    {
    }

    /// <inheritdoc />
    public override void SetLength(long value) => throw new NotSupportedException();

    /// <inheritdoc />
    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();

    /// <inheritdoc />
    protected override void Dispose(bool disposing)
    {
        if (disposing && !leaveOpen) inner.Dispose();
        base.Dispose(disposing);
    }

    /// <inheritdoc />
    public override ValueTask DisposeAsync()
    {
        Dispose(true);
        GC.SuppressFinalize(this);
        return ValueTask.CompletedTask;
    }
}
