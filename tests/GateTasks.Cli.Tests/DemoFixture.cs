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
    public static (int ExitCode, string Stdout, string Stderr) Run(params string[] args)
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        var code = GateTasks.Cli.CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }
}
