namespace GateTasks.Engine.Samples;

/// <summary>The file formats a sample may be written in.</summary>
internal enum SampleFormat
{
    Parquet,
    Csv,
    /// <summary>A NumPy array file (<c>.npy</c>).</summary>
    Npy,
    /// <summary>A NumPy archive of arrays (<c>.npz</c>, a ZIP file).</summary>
    Npz,
    Hdf5,
}

/// <summary>Tells a sample file's format by its extension and by the signature its content starts with.</summary>
internal static class SampleFormats
{
    /// <summary>The extensions a sample folder's files are picked by, as the documentation lists them.</summary>
    public static readonly IReadOnlyList<string> Extensions = [".parquet", ".pq", ".csv", ".npy", ".npz", ".h5", ".hdf5"];

    /// <summary>The format <paramref name="extension"/> (with its dot, any case) names, or null.</summary>
    public static SampleFormat? ByExtension(string extension) => extension.ToLowerInvariant() switch
    {
        ".parquet" or ".pq" => SampleFormat.Parquet,
        ".csv" => SampleFormat.Csv,
        ".npy" => SampleFormat.Npy,
        ".npz" => SampleFormat.Npz,
        ".h5" or ".hdf5" => SampleFormat.Hdf5,
        _ => null,
    };

    /// <summary>
    /// The binary format whose signature <paramref name="head"/> (a file's first bytes) starts with, or null (a text
    /// file such as CSV, or unknown): <c>PAR1</c> Parquet, <c>\x93NUMPY</c> NumPy, <c>PK\x03\x04</c> or
    /// <c>PK\x05\x06</c> ZIP (a .npz), <c>\x89HDF\r\n\x1a\n</c> HDF5 (at byte 0: one after a user block is found by the
    /// HDF5 reader).
    /// </summary>
    public static SampleFormat? BySignature(ReadOnlySpan<byte> head)
    {
        if (head.StartsWith("PAR1"u8)) return SampleFormat.Parquet;
        if (head.StartsWith(Numpy.NpyHeader.Signature)) return SampleFormat.Npy;
        if (head.StartsWith("PK\x03\x04"u8) || head.StartsWith("PK\x05\x06"u8)) return SampleFormat.Npz;
        if (head.StartsWith(Hdf5.Hdf5Superblock.Signature)) return SampleFormat.Hdf5;
        return null;
    }

    /// <summary>The format's name in messages.</summary>
    public static string Describe(SampleFormat format) => format switch
    {
        SampleFormat.Parquet => "a Parquet file",
        SampleFormat.Csv => "a CSV file",
        SampleFormat.Npy => "a NumPy array (.npy)",
        SampleFormat.Npz => "a ZIP archive (such as a NumPy .npz)",
        _ => "an HDF5 file",
    };
}
