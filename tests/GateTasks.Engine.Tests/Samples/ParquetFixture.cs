using ParquetSharp;

namespace GateTasks.Engine.Tests.Samples;

/// <summary>Writes Parquet test files with ParquetSharp, the independent writer.</summary>
internal static class ParquetFixture
{
    /// <summary>Writes <paramref name="columns"/> split into row groups of the given sizes.</summary>
    public static void Write(
        string path, IReadOnlyList<ParquetFixtureColumn> columns, IReadOnlyList<int> rowGroupSizes,
        Action<WriterPropertiesBuilder>? configure = null)
    {
        using var builder = new WriterPropertiesBuilder();
        configure?.Invoke(builder);
        using var properties = builder.Build();
        using var file = new ParquetFileWriter(path, columns.Select(c => c.Schema).ToArray(), properties);
        var start = 0;
        foreach (var size in rowGroupSizes)
        {
            using var rowGroup = file.AppendRowGroup();
            foreach (var column in columns) column.Write(rowGroup, start, size);
            start += size;
        }
        file.Close();
    }

    /// <summary>The encodings and codec of each column chunk, to check a fixture is what the test says it is.</summary>
    public static IReadOnlyList<(Compression Compression, ParquetSharp.Encoding[] Encodings)> ChunkLayout(string path)
    {
        using var reader = new ParquetFileReader(path);
        var chunks = new List<(Compression, ParquetSharp.Encoding[])>();
        for (var g = 0; g < reader.FileMetaData.NumRowGroups; g++)
        {
            using var rowGroup = reader.RowGroup(g);
            for (var c = 0; c < rowGroup.MetaData.NumColumns; c++)
            {
                using var chunk = rowGroup.MetaData.GetColumnChunkMetaData(c);
                chunks.Add((chunk.Compression, chunk.Encodings));
            }
        }
        return chunks;
    }
}
