using System.Text.Json.Nodes;
using GateTasks.Engine.References;
using Parquet;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Rewrites a reference file as an older format wrote it, for the tests of the refusal messages: the same rows, a
/// header with another format number and whatever that format lacked taken out by <c>edit</c>.
/// </summary>
internal static class OlderReferenceFile
{
    public static async Task RewriteAsync(string referencePath, int format, Action<JsonObject> edit)
    {
        var copy = referencePath + ".current";
        File.Move(referencePath, copy);
        await using var input = File.OpenRead(copy);
        await using var reader = await ParquetReader.CreateAsync(input);
        await using var output = File.Create(referencePath);
        var header = JsonNode.Parse(reader.CustomMetadata[ReferenceFile.MetadataKey])!.AsObject();
        header["format"] = format;
        edit(header);
        await using var writer = await ParquetWriter.CreateAsync(reader.Schema, output);
        writer.CustomMetadata = new Dictionary<string, string>
        {
            [ReferenceFile.FormatKey] = format.ToString(System.Globalization.CultureInfo.InvariantCulture),
            [ReferenceFile.MetadataKey] = header.ToJsonString(),
        };
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var rg = reader.OpenRowGroupReader(g);
            var n = checked((int)rg.RowCount);
            using var wg = writer.CreateRowGroup();
            foreach (var field in reader.Schema.DataFields)
            {
                if (field.Name is "feature" or "part")
                {
                    var names = new string?[n];
                    await rg.ReadAsync(field, names.AsMemory());
                    await wg.WriteAsync(field, names);
                }
                else if (field.Name == "bin")
                {
                    var numbers = new int?[n];
                    await rg.ReadAsync<int>(field, numbers.AsMemory());
                    await wg.WriteAsync<int>(field, numbers);
                }
                else
                {
                    var values = new double[n];
                    await rg.ReadAsync<double>(field, values.AsMemory());
                    await wg.WriteAsync<double>(field, values);
                }
            }
        }
    }
}
