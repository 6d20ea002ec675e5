using Parquet;
using Parquet.Schema;

namespace GateTasks.Benchmarks.Harness;

/// <summary>Writes the benchmark sample: a Snappy-compressed Parquet file of 20 float32 columns in equal row groups.</summary>
internal static class SyntheticSampleWriter
{
    public static async Task WriteAsync(string path, long events, int rowGroups, int seed)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(events);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(rowGroups);
        var fields = SyntheticFeatures.Names.Select(n => new DataField<float>(n, false)).ToArray();
        var schema = new ParquetSchema(fields);
        var largest = (int)((events + rowGroups - 1) / rowGroups);
        var columns = fields.Select(_ => new float[largest]).ToArray();

        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
        var temporary = path + ".partial";
        await using (var stream = new FileStream(temporary, FileMode.Create, FileAccess.ReadWrite, FileShare.None, 1 << 20))
        await using (var writer = await ParquetWriter.CreateAsync(schema, stream, new ParquetOptions { CompressionMethod = CompressionMethod.Snappy }))
        {
            long written = 0;
            for (var group = 0; group < rowGroups; group++)
            {
                var rows = (int)Math.Min(largest, events - written);
                if (rows <= 0) break;
                Parallel.For(0, fields.Length, c => SyntheticFeatures.Generate(c, seed, group, columns[c].AsSpan(0, rows)));
                using var rowGroup = writer.CreateRowGroup();
                for (var c = 0; c < fields.Length; c++)
                    await rowGroup.WriteAsync<float>(fields[c], columns[c].AsMemory(0, rows), null, null);
                written += rows;
            }
        }
        File.Move(temporary, path, overwrite: true);
    }
}
