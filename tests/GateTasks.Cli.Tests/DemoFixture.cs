namespace GateTasks.Cli.Tests;

/// <summary>Runs the demo once for all tests that need its files (it takes tens of seconds).</summary>
public sealed class DemoFixture : IDisposable
{
    public DemoFixture()
    {
        Folder = Path.Combine(Path.GetTempPath(), "gatetasks-cli-tests-" + Guid.NewGuid().ToString("N")[..8]);
        (ExitCode, Stdout, Stderr) = Cli.Run("demo", "--dir", Folder);
    }

    public string Folder { get; }
    public int ExitCode { get; }
    public string Stdout { get; }
    public string Stderr { get; }
    public string Contract => Path.Combine(Folder, "precision-contract.yaml");

    public void Dispose()
    {
        try { Directory.Delete(Folder, recursive: true); } catch (IOException) { }
    }
}

/// <summary>Runs the CLI in-process with captured output.</summary>
public static class Cli
{
    // A pull request's base in the test run's own environment (CI) would make every in-process check compare the
    // ledger with it; tests of that behaviour set it for the child process they start.
    static Cli()
    {
        foreach (var v in new[] { "GITHUB_BASE_REF", "CI_MERGE_REQUEST_DIFF_BASE_SHA", "SYSTEM_PULLREQUEST_TARGETBRANCH" })
            Environment.SetEnvironmentVariable(v, null);
    }

    public static (int ExitCode, string Stdout, string Stderr) Run(params string[] args)
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        var code = GateTasks.Cli.CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }
}
