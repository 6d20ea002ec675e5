using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>Runs the built gatetasks program in a process of its own, as a build step does, and collects its output.</summary>
public static class GatetasksProcess
{
    public static (int Exit, string Stdout, string Stderr) Run(IEnumerable<string> args, string workingDirectory,
        IReadOnlyDictionary<string, string>? environment = null, int timeoutSeconds = 300) =>
        ProcessRunner.Run("dotnet", args.Prepend(typeof(GateTasks.Cli.CliApp).Assembly.Location), workingDirectory, environment, timeoutSeconds);
}
