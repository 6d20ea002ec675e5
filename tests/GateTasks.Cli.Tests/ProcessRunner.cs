using System.Diagnostics;

namespace GateTasks.Tests.Shared;

/// <summary>Runs a child process with a clean, test-controlled environment and collects its output.</summary>
public static class ProcessRunner
{
    public static (int ExitCode, string Stdout, string Stderr) Run(string file, IEnumerable<string> args, string workingDirectory,
        IReadOnlyDictionary<string, string>? environment = null, int timeoutSeconds = 300)
    {
        var psi = new ProcessStartInfo(file)
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var a in args) psi.ArgumentList.Add(a);
        // CI markers change build behaviour; tests of the tool must not inherit them.
        foreach (var v in new[] { "CI", "GITHUB_ACTIONS", "TF_BUILD" }) psi.Environment.Remove(v);
        // A pull request's base (read by the ledger's history check) must not reach the tool either.
        foreach (var v in new[] { "GITHUB_BASE_REF", "CI_MERGE_REQUEST_DIFF_BASE_SHA", "SYSTEM_PULLREQUEST_TARGETBRANCH" }) psi.Environment.Remove(v);
        psi.Environment["MSBUILDDISABLENODEREUSE"] = "1";
        psi.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        psi.Environment["DOTNET_NOLOGO"] = "1";
        if (environment is not null)
            foreach (var (k, v) in environment) psi.Environment[k] = v;
        using var p = Process.Start(psi)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(timeoutSeconds * 1000))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"{file} {string.Join(' ', args)} did not finish in {timeoutSeconds} s");
        }
        return (p.ExitCode, stdout.Result, stderr.Result);
    }
}
