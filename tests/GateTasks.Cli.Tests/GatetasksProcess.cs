using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>Runs the built gatetasks program in a process of its own, as a build step does, and collects its output.</summary>
public static class GatetasksProcess
{
    /// <summary>
    /// An executable to run instead of the built assembly (for instance the ahead-of-time compiled tool:
    /// <c>GATETASKS_TEST_EXECUTABLE=path/to/gatetasks</c>), so the same tests check the program as shipped.
    /// </summary>
    public static string? Executable => Environment.GetEnvironmentVariable("GATETASKS_TEST_EXECUTABLE") is { Length: > 0 } e ? e : null;

    public static (int Exit, string Stdout, string Stderr) Run(IEnumerable<string> args, string workingDirectory,
        IReadOnlyDictionary<string, string>? environment = null, int timeoutSeconds = 300) =>
        Executable is { } exe
            ? ProcessRunner.Run(exe, args, workingDirectory, environment, timeoutSeconds)
            : ProcessRunner.Run("dotnet", args.Prepend(typeof(GateTasks.Cli.CliApp).Assembly.Location), workingDirectory, environment, timeoutSeconds);
}
