using System.Text.Json.Nodes;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;
using Parquet;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A reference of format 2 and a partial of version 2 carry no fourth moments of their correlation pairs; the program
/// refuses them with the documented code and the way out (docs/error-codes.md: GATE2102 rebuild, GATE2201 fill again)
/// rather than deciding a correlation check on the normal-law error.
/// </summary>
public sealed class OutdatedCorrelationFilesTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-outdated-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private string Setup()
    {
        Directory.CreateDirectory(Path.Combine(_dir, ".git"));
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, DemoContract.Text);
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 60_000, 11, 20_000);
        DemoSampleWriter.Write(Path.Combine(_dir, "surrogate-faithful.parquet"), DemoScenarioParameters.FullSimulation, 20_000, 12, 10_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        return contractPath;
    }

    [Fact]
    public async Task A_format_2_reference_is_refused_with_the_command_that_rebuilds_it()
    {
        var contractPath = Setup();
        var referencePath = ContractLoader.Load(contractPath).ReferenceFullPath;
        // Rewrite the reference as format 2 wrote it: its rows as they are, its header without the correlations' variances.
        await OlderReferenceFile.RewriteAsync(referencePath, 2, header =>
        {
            foreach (var pair in header["correlations"]!.AsArray())
            {
                pair!.AsObject().Remove("pearson_variance");
                pair.AsObject().Remove("spearman_variance");
            }
        });
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath);
        Assert.True(code == 2, stdout + stderr);
        // docs/error-codes.md: GATE2102, an unsupported format version, with the way out (rebuild).
        Assert.Contains("error GATE2102", stdout + stderr);
        Assert.Contains("reference format 2", stdout + stderr);
        Assert.Contains("rebuild it with 'gatetasks reference build' (format 8)", stdout + stderr);
        Assert.DoesNotContain("   at ", stdout + stderr);
    }

    [Fact]
    public void A_version_2_partial_is_refused_and_must_be_filled_again()
    {
        var contractPath = Setup();
        var partial = Path.Combine(_dir, "shard.partial");
        var (code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(_dir, "surrogate-faithful.parquet"), "--output", partial);
        Assert.True(code == 0, stdout + stderr);
        // A partial as version 2 wrote it: eight numbers per coefficient (count, Σw, Σw², means, second moments).
        var json = JsonNode.Parse(File.ReadAllText(partial))!.AsObject();
        json["version"] = 2;
        foreach (var pair in json["content"]!["accumulation"]!["pairs"]!.AsArray())
            foreach (var key in new[] { "pearson", "spearman" })
                pair![key] = new JsonArray(pair[key]!.AsArray().Take(8).Select(v => v!.DeepClone()).ToArray());
        File.WriteAllText(partial, json.ToJsonString());
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", partial);
        Assert.True(code == 2, stdout + stderr);
        // docs/error-codes.md: GATE2201, a partial of another version, filled again.
        Assert.Contains("error GATE2201", stdout + stderr);
        Assert.Contains("Partial file version 2", stdout + stderr);
        Assert.Contains("fourth moments", stdout + stderr);
        Assert.Contains("fill it again", stdout + stderr);
    }
}
