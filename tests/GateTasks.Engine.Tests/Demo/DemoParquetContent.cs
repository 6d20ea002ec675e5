using Parquet;
using Parquet.Schema;

namespace GateTasks.Engine.Tests.Demo;

/// <summary>A demo Parquet file read back whole with Parquet.Net (test files are small).</summary>
internal sealed class DemoParquetContent
{
    private DemoParquetContent(IReadOnlyList<DataField> fields, IReadOnlyList<long> rowGroupSizes,
        Dictionary<string, double[]> columns)
    {
        Fields = fields;
        RowGroupSizes = rowGroupSizes;
        Columns = columns;
    }

    public IReadOnlyList<DataField> Fields { get; }
    public IReadOnlyList<long> RowGroupSizes { get; }
    public IReadOnlyDictionary<string, double[]> Columns { get; }

    public static DemoParquetContent Read(string path) => ReadAsync(path).GetAwaiter().GetResult();

    private static async Task<DemoParquetContent> ReadAsync(string path)
    {
        await using var reader = await ParquetReader.CreateAsync(path);
        var fields = reader.Schema.DataFields;
        var sizes = new List<long>();
        var values = fields.ToDictionary(f => f.Name, _ => new List<double>());
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            sizes.Add(group.RowCount);
            foreach (var field in fields)
            {
                if (field.ClrType == typeof(float))
                {
                    var buffer = new float[group.RowCount];
                    await group.ReadAsync<float>(field, buffer);
                    values[field.Name].AddRange(buffer.Select(v => (double)v));
                }
                else if (field.ClrType == typeof(int))
                {
                    var buffer = new int[group.RowCount];
                    await group.ReadAsync<int>(field, buffer);
                    values[field.Name].AddRange(buffer.Select(v => (double)v));
                }
                else
                {
                    throw new InvalidOperationException($"unexpected column type {field.ClrType} of {field.Name}");
                }
            }
        }
        return new DemoParquetContent(fields, sizes, values.ToDictionary(kv => kv.Key, kv => kv.Value.ToArray()));
    }
}
