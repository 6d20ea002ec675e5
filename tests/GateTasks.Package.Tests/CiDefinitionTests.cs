using System.Xml.Linq;
using GateTasks.Tests.Shared;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Package.Tests;

/// <summary>
/// The template's CI definitions, run as the CI systems would run them: where GitHub Actions and GitLab CI read them
/// (.github/workflows/ and .gitlab-ci.yml at the repository's root), their shell steps taken from the files and run with
/// bash and the variables those systems set (GITHUB_WORKSPACE, RUNNER_TEMP; CI_PROJECT_DIR). Expectations: the
/// template's README (the jobs find the project at the root or in a folder once the CI files are moved to the root;
/// GATE_SAMPLE_URL names the sample to download; reports land in gate-reports/ at the root, which the jobs publish).
/// </summary>
[Collection(PackageCollection.Name)]
public class CiDefinitionTests(PackageFeed feed)
{
    [Fact]
    public void A_project_that_is_the_repository_has_its_ci_files_where_ci_reads_them_and_its_jobs_find_it()
    {
        var p = GateProject.Create(feed, "RootGate");
        Assert.True(File.Exists(Path.Combine(p.Directory, ".github", "workflows", "precision-gate.yml")));
        Assert.True(File.Exists(Path.Combine(p.Directory, ".gitlab-ci.yml")));
        Git(p.Directory, "init", "-q");
        Git(p.Directory, "add", "RootGate.csproj", "precision-contract.yaml");
        foreach (var find in new[] { GitHubRun(p.Directory).Split('\n').First(l => l.Contains("git ls-files")), GitLabScript(p.Directory)[0] })
        {
            var (code, stdout, stderr) = ProcessRunner.Run("bash", ["-c", find.Trim() + "\necho \"project=$project\""], p.Directory);
            Assert.True(code == 0, stdout + stderr);
            Assert.Contains("project=RootGate.csproj\n", stdout);
        }
    }

    [Fact]
    public void Moved_to_the_root_of_an_existing_repository_the_jobs_build_the_gate_in_its_folder_and_check_the_downloaded_sample()
    {
        var repo = Path.Combine(feed.Root, "ci-repository");
        var p = GateProject.Create(feed, "FolderGate", directory: Path.Combine(repo, "analysis", "FolderGate"));
        // The one move the template's README asks for.
        Directory.Move(Path.Combine(p.Directory, ".github"), Path.Combine(repo, ".github"));
        File.Move(Path.Combine(p.Directory, ".gitlab-ci.yml"), Path.Combine(repo, ".gitlab-ci.yml"));
        Git(repo, "init", "-q");
        Git(repo, "add", "-A");
        var reports = Path.Combine(repo, "gate-reports");

        // GitHub Actions without GATE_SAMPLE_URL: the contract's own sample (the faithful one) passes.
        var runnerTemp = Path.Combine(feed.Root, "runner-temp");
        Directory.CreateDirectory(runnerTemp);
        var github = Run(repo, GitHubRun(repo), new() { ["GITHUB_WORKSPACE"] = repo, ["RUNNER_TEMP"] = runnerTemp, ["GATE_SAMPLE_URL"] = "", ["GATE_SAMPLE_TOKEN"] = "" });
        Assert.True(github.ExitCode == 0, github.Output);
        Assert.Contains("PASSED", github.Output);
        Assert.Equal("0", XDocument.Load(Path.Combine(reports, "precision-contract.junit.xml")).Root!.Attribute("failures")!.Value);
        Assert.Equal("gate-reports/*.junit.xml", GitHubStep(repo, "Publish gate results")["with"]["report_paths"].ToString());

        // GitLab CI with GATE_SAMPLE_URL naming the drifted sample: downloaded (curl reads file: addresses as it reads
        // https: ones) and checked, the job fails at the contract's line and the report at the root says so.
        var drifted = new Uri(Path.Combine(p.Directory, "surrogate-drifted.parquet")).AbsoluteUri;
        var gitlab = Run(repo, "set -e\n" + string.Join('\n', GitLabScript(repo)), new() { ["CI_PROJECT_DIR"] = repo, ["GATE_SAMPLE_URL"] = drifted });
        Assert.NotEqual(0, gitlab.ExitCode);
        Assert.Contains("precision-contract.yaml(37,13): error GATE3004", gitlab.Output);
        Assert.True(File.Exists(Path.Combine(repo, ".gate-sample", "surrogate-drifted.parquet")), gitlab.Output);
        Assert.NotEqual("0", XDocument.Load(Path.Combine(reports, "precision-contract.junit.xml")).Root!.Attribute("failures")!.Value);
        var job = (YamlMappingNode)Yaml(Path.Combine(repo, ".gitlab-ci.yml"))["precision-gate"];
        Assert.Equal("gate-reports/*.junit.xml", job["artifacts"]["reports"]["junit"].ToString());
    }

    private (int ExitCode, string Output) Run(string directory, string script, Dictionary<string, string> variables)
    {
        var environment = new Dictionary<string, string>(feed.Environment) { ["DOTNET_CLI_USE_MSBUILD_SERVER"] = "0" };
        foreach (var (k, v) in variables) environment[k] = v;
        var (code, stdout, stderr) = ProcessRunner.Run("bash", ["-c", script], directory, environment, timeoutSeconds: 600);
        return (code, stdout + stderr);
    }

    private static YamlMappingNode Yaml(string path)
    {
        var stream = new YamlStream();
        using var reader = new StreamReader(path);
        stream.Load(reader);
        return (YamlMappingNode)stream.Documents[0].RootNode;
    }

    private static YamlMappingNode GitHubStep(string root, string name) =>
        ((YamlSequenceNode)Yaml(Path.Combine(root, ".github", "workflows", "precision-gate.yml"))["jobs"]["gate"]["steps"])
        .Cast<YamlMappingNode>().Single(s => s.Children.TryGetValue(new YamlScalarNode("name"), out var n) && n.ToString() == name);

    private static string GitHubRun(string root) => GitHubStep(root, "Precision gate")["run"].ToString();

    private static List<string> GitLabScript(string root) =>
        ((YamlSequenceNode)Yaml(Path.Combine(root, ".gitlab-ci.yml"))["precision-gate"]["script"]).Select(n => n.ToString()).ToList();

    private static void Git(string directory, params string[] args)
    {
        var (code, stdout, stderr) = ProcessRunner.Run("git", args, directory);
        Assert.True(code == 0, $"git {string.Join(' ', args)}: {stdout}{stderr}");
    }
}
