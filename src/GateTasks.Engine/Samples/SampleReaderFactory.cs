using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples.Parquet;

namespace GateTasks.Engine.Samples;

/// <summary>Opens the right reader for a sample file.</summary>
internal static class SampleReaderFactory
{
    /// <summary>The four bytes a Parquet file starts (and ends) with.</summary>
    private static ReadOnlySpan<byte> ParquetMagic => "PAR1"u8;

    /// <summary>
    /// Opens <paramref name="path"/>: <c>.parquet</c> and <c>.pq</c> as Parquet, <c>.csv</c> as CSV, any other
    /// extension as Parquet when it starts with the Parquet magic bytes. GATE2001 when the file does not exist,
    /// GATE2002 when it is in no supported format.
    /// </summary>
    public static ISampleReader Open(string path)
    {
        if (!File.Exists(path))
        {
            var what = Directory.Exists(path) ? "is a folder, not a file" : "does not exist";
            throw new GateInputException(ErrorCodes.SampleNotFound, $"sample file '{path}' {what}", new SourceLocation(path));
        }

        var extension = System.IO.Path.GetExtension(path);
        if (IsParquetExtension(extension)) return ParquetSampleReader.Open(path);
        if (IsCsvExtension(extension)) return CsvSampleReader.Open(path);
        if (StartsWithParquetMagic(path)) return ParquetSampleReader.Open(path);
        throw SampleInputErrors.Unreadable(
            path, "not a Parquet file (no PAR1 signature) and not named .csv; supported: .parquet, .pq, .csv");
    }

    /// <summary>Whether <paramref name="extension"/> (with its dot) names a Parquet file.</summary>
    public static bool IsParquetExtension(string extension) =>
        extension.Equals(".parquet", StringComparison.OrdinalIgnoreCase)
        || extension.Equals(".pq", StringComparison.OrdinalIgnoreCase);

    /// <summary>Whether <paramref name="extension"/> (with its dot) names a CSV file.</summary>
    public static bool IsCsvExtension(string extension) =>
        extension.Equals(".csv", StringComparison.OrdinalIgnoreCase);

    private static bool StartsWithParquetMagic(string path)
    {
        using var stream = SampleInputErrors.OpenRead(path, FileOptions.None);
        Span<byte> head = stackalloc byte[4];
        try
        {
            return stream.ReadAtLeast(head, head.Length, throwOnEndOfStream: false) == head.Length
                   && head.SequenceEqual(ParquetMagic);
        }
        catch (IOException ex)
        {
            throw SampleInputErrors.Unreadable(path, SampleInputErrors.Describe(ex), ex);
        }
    }
}
