using System.Text;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Samples.Parquet;

namespace GateTasks.Benchmarks.Harness;

/// <summary>
/// Exports a sample's columns to one NumPy .npy file (format version 1.0, NEP 1): a little-endian float32 array of
/// shape (columns, rows) in C order, so each feature is one contiguous row, as the numeric stack reads it. The values
/// are read back from the Parquet file through the engine's reader, so both tools see the same numbers.
/// </summary>
internal static class NpyWriter
{
    public static void Export(string samplePath, IReadOnlyList<string> columns, string path)
    {
        using var reader = ParquetSampleReader.Open(samplePath);
        var rows = reader.RowCount ?? throw new InvalidOperationException("the Parquet footer states no row count");
        var header = Header(columns.Count, rows);
        using var file = File.OpenHandle(path, FileMode.Create, FileAccess.Write);
        RandomAccess.Write(file, header, 0);

        long start = 0;
        var buffer = Array.Empty<float>();
        foreach (var batch in reader.ReadBatches(columns))
        {
            if (buffer.Length < batch.RowCount) buffer = new float[batch.RowCount];
            for (var c = 0; c < columns.Count; c++)
            {
                var values = batch.Column(c);
                // Every value was stored as float32, so narrowing the engine's double back is exact.
                for (var i = 0; i < values.Length; i++) buffer[i] = (float)values[i];
                var bytes = System.Runtime.InteropServices.MemoryMarshal.AsBytes(buffer.AsSpan(0, values.Length));
                RandomAccess.Write(file, bytes, header.Length + ((long)c * rows + start) * sizeof(float));
            }
            start += batch.RowCount;
        }
    }

    /// <summary>Magic, version 1.0, header length, then the dict padded with spaces to a multiple of 64 bytes and a newline.</summary>
    internal static byte[] Header(int columns, long rows)
    {
        if (!BitConverter.IsLittleEndian) throw new PlatformNotSupportedException("the .npy export writes little-endian data");
        var dict = $"{{'descr': '<f4', 'fortran_order': False, 'shape': ({columns}, {rows}), }}";
        const int prefix = 10; // 6 magic bytes, 2 version bytes, 2 length bytes
        var total = (prefix + dict.Length + 1 + 63) / 64 * 64;
        var text = dict.PadRight(total - prefix - 1) + "\n";
        var header = new byte[total];
        header[0] = 0x93;
        "NUMPY"u8.CopyTo(header.AsSpan(1));
        header[6] = 1;
        header[7] = 0;
        BitConverter.TryWriteBytes(header.AsSpan(8, 2), (ushort)text.Length);
        Encoding.ASCII.GetBytes(text, header.AsSpan(prefix));
        return header;
    }
}
