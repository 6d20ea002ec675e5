using GateTasks.Engine.Contracts;
using Json.Schema;

namespace GateTasks.Engine.Tests.Contracts;

/// <summary>The annotated example contracts in docs/examples must load and be valid against the shipped JSON Schema (JsonSchema.Net 7.4.0).</summary>
public class ExampleContractTests
{
    public static TheoryData<string> Examples()
    {
        var data = new TheoryData<string>();
        foreach (var f in Directory.EnumerateFiles(Path.Combine(RepositoryFolder(), "docs", "examples"), "*.yaml").Order()) data.Add(Path.GetFileName(f));
        return data;
    }

    [Theory]
    [MemberData(nameof(Examples))]
    public void Example_loads_and_matches_the_schema(string file)
    {
        var path = Path.Combine(RepositoryFolder(), "docs", "examples", file);
        var text = File.ReadAllText(path);
        var contract = ContractLoader.Parse(text, path);
        Assert.NotEmpty(contract.Features);
        var schema = JsonSchema.FromText(ContractSchema.Text);
        var result = schema.Evaluate(YamlToJson.Convert(text), new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.True(result.IsValid, string.Join("; ", (result.Details ?? []).Where(d => d.Errors is not null).SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation}: {e.Value}"))));
    }

    [Fact]
    public void There_is_one_example_per_surrogate_kind()
    {
        var files = Directory.EnumerateFiles(Path.Combine(RepositoryFolder(), "docs", "examples"), "*.yaml").Select(f => Path.GetFileName(f)!).Order().ToArray();
        Assert.Equal(["generator-surrogate.yaml", "response-surrogate.yaml", "unfolding-surrogate.yaml"], files);
    }

    private static string RepositoryFolder()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "GateTasks.sln"))) return dir.FullName;
        throw new InvalidOperationException("GateTasks.sln not found");
    }
}
