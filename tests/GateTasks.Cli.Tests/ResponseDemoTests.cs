using System.Xml.Linq;

namespace GateTasks.Cli.Tests;

/// <summary>The demo's response-surrogate mode, end to end through the CLI.</summary>
public sealed class ResponseDemoTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "gatetasks-response-demo-" + Guid.NewGuid().ToString("N")[..8]);

    public void Dispose()
    {
        try { Directory.Delete(_folder, recursive: true); } catch (IOException) { }
    }

    [Fact]
    public void A_response_with_5_percent_worse_resolution_in_one_true_energy_bin_fails_there_only()
    {
        var (code, stdout, stderr) = Cli.Run("demo", "--surrogate", "response", "--dir", _folder);
        Assert.True(code == 0, stdout + stderr);
        Assert.Contains("a fast detector response", stdout);
        Assert.Contains("as it should", stdout);

        var junit = Path.Combine(_folder, "drifted.xml");
        (code, stdout, stderr) = Cli.Run("check", "--contract", Path.Combine(_folder, "precision-contract.yaml"),
            "--sample", Path.Combine(_folder, "surrogate-drifted.parquet"), "--junit", junit);
        Assert.Equal(1, code);
        var failed = XDocument.Load(junit).Descendants("failure")
            .Select(f => f.Parent!.Attribute("classname")!.Value + " " + f.Parent.Attribute("name")!.Value).ToList();
        // The degraded range is 50–75 GeV of true energy: category 2 of min(floor(e_lead_true / 25), 5).
        Assert.Contains("demo-diphoton-response.response_lead[category=2] width-ratio-max", failed);
        Assert.Contains("demo-diphoton-response.response_lead[category=2] iqr-width-ratio-max", failed);
        Assert.All(failed, f => Assert.StartsWith("demo-diphoton-response.response_lead[category=2] ", f));
    }
}
