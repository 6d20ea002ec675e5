using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples.Hdf5;
using GateTasks.Engine.Samples.Numpy;
using GateTasks.Engine.Samples.Parquet;

namespace GateTasks.Engine.Samples;

/// <summary>Opens the right reader for a sample file.</summary>
internal static class SampleReaderFactory
{
    /// <summary>
    /// Opens <paramref name="path"/> by its extension (<c>.parquet</c>/<c>.pq</c> Parquet, <c>.csv</c> CSV, <c>.npy</c>
    /// and <c>.npz</c> NumPy, <c>.h5</c>/<c>.hdf5</c> HDF5), checking that its content starts as that format does; a
    /// file of any other extension is opened by its signature. GATE2001 when the file does not exist, GATE2017 when its
    /// content is another format's (or not its extension's), GATE2002 when it is in no supported format.
    /// </summary>
    public static ISampleReader Open(string path)
    {
        if (!File.Exists(path))
        {
            var what = Directory.Exists(path) ? "is a folder, not a file" : "does not exist";
            throw new GateInputException(ErrorCodes.SampleNotFound, $"sample file '{path}' {what}", new SourceLocation(path));
        }

        var named = SampleFormats.ByExtension(System.IO.Path.GetExtension(path));
        var content = SampleFormats.BySignature(Head(path));
        if (named is { } expected && content != expected)
        {
            // A Parquet file without its signature is reported by the Parquet reader as damaged (as before); an HDF5 file
            // may start after a user block, which its reader looks for.
            var mismatch = content is not null
                || expected is SampleFormat.Npy or SampleFormat.Npz;
            if (mismatch)
                throw new GateInputException(ErrorCodes.SampleContentMismatch,
                    $"sample file '{path}' is named {System.IO.Path.GetExtension(path)} ({SampleFormats.Describe(expected)}) but "
                    + (content is { } found ? $"its content is {SampleFormats.Describe(found)}" : "its content does not start with that format's signature")
                    + "; give it the extension of what it holds",
                    new SourceLocation(path));
        }
        return (named ?? content) switch
        {
            SampleFormat.Parquet => ParquetSampleReader.Open(path),
            SampleFormat.Csv => CsvSampleReader.Open(path),
            SampleFormat.Npy => NpySampleReader.Open(path),
            SampleFormat.Npz => NpzSampleReader.Open(path),
            SampleFormat.Hdf5 => Hdf5SampleReader.Open(path),
            _ => throw SampleInputErrors.Unreadable(path,
                $"its extension names no sample format and its content starts with no known signature; supported: {string.Join(", ", SampleFormats.Extensions)}"),
        };
    }

    private static byte[] Head(string path)
    {
        using var stream = SampleInputErrors.OpenRead(path, FileOptions.None);
        var head = new byte[8];
        try
        {
            var got = stream.ReadAtLeast(head, head.Length, throwOnEndOfStream: false);
            return head[..got];
        }
        catch (IOException ex)
        {
            throw SampleInputErrors.Unreadable(path, SampleInputErrors.Describe(ex), ex);
        }
    }
}
