namespace GateTasks.Engine.Samples;

/// <summary>
/// A file's length and last-write time, taken when a sample file whose layout has no footer to compare (a NumPy or
/// HDF5 file) is opened, and compared before each read: the columns, offsets and lengths read at opening fit the
/// file only while it is the same file.
/// </summary>
internal readonly record struct FileStamp(long Length, DateTime LastWriteUtc)
{
    /// <summary>The stamp of <paramref name="path"/> now; GATE2001 when it is gone.</summary>
    public static FileStamp Of(string path)
    {
        var info = new FileInfo(path);
        if (!info.Exists)
            throw SampleInputErrors.OpenFailure(path, new FileNotFoundException(null, path));
        return new FileStamp(info.Length, info.LastWriteTimeUtc);
    }

    /// <summary>GATE2002 when <paramref name="path"/> is no longer the file this stamp was taken of.</summary>
    public void RequireUnchanged(string path)
    {
        if (Of(path) == this) return;
        throw SampleInputErrors.Unreadable(path,
            "it changed after the sample was opened (its length or modification time is no longer the one seen then); a sample must not change while it is read");
    }
}
