using System.Diagnostics;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A fact that needs Debian's /usr/bin/python3 with the named modules (installed by .ci/run through apt).
/// Skipped where they are absent, unless GATETASKS_REQUIRE_EXTERNAL_TOOLS=1 (as in CI), where it runs and fails loudly.
/// </summary>
public sealed class PythonModulesFactAttribute : FactAttribute
{
    public PythonModulesFactAttribute(params string[] modules)
    {
        if (Environment.GetEnvironmentVariable("GATETASKS_REQUIRE_EXTERNAL_TOOLS") == "1") return;
        if (!ExternalPython.Has(modules))
            Skip = $"needs /usr/bin/python3 with {string.Join(", ", modules)} (apt-get install python3-{string.Join(" python3-", modules)})";
    }
}

/// <summary>Runs Debian's system Python (not a version manager's shim) on a script.</summary>
public static class ExternalPython
{
    public const string Interpreter = "/usr/bin/python3";

    public static bool Has(IEnumerable<string> modules) =>
        File.Exists(Interpreter) && Run("import " + string.Join(", ", modules), []).ExitCode == 0;

    public static (int ExitCode, string Stdout, string Stderr) Run(string script, IEnumerable<string> args)
    {
        var psi = new ProcessStartInfo(Interpreter) { RedirectStandardOutput = true, RedirectStandardError = true };
        psi.ArgumentList.Add("-c");
        psi.ArgumentList.Add(script);
        foreach (var a in args) psi.ArgumentList.Add(a);
        using var p = Process.Start(psi)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        p.WaitForExit();
        return (p.ExitCode, stdout.Result, stderr.Result);
    }
}
