using System.Text.Json.Nodes;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;
using Parquet;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A reference of format 3 stores its joint subsample without event weights, so a weighted reference's energy test
/// would weigh every row alike; the program refuses it with the documented code and the way out (docs/error-codes.md:
/// GATE2102, rebuild) rather than deciding the joint test on unweighted rows.
/// </summary>
public sealed class JointWeightsFormatTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-joint-format-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    [Fact]
    public async Task A_format_3_reference_without_joint_weights_is_refused_with_the_command_that_rebuilds_it()
    {
        Directory.CreateDirectory(Path.Combine(_dir, ".git"));
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, DemoContract.Text + "\njoint:\n  features: [m_gg, pt_gg]\n  energy-test: on\n  subsample: 300\n");
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 30_000, 11, 10_000);
        DemoSampleWriter.Write(Path.Combine(_dir, "surrogate-faithful.parquet"), DemoScenarioParameters.FullSimulation, 10_000, 12, 10_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));

        // Rewrite the reference as format 3 wrote it: its rows as they are, its joint subsample without weights.
        var referencePath = contract.ReferenceFullPath;
        var copy = referencePath + ".current";
        File.Move(referencePath, copy);
        await using (var input = File.OpenRead(copy))
        await using (var reader = await ParquetReader.CreateAsync(input))
        await using (var output = File.Create(referencePath))
        {
            var header = JsonNode.Parse(reader.CustomMetadata[ReferenceFile.MetadataKey])!.AsObject();
            header["format"] = 3;
            header["joint"]!.AsObject().Remove("weights");
            await using var writer = await ParquetWriter.CreateAsync(reader.Schema, output);
            writer.CustomMetadata = new Dictionary<string, string> { [ReferenceFile.FormatKey] = "3", [ReferenceFile.MetadataKey] = header.ToJsonString() };
            for (var g = 0; g < reader.RowGroupCount; g++)
            {
                using var rg = reader.OpenRowGroupReader(g);
                var n = checked((int)rg.RowCount);
                using var wg = writer.CreateRowGroup();
                foreach (var field in reader.Schema.DataFields)
                {
                    if (field.Name == "feature")
                    {
                        var names = new string?[n];
                        await rg.ReadAsync(field, names.AsMemory());
                        await wg.WriteAsync(field, names);
                    }
                    else if (field.Name == "cell")
                    {
                        var cells = new int[n];
                        await rg.ReadAsync<int>(field, cells.AsMemory());
                        await wg.WriteAsync<int>(field, cells);
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
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath);
        Assert.True(code == 2, stdout + stderr);
        // docs/error-codes.md: GATE2102, an unsupported format version, with the way out (rebuild).
        Assert.Contains("error GATE2102", stdout + stderr);
        Assert.Contains("reference format 3", stdout + stderr);
        Assert.Contains("no event weights with its joint subsample", stdout + stderr);
        Assert.Contains("rebuild it with 'gatetasks reference build' (format 7)", stdout + stderr);
        Assert.DoesNotContain("   at ", stdout + stderr);
    }
}
